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

describe("streamed JSON that copies unchanged elements from the file it replaces", () => {
  const keyOf = (item: unknown) => (item as { id?: string }).id;

  it("copies the elements whose key it knows and writes the rest, the bytes of JSON.stringify", () => {
    const file = path.join(dir, "reuse.json");
    const items = Array.from({ length: 3000 }, (_, i) => ({ id: `k${i}`, text: "σ ü ".repeat(i % 50), v: i / 3 }));
    const first = writeJsonStreamed(file, { head: 1, objects: items }, new Set(["objects"]), { keyOf });
    expect(first.reused).toBe(0);
    expect(first.segments).toHaveLength(3000);

    // one element changed under a new key, one removed, one added, the head changed
    const next = [...items];
    next[10] = { id: "k10-edited", text: "changed", v: -1 };
    next.splice(20, 1);
    next.push({ id: "new", text: "added", v: 0 });
    const value = { head: 2, objects: next };
    const second = writeJsonStreamed(file, value, new Set(["objects"]), { keyOf, reuse: { file, segments: first.segments } });
    expect(readFileSync(file, "utf8")).toBe(JSON.stringify(value) + "\n");
    expect(second.reused).toBe(next.length - 2);
    // the new segments describe the new file
    const bytes = readFileSync(file);
    for (const [key, offset, length] of second.segments.slice(0, 50)) {
      expect(JSON.parse(bytes.subarray(offset, offset + length).toString("utf8")).id).toBe(key);
    }
  });

  it("writes everything afresh when the earlier file is gone", () => {
    const file = path.join(dir, "gone.json");
    const value = { objects: [{ id: "a" }, { id: "b" }] };
    const out = writeJsonStreamed(file, value, new Set(["objects"]), {
      keyOf,
      reuse: { file: path.join(dir, "missing.json"), segments: [["a", 0, 5]] },
    });
    expect(out.reused).toBe(0);
    expect(readFileSync(file, "utf8")).toBe(JSON.stringify(value) + "\n");
  });
});
