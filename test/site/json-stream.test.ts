import { mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { jsonStreamedText, PreparedElements, writeJsonStreamed } from "../../src/site/json-stream.js";

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

describe("padded streamed JSON, updated in place where it can be", () => {
  const keyOf = (item: unknown) => (item as { id?: string }).id;
  const PAD = 64;
  const items = (n: number) => Array.from({ length: n }, (_, i) => ({ id: `k${i}`, text: "σ ü ".repeat(i % 30), v: i / 3 }));

  it("pads each element to a multiple of the given bytes and keeps the value of JSON.stringify", () => {
    const file = path.join(dir, "padded.json");
    fc.assert(
      fc.property(fc.array(fc.jsonValue(), { maxLength: 20 }), fc.integer({ min: 1, max: 300 }), fc.jsonValue(), (list, padTo, head) => {
        const value = { head, objects: list };
        const out = writeJsonStreamed(file, value, new Set(["objects"]), { padTo });
        const text = readFileSync(file, "utf8");
        expect(JSON.stringify(JSON.parse(text))).toBe(JSON.stringify(value));
        expect(text).toBe(jsonStreamedText(value, new Set(["objects"]), { padTo }));
        expect(out.size).toBe(Buffer.byteLength(text));
      }),
      { numRuns: 200 },
    );
    // segments cover element and padding, in whole multiples
    const out = writeJsonStreamed(file, { objects: items(50) }, new Set(["objects"]), { padTo: PAD, keyOf });
    for (const [, , length] of out.segments) expect(length % PAD).toBe(0);
  });

  it("writes only the changed element when the others keep their place, and the file is the one a fresh write gives", () => {
    const file = path.join(dir, "in-place.json");
    const first = writeJsonStreamed(file, { head: 1, objects: items(2000) }, new Set(["objects"]), { padTo: PAD, keyOf });
    const inode = statSync(file).ino;
    const next = items(2000);
    next[700] = { id: "k700-edited", text: next[700].text, v: 700.5 / 3 };
    const value = { head: 2, objects: next };
    const second = writeJsonStreamed(file, value, new Set(["objects"]), { padTo: PAD, keyOf, reuse: { file, segments: first.segments } });
    expect(second.inPlace).toBe(true);
    expect(second.reused).toBe(1999);
    expect(statSync(file).ino).toBe(inode);
    expect(readFileSync(file, "utf8")).toBe(jsonStreamedText(value, new Set(["objects"]), { padTo: PAD }));

    // an element that outgrows its padding moves the rest: the file is written afresh beside it
    next[10] = { id: "k10-longer", text: "x".repeat(500), v: 0 };
    const third = writeJsonStreamed(file, { head: 2, objects: next }, new Set(["objects"]), { padTo: PAD, keyOf, reuse: { file, segments: second.segments } });
    expect(third.inPlace).toBe(false);
    expect(third.reused).toBe(1999);
    expect(readFileSync(file, "utf8")).toBe(jsonStreamedText({ head: 2, objects: next }, new Set(["objects"]), { padTo: PAD }));
  });

  it("gives the bytes of a fresh write after any series of edits, in place or not", () => {
    const file = path.join(dir, "edits.json");
    const edit = fc.oneof(
      fc.record({ kind: fc.constant("change" as const), at: fc.nat(), text: fc.string({ maxLength: 40 }) }),
      fc.record({ kind: fc.constant("remove" as const), at: fc.nat() }),
      fc.record({ kind: fc.constant("add" as const), at: fc.nat(), text: fc.string({ maxLength: 40 }) }),
      fc.record({ kind: fc.constant("head" as const), text: fc.string({ maxLength: 6 }) }),
    );
    let serial = 0;
    let inPlace = 0;
    fc.assert(
      fc.property(fc.array(edit, { maxLength: 8 }), fc.integer({ min: 1, max: 128 }), (edits, padTo) => {
        let list: Array<{ id: string; text: string }> = Array.from({ length: 12 }, (_, i) => ({ id: `s${serial}-${i}`, text: `t${i}` }));
        let head = "h";
        let out = writeJsonStreamed(file, { head, objects: list }, new Set(["objects"]), { padTo, keyOf });
        for (const e of edits) {
          list = [...list];
          const at = list.length === 0 ? 0 : ("at" in e ? e.at % list.length : 0);
          if (e.kind === "change" && list.length > 0) list[at] = { id: `s${serial}-c${++serial}`, text: e.text };
          if (e.kind === "remove" && list.length > 0) list.splice(at, 1);
          if (e.kind === "add") list.splice(at, 0, { id: `s${serial}-a${++serial}`, text: e.text });
          if (e.kind === "head") head = e.text;
          const value = { head, objects: list };
          out = writeJsonStreamed(file, value, new Set(["objects"]), { padTo, keyOf, reuse: { file, segments: out.segments } });
          expect(readFileSync(file, "utf8")).toBe(jsonStreamedText(value, new Set(["objects"]), { padTo }));
          expect(out.size).toBe(statSync(file).size);
          if (out.inPlace) inPlace++;
        }
      }),
      { numRuns: 300 },
    );
    // both ways were taken
    expect(inPlace).toBeGreaterThan(50);
  });
});

describe("element texts prepared ahead", () => {
  const keyOf = (item: unknown) => (item as { id?: string }).id;

  it("are copied into place, in the value's order, to the bytes of a fresh padded write", () => {
    const list = Array.from({ length: 500 }, (_, i) => ({ id: `p${i}`, text: "ä σ ".repeat(i % 40), v: i / 7 }));
    const prepared = new PreparedElements(path.join(dir, "prepared.json"), 64);
    // in another order, with one element more than the value holds and one it lacks
    for (const item of [...list].reverse()) if (item.id !== "p7") prepared.add(item.id, JSON.stringify(item));
    prepared.add("extra", JSON.stringify({ id: "extra" }));
    const reuse = prepared.close();
    const file = path.join(dir, "from-prepared.json");
    const value = { head: "h", objects: list };
    const out = writeJsonStreamed(file, value, new Set(["objects"]), { padTo: 64, keyOf, reuse });
    expect(out.reused).toBe(499);
    expect(out.inPlace).toBe(false);
    expect(readFileSync(file, "utf8")).toBe(jsonStreamedText(value, new Set(["objects"]), { padTo: 64 }));
  });
});
