import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { writeJsonStreamed } from "../../src/site/json-stream.js";

const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-json-stream-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// reference: the language's own JSON.stringify (ECMA-262), which the stream must match byte for byte
describe("streamed JSON", () => {
  it("writes the bytes of JSON.stringify(value) + newline for any JSON-like object", () => {
    const file = path.join(dir, "prop.json");
    fc.assert(
      fc.property(
        fc.dictionary(fc.string(), fc.oneof(fc.jsonValue(), fc.constant(undefined), fc.array(fc.oneof(fc.jsonValue(), fc.constant(undefined), fc.double())))),
        fc.array(fc.string(), { maxLength: 3 }),
        (value, streamedKeys) => {
          const streamed = new Set([...streamedKeys, ...Object.keys(value).slice(0, 2)]);
          writeJsonStreamed(file, value as Record<string, unknown>, streamed);
          expect(readFileSync(file, "utf8")).toBe(JSON.stringify(value) + "\n");
        },
      ),
      { numRuns: 200 },
    );
  });

  it("streams a long array across many buffer flushes", () => {
    const file = path.join(dir, "long.json");
    const value = { head: { a: 1 }, objects: Array.from({ length: 20000 }, (_, i) => ({ i, s: "ü".repeat(i % 97), x: i / 7 })), tail: [NaN, -0] };
    writeJsonStreamed(file, value, new Set(["objects"]));
    expect(readFileSync(file, "utf8")).toBe(JSON.stringify(value) + "\n");
  });
});
