import { createHash } from "node:crypto";

/**
 * A content hash of several parts, hex. Each part is length-prefixed, so
 * ("ab", "c") and ("a", "bc") never share a digest. SHA-1 is used for speed:
 * the digest keys a cache, it guards nothing.
 */
export function digest(parts: ReadonlyArray<string | Uint8Array>): string {
  const h = createHash("sha1");
  for (const p of parts) {
    const bytes = typeof p === "string" ? Buffer.from(p, "utf8") : p;
    h.update(`${bytes.byteLength}:`);
    h.update(bytes);
  }
  return h.digest("hex");
}
