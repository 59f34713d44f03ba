import type { Reference } from "../audit/types.js";
import { DOI_PATTERN } from "../records/validate-reference.js";

/** A link the site may show: where it goes and the text shown for it. */
export interface SafeLink {
  readonly href: string;
  readonly text: string;
}

const DOI_RESOLVER = "https://doi.org/";

/** A DOI as typed, with common prefixes ("doi:", resolver URLs) removed; undefined when it is not a DOI. */
export function normalizeDoi(doi: string): string | undefined {
  const bare = doi
    .trim()
    .replace(/^doi:\s*/i, "")
    .replace(/^https?:\/\/(dx\.)?doi\.org\//i, "");
  return DOI_PATTERN.test(bare) ? bare : undefined;
}

/** https://doi.org/<doi>, each path segment percent-encoded; undefined when the text is not a DOI. */
export function doiLink(doi: string): SafeLink | undefined {
  const bare = normalizeDoi(doi);
  if (bare === undefined) return undefined;
  const encoded = bare.split("/").map((part) => encodeURIComponent(part)).join("/");
  return { href: DOI_RESOLVER + encoded, text: `doi:${bare}` };
}

/** An http(s) URL without credentials, normalized; undefined for anything else (javascript:, data:, relative...). */
export function webLink(url: string): SafeLink | undefined {
  let parsed: URL;
  try {
    parsed = new URL(url.trim());
  } catch {
    return undefined;
  }
  if (parsed.protocol !== "http:" && parsed.protocol !== "https:") return undefined;
  if (parsed.username !== "" || parsed.password !== "") return undefined;
  return { href: parsed.href, text: parsed.href };
}

/** The links a reference may carry, in display order; fields that are not safe links are left out. */
export function referenceLinks(ref: Reference): SafeLink[] {
  const out: SafeLink[] = [];
  if (ref.doi !== undefined) {
    const d = doiLink(ref.doi);
    if (d) out.push(d);
  }
  if (ref.url !== undefined) {
    const u = webLink(ref.url);
    if (u) out.push(u);
  }
  return out;
}
