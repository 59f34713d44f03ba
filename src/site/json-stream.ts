import { closeSync, fstatSync, mkdirSync, openSync, writeSync } from "node:fs";
import path from "node:path";

/**
 * Writes JSON.stringify(value) + "\n" to a file, the same bytes, without ever
 * holding the whole text: the array under each key named in `streamed` is
 * written one element at a time. (At a hundred thousand objects the full
 * audit is longer than the longest string V8 can make.)
 */
const BUFFER_BYTES = 1 << 22;

export function writeJsonStreamed(
  file: string,
  value: Record<string, unknown>,
  streamed: ReadonlySet<string>,
): { size: number; mtimeMs: number } {
  mkdirSync(path.dirname(file), { recursive: true });
  const fd = openSync(file, "w");
  try {
    // texts are encoded straight into one buffer, written out whenever the next might not fit
    const buffer = Buffer.allocUnsafe(BUFFER_BYTES);
    let used = 0;
    const writeAll = (bytes: Buffer, length: number): void => {
      let off = 0;
      while (off < length) off += writeSync(fd, bytes, off, length - off);
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
          const text = JSON.stringify(item);
          // in an array, JSON.stringify writes null for what it cannot represent
          put((i > 0 ? "," : "") + (text === undefined ? "null" : text));
        });
        put("]");
      } else put(JSON.stringify(v));
    }
    put("}\n");
    flush();
    const info = fstatSync(fd);
    return { size: info.size, mtimeMs: info.mtimeMs };
  } finally {
    closeSync(fd);
  }
}
