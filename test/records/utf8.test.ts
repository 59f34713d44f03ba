import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { firstInvalidUtf8, locateByte } from "../../src/records/utf8.js";

const bytes = (...b: number[]) => Uint8Array.from(b);

// Byte sequences from RFC 3629 (Yergeau 2003), section 3 (the UTF-8 definition) and
// section 10 (overlong forms and surrogates are invalid).
describe("firstInvalidUtf8 against RFC 3629", () => {
  it("accepts one- to four-byte characters", () => {
    expect(firstInvalidUtf8(bytes(0x41))).toBe(-1); // A
    expect(firstInvalidUtf8(bytes(0xc3, 0xa9))).toBe(-1); // é U+00E9
    expect(firstInvalidUtf8(bytes(0xe2, 0x98, 0x89))).toBe(-1); // ☉ U+2609
    expect(firstInvalidUtf8(bytes(0xf0, 0x9f, 0x8c, 0x8c))).toBe(-1); // U+1F30C
    expect(firstInvalidUtf8(bytes(0xf4, 0x8f, 0xbf, 0xbf))).toBe(-1); // U+10FFFF, the last code point
  });
  it("points at the first bad byte", () => {
    expect(firstInvalidUtf8(bytes(0x61, 0x62, 0xe9, 0x63))).toBe(2); // Latin-1 é
    expect(firstInvalidUtf8(bytes(0xc0, 0xaf))).toBe(0); // overlong "/"
    expect(firstInvalidUtf8(bytes(0xe0, 0x80, 0xaf))).toBe(0); // overlong, three bytes
    expect(firstInvalidUtf8(bytes(0xed, 0xa0, 0x80))).toBe(0); // surrogate U+D800
    expect(firstInvalidUtf8(bytes(0xf4, 0x90, 0x80, 0x80))).toBe(0); // above U+10FFFF
    expect(firstInvalidUtf8(bytes(0x41, 0xe2, 0x98))).toBe(1); // truncated at the end
    expect(firstInvalidUtf8(bytes(0x80))).toBe(0); // lone continuation byte
    expect(firstInvalidUtf8(bytes(0xff, 0xfe, 0x41, 0x00))).toBe(0); // UTF-16 byte-order mark
  });
});

// Node's own decoder (WHATWG Encoding Standard, fatal mode) as the general-purpose reference.
describe("firstInvalidUtf8 agrees with TextDecoder in fatal mode", () => {
  const decoder = new TextDecoder("utf-8", { fatal: true });
  const valid = (b: Uint8Array) => {
    try {
      decoder.decode(b);
      return true;
    } catch {
      return false;
    }
  };
  it("on random bytes biased towards multi-byte forms", () => {
    const byte = fc.oneof(fc.integer({ min: 0, max: 255 }), fc.integer({ min: 0x80, max: 0xbf }), fc.constantFrom(0xc2, 0xe0, 0xed, 0xf0, 0xf4));
    fc.assert(
      fc.property(fc.array(byte, { maxLength: 12 }), (arr) => {
        const b = Uint8Array.from(arr);
        expect(firstInvalidUtf8(b) === -1).toBe(valid(b));
      }),
      { numRuns: 3000 },
    );
  });
  it("on every encoded string", () => {
    fc.assert(fc.property(fc.string({ unit: "grapheme" }), (s) => {
      expect(firstInvalidUtf8(new TextEncoder().encode(s))).toBe(-1);
    }));
  });
});

describe("locateByte", () => {
  it("counts lines and characters before the offset", () => {
    const b = new TextEncoder().encode("a: 1\nnamé: x");
    // offset of "x": line 2, after "namé: " (6 characters, 7 bytes)
    expect(locateByte(b, b.length - 1)).toEqual({ line: 2, column: 7 });
    expect(locateByte(b, 0)).toEqual({ line: 1, column: 1 });
  });
});
