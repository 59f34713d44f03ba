import { closeSync, fstatSync, ftruncateSync, mkdirSync, openSync, renameSync, rmSync, writeSync } from "node:fs";
import path from "node:path";
import { BufferedFile } from "../cache/buffered-file.js";

/**
 * Writes JSON.stringify(value) + "\n" to a file, the same value, without
 * ever holding the whole text: the array under each key named in `streamed`
 * is written one element at a time. (At a hundred thousand objects the full
 * audit is longer than the longest string V8 can make.) Without `padTo` the
 * bytes are those of JSON.stringify; with it, each element of a streamed
 * array is followed by the spaces (JSON white space) that bring its length
 * in bytes to a multiple of `padTo`.
 *
 * With `reuse`, an element whose key the earlier file lists is copied from
 * that file's bytes instead of being written afresh: the caller promises that
 * a key stands for one element text (a record file's content key stands for
 * its object's audit). When the earlier file is the file being written and
 * every copied element would land where it already lies (an edit that keeps
 * the padded length of what it changed, as padding makes likely), only the
 * bytes that changed are written, in place, and the file is cut to its new
 * length. Otherwise the new file is written beside the old one and then put
 * in its place, so the old one can be read while the new one is written.
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
  /** Pad each element of a streamed array with spaces to a multiple of this many bytes (default 1: no padding). */
  readonly padTo?: number;
}

export interface StreamedFile {
  readonly size: number;
  readonly mtimeMs: number;
  /** Every keyed element's place in the new file (padding included). */
  readonly segments: Segment[];
  /** Elements copied from the earlier file (or left where they lay in it). */
  readonly reused: number;
  /** Whether the earlier file was updated in place. */
  readonly inPlace: boolean;
}

const BUFFER_BYTES = 1 << 22;
/** Past this many bytes of changed text an update in place is not tried: writing the file afresh costs about as much. */
const IN_PLACE_MOST_BYTES = 1 << 23;

/** Where the walk over the value sends its output: new text, or an element to take from the earlier file. */
interface Sink {
  /** Bytes of the new file so far. */
  readonly offset: number;
  /** Adds new text; returns its length in bytes. */
  put(text: string): number;
  /** Adds the bytes of an element of the earlier file. */
  copy(old: Segment): void;
}

/** The spaces after an element of `bytes` bytes that make it a multiple of `padTo`. */
function padding(bytes: number, padTo: number): string {
  const rest = bytes % padTo;
  return rest === 0 ? "" : " ".repeat(padTo - rest);
}

/** Sends the file's text to `sink`, element by element; returns the segments and how many elements were copied. */
function walk(
  value: Record<string, unknown>,
  streamed: ReadonlySet<string>,
  options: StreamedOptions,
  earlier: ReadonlyMap<string, Segment>,
  sink: Sink,
): { segments: Segment[]; reused: number } {
  const padTo = options.padTo ?? 1;
  const segments: Segment[] = [];
  let reused = 0;
  sink.put("{");
  let first = true;
  for (const key of Object.keys(value)) {
    const v = value[key];
    // JSON.stringify leaves out keys whose value is undefined, a function or a symbol
    if (v === undefined || typeof v === "function" || typeof v === "symbol") continue;
    sink.put(`${first ? "" : ","}${JSON.stringify(key)}:`);
    first = false;
    if (streamed.has(key) && Array.isArray(v)) {
      sink.put("[");
      v.forEach((item, i) => {
        if (i > 0) sink.put(",");
        const k = options.keyOf?.(item);
        const start = sink.offset;
        const old = k !== undefined ? earlier.get(k) : undefined;
        if (old) {
          sink.copy(old);
          reused++;
        } else {
          const text = options.textOf ? options.textOf(item) : JSON.stringify(item);
          // in an array, JSON.stringify writes null for what it cannot represent
          const bytes = sink.put(text === undefined ? "null" : text);
          if (padTo > 1) sink.put(padding(bytes, padTo));
        }
        if (k !== undefined) segments.push([k, start, sink.offset - start]);
      });
      sink.put("]");
    } else sink.put(JSON.stringify(v));
  }
  sink.put("}\n");
  return { segments, reused };
}

/** Thrown by the planner when the file cannot be updated in place. */
class NotInPlace extends Error {}

/** A stretch of new text and where it goes in the file. */
interface Patch {
  readonly at: number;
  readonly text: string;
}

/**
 * The patches that turn the earlier file into the new one, if every copied
 * element keeps its offset; throws NotInPlace otherwise. A comma between two
 * elements that were neighbours in the earlier file is already there.
 */
class Planner implements Sink {
  offset = 0;
  readonly patches: Patch[] = [];
  private changed = 0;
  /** The earlier segment just copied, while nothing has been put after it but a comma. */
  private lastCopy: Segment | undefined;
  private commaAfterCopy = false;

  put(text: string): number {
    const bytes = Buffer.byteLength(text, "utf8");
    if (bytes === 0) return 0;
    this.commaAfterCopy = this.lastCopy !== undefined && !this.commaAfterCopy && text === ",";
    if (!this.commaAfterCopy) this.lastCopy = undefined;
    this.patches.push({ at: this.offset, text });
    this.offset += bytes;
    this.changed += bytes;
    if (this.changed > IN_PLACE_MOST_BYTES) throw new NotInPlace();
    return bytes;
  }

  copy(old: Segment): void {
    if (old[1] !== this.offset) throw new NotInPlace();
    const previous = this.lastCopy;
    if (previous && this.commaAfterCopy && previous[1] + previous[2] + 1 === old[1]) {
      // the earlier file wrote this comma between the same two elements
      this.patches.pop();
      this.changed -= 1;
    }
    this.lastCopy = old;
    this.commaAfterCopy = false;
    this.offset += old[2];
  }
}

