import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { VERSION } from "../version.js";
import { digest } from "./digest.js";

/**
 * Every file under `dir` (sorted, forward-slash relative paths) whose name
 * passes `keep`, outside the folders (by relative path) that `skipFolder` names.
 */
export function filesUnder(dir: string, keep: (name: string) => boolean, skipFolder: (rel: string) => boolean = () => false): string[] {
  const out: string[] = [];
  const walk = (abs: string, rel: string): void => {
    let entries;
    try {
      entries = readdirSync(abs, { withFileTypes: true });
    } catch {
      return;
    }
    for (const e of entries) {
      const r = rel === "" ? e.name : `${rel}/${e.name}`;
      if (e.isDirectory()) {
        if (!skipFolder(r)) walk(path.join(abs, e.name), r);
      } else if (e.isFile() && keep(e.name)) out.push(r);
    }
  };
  walk(dir, "");
  return out.sort();
}

/** A digest of every matching file's path and bytes under `dir`. */
export function folderDigest(dir: string, keep: (name: string) => boolean): string {
  const parts: Array<string | Uint8Array> = [];
  for (const rel of filesUnder(dir, keep)) parts.push(rel, readFileSync(path.join(dir, ...rel.split("/"))));
  return digest(parts);
}

let codeDigest: string | undefined;

/**
 * The tool's version and a digest of its own code (the compiled modules, or
 * the sources when they run under a test runner): any change to the program
 * makes every cached audit and page stale, even without a version bump.
 * Computed once per process.
 */
export function toolFingerprint(): string {
  codeDigest ??= digest([VERSION, folderDigest(fileURLToPath(new URL("../", import.meta.url)), (n) => /\.(js|ts|mjs)$/.test(n))]);
  return codeDigest;
}
