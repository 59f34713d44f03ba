import { readdirSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { readChunkedFile, writeChunkedFile } from "./chunked-file.js";
import { digest } from "./digest.js";

/**
 * The cache of one records folder: its entries spread over a fixed number of
 * shard files by a hash of each record file's path, so that a build that
 * changes one record rewrites one shard, not the whole cache.
 */

export const SHARDS = 64;
const KIND = "steelyard-records";

interface Keyed {
  readonly file: string;
  readonly key: string;
}

function shardFile(folder: string, n: number): string {
  return path.join(folder, `shard-${String(n).padStart(2, "0")}.bin`);
}

export function shardOf(file: string): number {
  return parseInt(digest([file]).slice(0, 6), 16) % SHARDS;
}

/** Every entry of the store by record file; a missing or damaged shard is an empty one. */
export function readRecordStore<T extends Keyed>(folder: string): Map<string, T> {
  const out = new Map<string, T>();
  for (let n = 0; n < SHARDS; n++) {
    for (const v of readChunkedFile(shardFile(folder, n), KIND) ?? []) {
      const e = v as T;
      if (e && typeof e.file === "string" && typeof e.key === "string" && shardOf(e.file) === n) out.set(e.file, e);
    }
  }
  return out;
}

/**
 * Writes the shards whose entries differ from `previous` (what was read at
 * the start of the build): an entry taken over unchanged is the same object.
 * Resolves to the number of shards written.
 */
export function writeRecordStore<T extends Keyed>(folder: string, entries: readonly T[], previous: ReadonlyMap<string, T>): number {
  const shards: T[][] = Array.from({ length: SHARDS }, () => []);
  for (const e of entries) shards[shardOf(e.file)].push(e);
  const before = new Array<number>(SHARDS).fill(0);
  for (const e of previous.values()) before[shardOf(e.file)]++;
  let written = 0;
  shards.forEach((list, n) => {
    const same = list.length === before[n] && list.every((e) => previous.get(e.file) === e);
    if (same) return;
    if (list.length === 0) rmSync(shardFile(folder, n), { force: true });
    else writeChunkedFile(shardFile(folder, n), KIND, list);
    written++;
  });
  return written;
}

/** A digest of the shard files' names, sizes and times: changes whenever any shard is written. */
export function recordStoreState(folder: string): string {
  const parts: string[] = [];
  let names: string[];
  try {
    names = readdirSync(folder).filter((n) => n.endsWith(".bin")).sort();
  } catch {
    return "missing";
  }
  for (const n of names) {
    try {
      const s = statSync(path.join(folder, n));
      parts.push(n, String(s.size), String(s.mtimeMs));
    } catch {
      parts.push(n, "gone");
    }
  }
  return digest(parts);
}