/** Writes the patches into `fd` at their offsets, neighbours gathered into one write. */
function applyPatches(fd: number, patches: readonly Patch[]): void {
  const buffer = Buffer.allocUnsafe(BUFFER_BYTES);
  let used = 0;
  let at = 0;
  const flush = (): void => {
    let off = 0;
    while (off < used) off += writeSync(fd, buffer, off, used - off, at + off);
    used = 0;
  };
  for (const p of patches) {
    if (used > 0 && (at + used !== p.at || used + 3 * p.text.length > BUFFER_BYTES)) flush();
    if (used === 0) at = p.at;
    if (3 * p.text.length > BUFFER_BYTES) {
      const bytes = Buffer.from(p.text, "utf8");
      let off = 0;
      while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off, p.at + off);
      continue;
    }
    used += buffer.write(p.text, used, "utf8");
  }
  flush();
}

/** Updates `file` in place when the plan allows it; undefined when it does not (the file is then untouched). */
function updateInPlace(
  file: string,
  value: Record<string, unknown>,
  streamed: ReadonlySet<string>,
  options: StreamedOptions,
  earlier: ReadonlyMap<string, Segment>,
): StreamedFile | undefined {
  const planner = new Planner();
  let walked: { segments: Segment[]; reused: number };
  try {
    walked = walk(value, streamed, options, earlier, planner);
  } catch (error) {
    if (error instanceof NotInPlace) return undefined;
    throw error;
  }
  let fd: number;
  try {
    fd = openSync(file, "r+");
  } catch {
    return undefined;
  }
  try {
    applyPatches(fd, planner.patches);
    ftruncateSync(fd, planner.offset);
    const info = fstatSync(fd);
    return { size: info.size, mtimeMs: info.mtimeMs, ...walked, inPlace: true };
  } finally {
    closeSync(fd);
  }
}

/**
 * Element texts written ahead, in any order, to a file of their own, each
 * padded as writeJsonStreamed pads it; its `reuse` then lets
 * writeJsonStreamed copy them into place instead of making them there. (A
 * build makes each object's text as its audit arrives from a worker, while
 * this thread would otherwise wait.)
 */
export class PreparedElements {
  private readonly out: BufferedFile;
  private readonly segments: Segment[] = [];
  private closed = false;

  constructor(
    readonly file: string,
    private readonly padTo = 1,
  ) {
    this.out = new BufferedFile(openSync(file, "w"), BUFFER_BYTES);
  }

  /** Adds the text of the element with key `key`. */
  add(key: string, text: string): void {
    if (this.closed) throw new Error("PreparedElements.add: already closed");
    const start = this.out.offset;
    let bytes = this.out.putText(text);
    if (this.padTo > 1) bytes += this.out.putText(padding(bytes, this.padTo));
    this.segments.push([key, start, bytes]);
  }

  /** Writes out what is pending; the texts can then be copied (see writeJsonStreamed's `reuse`). */
  close(): ReuseBytes {
    if (!this.closed) {
      this.out.flush();
      closeSync(this.out.fd);
      this.closed = true;
    }
    return { file: this.file, segments: this.segments };
  }
}

/** The text writeJsonStreamed writes for `value` without an earlier file, as one string (for small values and tests). */
export function jsonStreamedText(value: Record<string, unknown>, streamed: ReadonlySet<string>, options: Omit<StreamedOptions, "reuse"> = {}): string {
  const parts: string[] = [];
  let offset = 0;
  const sink: Sink = {
    get offset() {
      return offset;
    },
    put(text: string): number {
      parts.push(text);
      const bytes = Buffer.byteLength(text, "utf8");
      offset += bytes;
      return bytes;
    },
    copy(): void {
      throw new Error("jsonStreamedText: nothing to copy");
    },
  };
  walk(value, streamed, options, new Map(), sink);
  return parts.join("");
}

export function writeJsonStreamed(
  file: string,
  value: Record<string, unknown>,
  streamed: ReadonlySet<string>,
  options: StreamedOptions = {},
): StreamedFile {
  const padTo = options.padTo ?? 1;
  if (!Number.isInteger(padTo) || padTo < 1) throw new Error(`writeJsonStreamed: padTo must be a whole number ≥ 1, not ${padTo}`);
  mkdirSync(path.dirname(file), { recursive: true });
  const earlier = new Map<string, Segment>();
  for (const s of options.reuse?.segments ?? []) earlier.set(s[0], s);
  if (earlier.size > 0 && options.reuse && path.resolve(options.reuse.file) === path.resolve(file)) {
    const patched = updateInPlace(file, value, streamed, options, earlier);
    if (patched) return patched;
  }
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
    const out = new BufferedFile(fd, BUFFER_BYTES);
    const sink: Sink = {
      get offset() {
        return out.offset;
      },
      put: (text) => out.putText(text),
      // the element's bytes, from the earlier file through the buffer
      copy: (old) => out.copyFrom(source!, `writeJsonStreamed: ${options.reuse!.file}`, old[1], old[2]),
    };
    const walked = walk(value, streamed, options, earlier, sink);
    out.flush();
    const info = fstatSync(fd);
    done = true;
    return { size: info.size, mtimeMs: info.mtimeMs, ...walked, inPlace: false };
  } finally {
    closeSync(fd);
    if (source !== undefined) {
      closeSync(source);
      if (done) renameSync(target, file);
      else rmSync(target, { force: true });
    }
  }
}
