import fc from "fast-check";
import { readFileSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { writeBytesFile, writeChunksFile, writeTextFile } from "../../src/site/page-writer.js";
import { tempDirs } from "./helpers/temp-dirs.js";

/** A file written in pieces through a small reused buffer holds the bytes of the whole text, encoded once. */

const temp = tempDirs("steelyard-page-writer");

describe("writeChunksFile", () => {
  it("writes the UTF-8 of the pieces joined, whatever their sizes against the buffer", () => {
    const dir = temp("chunks");
    // a 64-byte buffer: pieces fit, fill it exactly, or are far larger than it
    const scratch = Buffer.alloc(64);
    const piece = fc.oneof(fc.string({ maxLength: 30 }), fc.string({ unit: "grapheme", maxLength: 30 }), fc.string({ minLength: 60, maxLength: 400 }));
    let n = 0;
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 40 }), (pieces) => {
        const file = path.join(dir, `f${n++}`, "out.txt");
        const info = writeChunksFile(file, pieces, scratch);
        const want = Buffer.from(pieces.join(""), "utf8");
        expect(readFileSync(file).equals(want)).toBe(true);
        expect(info.size).toBe(want.length);
        expect(info.mtimeMs).toBe(statSync(file).mtimeMs);
      }),
      { numRuns: 200 },
    );
  });
});

describe("writing over a file that is there", () => {
  it("leaves exactly the new bytes, whether they are longer or shorter than the old ones", () => {
    const dir = temp("over");
    const text = fc.string({ unit: "grapheme", maxLength: 300 });
    let n = 0;
    fc.assert(
      fc.property(text, text, fc.constantFrom("text", "bytes", "chunks"), (before, after, how) => {
        const file = path.join(dir, `f${n++}.html`);
        writeFileSync(file, before);
        const scratch = Buffer.alloc(16);
        const info =
          how === "text" ? writeTextFile(file, after) : how === "bytes" ? writeBytesFile(file, Buffer.from(after, "utf8")) : writeChunksFile(file, [after, after], scratch);
        const want = Buffer.from(how === "chunks" ? after + after : after, "utf8");
        expect(readFileSync(file).equals(want)).toBe(true);
        expect(info.size).toBe(want.length);
        expect(statSync(file).size).toBe(want.length);
      }),
      { numRuns: 200 },
    );
  });
});
