import { closeSync, mkdirSync, openSync, readSync, renameSync, rmSync } from "node:fs";
import { BufferedFile } from "./buffered-file.js";
import path from "node:path";
import { deserialize, serialize } from "node:v8";

/**
 * A cache file of many values, each in V8's serialization (which keeps -0,
 * NaN, ±Infinity and undefined exactly, as JSON would not), written and read
 * one value at a time, so that a catalogue's cache never has to sit in memory
 * as one buffer. Layout: an 8-byte magic, then per value a 4-byte
 * little-endian length and the bytes; the first value is a header naming the
 * kind of cache and its format version. Anything missing, of another kind or
 * version, truncated or damaged reads as nothing: the cache is then cold.
 * Writes go to a temporary file renamed into place.
 */

const MAGIC = Buffer.from("STLYCHK1", "latin1");
export const CHUNKED_FORMAT = 1;

interface Header {
  readonly kind: string;
  readonly format: number;
}

/**
 * Reads every value after the header, or undefined when the file is not a
 * valid cache of `kind`. `scratch`, when given, is read into first: a buffer
 * that the caller reuses from file to file, so that each file does not touch
 * new memory (a megabyte of it costs a millisecond or two on a virtual
 * machine). Only for values that hold no byte arrays, since deserialize()
 * makes byte arrays that view its input, which the next file overwrites.
 */
export function readChunkedFile(file: string, kind: string, scratch?: Buffer): unknown[] | undefined {
  let fd: number;
  try {
    fd = openSync(file, "r");
  } catch {
    return undefined;
  }
  try {
    const values: unknown[] = [];
    let buf = scratch ?? Buffer.alloc(1 << 20);
    let start = 0;
    let end = 0;
    let eof = false;
    // makes `n` bytes available from `start`; false at the end of the file
    // a buffer once read from is never written again: deserialize() gives byte arrays that view
    // its input, so the unread rest moves to a fresh buffer instead of to the front of this one
    const need = (n: number): boolean => {
      while (end - start < n && !eof) {
        if (start > 0 || buf.length < n) {
          const next = Buffer.allocUnsafe(Math.max(n, 1 << 20));
          buf.copy(next, 0, start, end);
          end -= start;
          start = 0;
          buf = next;
        }
        const got = readSync(fd, buf, end, buf.length - end, null);
        if (got === 0) eof = true;
        end += got;
      }
      return end - start >= n;
    };
    if (!need(MAGIC.length) || !buf.subarray(start, start + MAGIC.length).equals(MAGIC)) return undefined;
    start += MAGIC.length;
    let header: Header | undefined;
    while (need(4)) {
      const len = buf.readUInt32LE(start);
      if (!need(4 + len)) return undefined;
      const value = deserialize(buf.subarray(start + 4, start + 4 + len));
      start += 4 + len;
      if (header === undefined) {
        header = value as Header;
        if (!header || header.kind !== kind || header.format !== CHUNKED_FORMAT) return undefined;
      } else values.push(value);
    }
    if (end !== start || header === undefined) return undefined;
    return values;
  } catch {
    return undefined;
  } finally {
    closeSync(fd);
  }
}

const WRITE_BUFFER_BYTES = 1 << 20;

/** Writes the values, one at a time, behind a header of `kind`. */
export function writeChunkedFile(file: string, kind: string, values: Iterable<unknown>): void {
  mkdirSync(path.dirname(file), { recursive: true });
  const tmp = `${file}.${process.pid}.tmp`;
  const fd = openSync(tmp, "w");
  let ok = false;
  try {
    // values are gathered into one buffer and written a megabyte at a time, not two system calls each
    const out = new BufferedFile(fd, WRITE_BUFFER_BYTES);
    const len = Buffer.alloc(4);
    const put = (value: unknown): void => {
      const bytes = serialize(value);
      len.writeUInt32LE(bytes.length);
      out.putBytes(len);
      out.putBytes(bytes);
    };
    out.putBytes(MAGIC);
    put({ kind, format: CHUNKED_FORMAT } satisfies Header);
    for (const v of values) put(v);
    out.flush();
    ok = true;
  } finally {
    closeSync(fd);
    if (ok) renameSync(tmp, file);
    else rmSync(tmp, { force: true });
  }
}
