import path from "node:path";
import type { AuditReport, ObjectAudit } from "../audit/types.js";
import type { OutputManifest } from "../cache/output-manifest.js";
import { digest } from "../cache/digest.js";
import { AUDIT_JSON_ELEMENTS, AUDIT_JSON_STREAMED, DOWNLOADS } from "./downloads.js";
import { writeJsonStreamed, type ReuseBytes, type StreamedFile } from "./json-stream.js";
import { writeChunksFile, writeTextFile } from "./page-writer.js";

/** Where a build with a cache finds the pieces of the full audit JSON it may copy from the last one. */
interface StreamCache {
  readonly manifest: OutputManifest;
  /** The content key of each object's record file, by object; absent: nothing is copied. */
  readonly objectKeys?: ReadonlyMap<ObjectAudit, string>;
  /** Texts made ahead under those keys, copied when the last build's file has none to give. */
  readonly preparedAuditJson?: ReuseBytes;
}

const CHUNK_BUFFER_BYTES = 1 << 20;

/** Downloads written as a stream, object by object, instead of through their render function. */
const STREAMED: Readonly<
  Record<string, (report: AuditReport, file: string, relPath: string, cache?: StreamCache) => StreamedFile>
> = {
  audit_json: (report, file, relPath, cache) => {
    const keys = cache?.objectKeys;
    const segments = keys ? cache.manifest.previousSegments(relPath) : undefined;
    const reuse: ReuseBytes | undefined = segments ? { file, segments } : keys ? cache.preparedAuditJson : undefined;
    return writeJsonStreamed(file, report as unknown as Record<string, unknown>, AUDIT_JSON_STREAMED, {
      ...AUDIT_JSON_ELEMENTS,
      ...(keys ? { keyOf: (item: unknown) => keys.get(item as ObjectAudit) } : {}),
      ...(reuse ? { reuse } : {}),
    });
  },
};

/**
 * Writes every download into the site. With a manifest and the key of the
 * report (see the build pipeline), a download whose report is unchanged and
 * whose file is untouched is kept as it is. Resolves to the number written.
 */
export function writeDownloads(
  report: AuditReport,
  outDir: string,
  cache?: StreamCache & { readonly reportKey: string },
): number {
  let written = 0;
  // one buffer for every download written in pieces
  let scratch: Buffer | undefined;
  for (const d of DOWNLOADS) {
    const key = cache ? digest([cache.reportKey, d.key]) : "";
    if (cache && cache.manifest.reuse(d.path, key)) continue;
    const file = path.join(outDir, ...d.path.split("/"));
    const streamed = STREAMED[d.key];
    if (streamed) {
      const info = streamed(report, file, d.path, cache);
      if (cache) cache.manifest.wrote(d.path, key, info.size, info.mtimeMs, cache.objectKeys ? info.segments : undefined);
    } else {
      const info = d.chunks ? writeChunksFile(file, d.chunks(report), (scratch ??= Buffer.allocUnsafe(CHUNK_BUFFER_BYTES))) : writeTextFile(file, d.render(report));
      if (cache) cache.manifest.wrote(d.path, key, info.size, info.mtimeMs);
    }
    written++;
  }
  return written;
}
