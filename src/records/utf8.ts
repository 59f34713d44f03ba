/**
 * Offset of the first byte that breaks UTF-8 (RFC 3629: no overlong forms, no
 * surrogates, nothing above U+10FFFF), or -1 when the bytes are valid UTF-8.
 */
export function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  const n = bytes.length;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let min: number;
    let max = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) {
      need = 1;
      min = 0x80;
    } else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      min = b === 0xe0 ? 0xa0 : 0x80;
      if (b === 0xed) max = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      min = b === 0xf0 ? 0x90 : 0x80;
      if (b === 0xf4) max = 0x8f;
    } else {
      return i;
    }
    const second = bytes[i + 1];
    if (second === undefined || second < min || second > max) return i;
    for (let k = 2; k <= need; k++) {
      const c = bytes[i + k];
      if (c === undefined || c < 0x80 || c > 0xbf) return i;
    }
    i += need + 1;
  }
  return -1;
}

/**
 * 1-based line and column of a byte offset, counting "\n" line breaks; the
 * column counts the characters before it on its line (the bytes before the
 * offset are valid UTF-8 when the offset comes from `firstInvalidUtf8`).
 */
export function locateByte(bytes: Uint8Array, offset: number): { line: number; column: number } {
  let line = 1;
  let start = 0;
  const end = Math.min(offset, bytes.length);
  for (let i = 0; i < end; i++) {
    if (bytes[i] === 10) {
      line++;
      start = i + 1;
    }
  }
  const before = new TextDecoder("utf-8").decode(bytes.subarray(start, end));
  return { line, column: [...before].length + 1 };
}
