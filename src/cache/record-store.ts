import { closeSync, mkdirSync, openSync, readdirSync, readSync, renameSync, rmSync, statSync } from "node:fs";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { BufferedFile } from "./buffered-file.js";
import { readChunkedFile, writeChunkedFile } from "./chunked-file.js";
import { digest } from "./digest.js";

/**
 * The cache of one records folder: its entries spread over a fixed number of
 * shard files by a hash of each record file's path, so that a build that
 * changes one record rewrites one shard, not the whole cache.
 */

export const SHARDS = 64;
const BLOB_BUFFER_BYTES = 1 << 20;
/** Room for a whole shard of a catalogue of tens of thousands of records; a larger shard reads on into new buffers. */
const SHARD_READ_BYTES = 1 << 22;
const KIND = "steelyard-records";

interface Keyed {
  readonly file: string;
  readonly key: string;
}

function shardFile(folder: string, n: number): string {
  return path.join(folder, `shard-${String(n).padStart(2, "0")}.bin`);
}

/**
 * The shard of a record file: FNV-1a (32 bits) of its path, modulo SHARDS.
 * Only the spread matters here, not resistance to collisions, and a build
 * asks it three times per record file (reading, and writing old and new).
 */
export function shardOf(file: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < file.length; i++) {
    h ^= file.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return (h >>> 0) % SHARDS;
}

/**
 * How entries are kept: the value written to the shard, and apart from it
 * the bytes of a blob that is read back only when asked for (the identity by
 * default: no blobs).
 */
export interface StoreCodec<T> {
  encode(entry: T): { readonly value: unknown; readonly blob?: Uint8Array };
  /** `blob` reads the entry's blob back, when it has one. */
  decode(value: unknown, blob?: () => Uint8Array): T;
  /** No encoded value holds a byte array (those go in blobs): the shards can then be read through one reused buffer (see readChunkedFile). */
  readonly valuesHoldNoBytes?: boolean;
}

const IDENTITY: StoreCodec<never> = {
  encode: (e) => ({ value: e }),
  decode: (v) => v as never,
};

/**
 * A shard's values as written: the name and size of its blob file first,
 * then one array with, per entry, its value and its blob's place. Each writing of a shard
 * makes a blob file of a new name, so a shard never reads blobs written for
 * another version of it.
 */
interface ShardHead {
  readonly blobs: string;
  readonly blobBytes: number;
}
interface ShardRecord {
  readonly value: unknown;
  readonly at?: number;
  readonly length?: number;
}

const shardPrefix = (n: number): string => `shard-${String(n).padStart(2, "0")}.`;

/** The blob files of shard n in the folder, by name. */
function blobFilesOf(folder: string, n: number): string[] {
  try {
    return readdirSync(folder).filter((name) => name.startsWith(shardPrefix(n)) && name.endsWith(".blobs"));
  } catch {
    return [];
  }
}

/** Bytes [at, at + length) of the open file `fd`; `name` names it when it is shorter. */
export function readRange(fd: number, name: string, at: number, length: number): Uint8Array {
  const out = Buffer.allocUnsafeSlow(length);
  let got = 0;
  while (got < length) {
    const n = readSync(fd, out, got, length - got, at + got);
    if (n <= 0) throw new Error(`record store: ${name} ends before the ${length} bytes at ${at} it should hold`);
    got += n;
  }
  return out;
}

/** Bytes [at, at + length) of a file. */
export function readBlob(file: string, at: number, length: number): Uint8Array {
  const fd = openSync(file, "r");
  try {
    return readRange(fd, file, at, length);
  } finally {
    closeSync(fd);
  }
}

function blobBytesOnDisk(file: string): number {
  try {
    return statSync(file).size;
  } catch {
    return 0;
  }
}

