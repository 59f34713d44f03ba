import { closeSync, fstatSync, mkdirSync, openSync, writeSync } from "node:fs";
import path from "node:path";
import type { AuditReport } from "../audit/types.js";
import type { OutputManifest } from "../cache/output-manifest.js";
import { digest } from "../cache/digest.js";
import { DOWNLOADS } from "./downloads.js";
import { writeJsonStreamed } from "./json-stream.js";

/** Downloads written as a stream, object by object, instead of through their render function. */
const STREAMED: Readonly<Record<string, (report: AuditReport, file: string) => { size: number; mtimeMs: number }>> = {
  audit_json: (report, file) => writeJsonStreamed(file, report as unknown as Record<string, unknown>, new Set(["objects"])),
};

function writeText(file: string, text: string): { size: number; mtimeMs: number } {
  mkdirSync(path.dirname(file), { recursive: true });
  const fd = openSync(file, "w");
  try {
    const bytes = Buffer.from(text, "utf8");
    let off = 0;
    while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    const info = fstatSync(fd);
    return { size: info.size, mtimeMs: info.mtimeMs };
  } finally {
    closeSync(fd);
  }
}

/**
 * Writes every download into the site. With a manifest and the key of the
 * report (see the build pipeline), a download whose report is unchanged and
 * whose file is untouched is kept as it is. Resolves to the number written.
 */
export function writeDownloads(
  report: AuditReport,
  outDir: string,
  cache?: { readonly manifest: OutputManifest; readonly reportKey: string },
): number {
  let written = 0;
  for (const d of DOWNLOADS) {
    const key = cache ? digest([cache.reportKey, d.key]) : "";
    if (cache && cache.manifest.reuse(d.path, key)) continue;
    const file = path.join(outDir, ...d.path.split("/"));
    const streamed = STREAMED[d.key];
    const info = streamed ? streamed(report, file) : writeText(file, d.render(report));
    if (cache) cache.manifest.wrote(d.path, key, info.size, info.mtimeMs);
    written++;
  }
  return written;
}
