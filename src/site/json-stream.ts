import { closeSync, fstatSync, mkdirSync, openSync, readSync, renameSync, rmSync, writeSync } from "node:fs";
import path from "node:path";

/**
 * Writes JSON.stringify(value) + "\n" to a file, the same bytes, without ever
 * holding the whole text: the array under each key named in `streamed` is
 * written one element at a time. (At a hundred thousand objects the full
 * audit is longer than the longest string V8 can make.)
 *
 * With `reuse`, an element whose key the earlier file lists is copied from
 * that file's bytes instead of being written afresh: the caller promises that
 * a key stands for one element text (a record file's content key stands for
 * its object's audit). The new file is written beside the old one and then
 * put in its place, so the old one can be read while the new one is written.
 */

/** Where one keyed element's text lies in a file: [key, byte offset, byte length]. */
export type Segment = readonly [key: string, offset: number, length: number];

export interface ReuseBytes {
  /** The file written earlier with these segments (usually the file being replaced); it must be unchanged since. */
  readonly file: string;
  readonly segments: readonly Segment[];
}

export interface StreamedOptions {
  /** The key of an element of a streamed array, or undefined for one that is never reused. */
  readonly keyOf?: (item: unknown) => string | undefined;
  readonly reuse?: ReuseBytes;
  /** JSON.stringify of an element of a streamed array (default JSON.stringify itself). */
  readonly textOf?: (item: unknown) => string | undefined;
}

export interface StreamedFile {
  readonly size: number;
  readonly mtimeMs: number;
  /** Every keyed element's place in the new file. */
  readonly segments: Segment[];
  /** Elements copied from the earlier file. */
  readonly reused: number;
}

const BUFFER_BYTES = 1 << 22;

export function writeJsonStreamed(
  file: string,
  value: Record<string, unknown>,
  streamed: ReadonlySet<string>,
  options: StreamedOptions = {},
): StreamedFile {
  mkdirSync(path.dirname(file), { recursive: true });
  const earlier = new Map<string, Segment>();
  for (const s of options.reuse?.segments ?? []) earlier.set(s[0], s);
  let source: number | undefined;
  if (earlier.size > 0 && options.reuse) {
    try {
      source = openSync(options.reuse.file, "r");
    } catch {
      earlier.clear();
    }
  }
  const target = source === undefined ? file : `${file}.partial`;
  const fd = openSync(target, "w");
  let done = false;
  try {
    // texts are encoded straight into one buffer, written out whenever the next might not fit
    const buffer = Buffer.allocUnsafe(BUFFER_BYTES);
    let used = 0;
    let offset = 0;
    const writeAll = (bytes: Buffer, length: number): void => {
      let off = 0;
      while (off < length) off += writeSync(fd, bytes, off, length - off);
      offset += length;
    };
    const flush = (): void => {
      writeAll(buffer, used);
      used = 0;
    };
    const put = (text: string): void => {
      // at most three UTF-8 bytes per UTF-16 code unit
      const most = 3 * text.length;
      if (used + most > BUFFER_BYTES) flush();
      if (most > BUFFER_BYTES) {
        const bytes = Buffer.from(text, "utf8");
        writeAll(bytes, bytes.length);
      } else used += buffer.write(text, used, "utf8");
    };
    /** Copies bytes [from, from + length) of the earlier file through the buffer. */
    const copy = (from: number, length: number): void => {
      let left = length;
      let at = from;
      while (left > 0) {
        if (used === BUFFER_BYTES) flush();
        const n = readSync(source!, buffer, used, Math.min(left, BUFFER_BYTES - used), at);
        if (n <= 0) throw new Error(`writeJsonStreamed: ${options.reuse!.file} is shorter than its segments say`);
        used += n;
        at += n;
        left -= n;
      }
    };
    const segments: Segment[] = [];
    let reused = 0;
    put("{");
    let first = true;
    for (const key of Object.keys(value)) {
      const v = value[key];
      // JSON.stringify leaves out keys whose value is undefined, a function or a symbol
      if (v === undefined || typeof v === "function" || typeof v === "symbol") continue;
      put(`${first ? "" : ","}${JSON.stringify(key)}:`);
      first = false;
      if (streamed.has(key) && Array.isArray(v)) {
        put("[");
        v.forEach((item, i) => {
          if (i > 0) put(",");
          const k = options.keyOf?.(item);
          const start = offset + used;
          const old = k !== undefined ? earlier.get(k) : undefined;
          if (old) {
            copy(old[1], old[2]);
            reused++;
          } else {
            const text = options.textOf ? options.textOf(item) : JSON.stringify(item);
            // in an array, JSON.stringify writes null for what it cannot represent
            put(text === undefined ? "null" : text);
          }
          if (k !== undefined) segments.push([k, start, offset + used - start]);
        });
        put("]");
      } else put(JSON.stringify(v));
    }
    put("}\n");
    flush();
    const info = fstatSync(fd);
    done = true;
    return { size: info.size, mtimeMs: info.mtimeMs, segments, reused };
  } finally {
    closeSync(fd);
    if (source !== undefined) {
      closeSync(source);
      if (done) renameSync(target, file);
      else rmSync(target, { force: true });
    }
  }
}