/** Every entry of the store by record file; a missing or damaged shard is an empty one. */
export function readRecordStore<T extends Keyed>(folder: string, codec: StoreCodec<T> = IDENTITY as StoreCodec<T>): Map<string, T> {
  const out = new Map<string, T>();
  const scratch = codec.valuesHoldNoBytes ? Buffer.allocUnsafe(SHARD_READ_BYTES) : undefined;
  for (let n = 0; n < SHARDS; n++) {
    const values = readChunkedFile(shardFile(folder, n), KIND, scratch);
    if (!values || values.length === 0) continue;
    const head = values[0] as ShardHead;
    if (!head || typeof head.blobs !== "string" || typeof head.blobBytes !== "number" || head.blobs.includes("/")) continue;
    const blobs = path.join(folder, head.blobs);
    // a blob file missing or of another size makes the whole shard unusable
    if (head.blobBytes > 0 && blobBytesOnDisk(blobs) !== head.blobBytes) continue;
    // one value holds every record of the shard: one deserialisation, not one per entry
    const records = values[1];
    if (values.length !== 2 || !Array.isArray(records)) continue;
    for (const r of records as ShardRecord[]) {
      if (!r) continue;
      const { at, length } = r;
      const e = codec.decode(r.value, at !== undefined && length !== undefined ? () => readBlob(blobs, at, length) : undefined);
      if (e && typeof e.file === "string" && typeof e.key === "string" && shardOf(e.file) === n) out.set(e.file, e);
    }
  }
  return out;
}

/** Writes one shard: its blobs to a new file first, then its values, then the old blob files go. */
function writeShard<T>(folder: string, n: number, list: readonly T[], codec: StoreCodec<T>, scratch: Buffer): void {
  mkdirSync(folder, { recursive: true });
  const name = `${shardPrefix(n)}${randomBytes(8).toString("hex")}.blobs`;
  const blobs = path.join(folder, name);
  const records: ShardRecord[] = [];
  const fd = openSync(blobs, "w");
  let at = 0;
  try {
    // gathered a megabyte at a time, not one system call per blob
    const out = new BufferedFile(fd, scratch);
    // an entry read from the old blob files reads its blob here, before they go
    for (const e of list) {
      const { value, blob } = codec.encode(e);
      if (blob === undefined) {
        records.push({ value });
        continue;
      }
      out.putBytes(blob);
      records.push({ value, at, length: blob.length });
      at += blob.length;
    }
    out.flush();
  } catch (error) {
    closeSync(fd);
    rmSync(blobs, { force: true });
    throw error;
  }
  closeSync(fd);
  if (at === 0) rmSync(blobs, { force: true });
  const kept = at === 0 ? "" : name;
  writeChunkedFile(shardFile(folder, n), KIND, [{ blobs: kept, blobBytes: at } satisfies ShardHead, records]);
  for (const old of blobFilesOf(folder, n)) if (old !== kept) rmSync(path.join(folder, old), { force: true });
}

/**
 * Writes the shards whose entries differ from `previous` (what was read at
 * the start of the build): an entry taken over unchanged is the same object.
 * Resolves to the number of shards written.
 */
export function writeRecordStore<T extends Keyed>(
  folder: string,
  entries: readonly T[],
  previous: ReadonlyMap<string, T>,
  codec: StoreCodec<T> = IDENTITY as StoreCodec<T>,
): number {
  const shards: T[][] = Array.from({ length: SHARDS }, () => []);
  for (const e of entries) shards[shardOf(e.file)].push(e);
  const before = new Array<number>(SHARDS).fill(0);
  for (const e of previous.values()) before[shardOf(e.file)]++;
  let written = 0;
  // one buffer for the blobs of every shard written
  let scratch: Buffer | undefined;
  shards.forEach((list, n) => {
    const same = list.length === before[n] && list.every((e) => previous.get(e.file) === e);
    if (same) return;
    if (list.length === 0) {
      rmSync(shardFile(folder, n), { force: true });
      for (const old of blobFilesOf(folder, n)) rmSync(path.join(folder, old), { force: true });
    } else writeShard(folder, n, list, codec, (scratch ??= Buffer.allocUnsafe(BLOB_BUFFER_BYTES)));
    written++;
  });
  return written;
}

/** A digest of the shard files' names, sizes and times: changes whenever any shard is written. */
export function recordStoreState(folder: string): string {
  const parts: string[] = [];
  let names: string[];
  try {
    names = readdirSync(folder).filter((n) => n.endsWith(".bin") || n.endsWith(".blobs")).sort();
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
