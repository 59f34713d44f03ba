import { closeSync, fstatSync, mkdirSync, openSync, writeSync } from "node:fs";
import path from "node:path";

/**
 * Writes JSON.stringify(value) + "\n" to a file, the same bytes, without ever
 * holding the whole text: the array under each key named in `streamed` is
 * written one element at a time. (At a hundred thousand objects the full
 * audit is longer than the longest string V8 can make.)
 */
export function writeJsonStreamed(
  file: string,
  value: Record<string, unknown>,
  streamed: ReadonlySet<string>,
): { size: number; mtimeMs: number } {
  mkdirSync(path.dirname(file), { recursive: true });
  const fd = openSync(file, "w");
  try {
    let pending: string[] = [];
    let pendingLength = 0;
    const flush = (): void => {
      if (pending.length === 0) return;
      const bytes = Buffer.from(pending.join(""), "utf8");
      let off = 0;
      while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
      pending = [];
      pendingLength = 0;
    };
    const put = (text: string): void => {
      pending.push(text);
      pendingLength += text.length;
      if (pendingLength >= 1 << 20) flush();
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
