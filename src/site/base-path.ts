import { issue, type Result, ok, fail } from "../problem.js";

/**
 * The folder the site is served from: "/" or "/some/prefix/". Every link the
 * site makes starts with it.
 */
export function normalizeBasePath(text: string): Result<string> {
  const trimmed = text.trim();
  if (trimmed === "" || trimmed === "/") return ok("/");
  if (!/^[A-Za-z0-9._~\/-]+$/.test(trimmed) || /(^|\/)\.\.?(\/|$)/.test(trimmed)) {
    return fail(
      issue(
        "bad-base-path",
        `base path ${JSON.stringify(text)} is not a plain URL path`,
        'use letters, digits, ".", "_", "~", "-" and "/" only, for example "/masses/"',
      ),
    );
  }
  const parts = trimmed.split("/").filter((p) => p !== "");
  return ok(`/${parts.join("/")}/`);
}

/** A site path ("objects/x/", "/assets/site.css") under the base path. */
export function underBase(basePath: string, sitePath: string): string {
  return basePath + sitePath.replace(/^\/+/, "");
}
