import { mkdtemp, mkdir, rm, writeFile } from "node:fs/promises";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import fc from "fast-check";
import type * as JsYaml from "js-yaml";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadRecords, loadRecordText } from "../../src/records/load.js";
import { isSlug } from "../../src/records/slug.js";
import type { LoadOutcome, ObjectRecord } from "../../src/records/types.js";

const yaml = createRequire(import.meta.url)("js-yaml") as typeof JsYaml;
const GOOD = path.resolve("test/fixtures/records/good");

const temps: string[] = [];
async function tempDir(): Promise<string> {
  const d = await mkdtemp(path.join(os.tmpdir(), "steelyard-records-"));
  temps.push(d);
  return d;
}
afterAll(async () => {
  for (const d of temps) await rm(d, { recursive: true, force: true });
});

async function writeTree(dir: string, files: Record<string, string | Uint8Array>, order?: readonly string[]): Promise<void> {
  for (const name of order ?? Object.keys(files)) {
    const full = path.join(dir, name);
    await mkdir(path.dirname(full), { recursive: true });
    await writeFile(full, files[name]);
  }
}

const VALID = [
  "name: Ferrow 90",
  "measurements:",
  "  - key: orbit",
  "    method: relative-orbit",
  '    reference: { cite: "Okafor 2020, J. Invented Astron. 13, 5" }',
  "    inputs:",
  "      period: 12.0 ± 0.1 yr",
  "      semimajor_axis: 5.2 ± 0.1 au",
  "",
].join("\n");

describe("the good records", () => {
  let outcome: LoadOutcome;
  let byId: Map<string, ObjectRecord>;
  beforeAll(async () => {
    outcome = await loadRecords(GOOD);
    byId = new Map(outcome.records.map((r) => [r.id, r]));
  });

  it("load with no problem at all", () => {
    expect(outcome.problems).toEqual([]);
    expect(outcome.filesWithErrors).toEqual([]);
  });

  it("list only *.yaml and *.yml files, sorted, skipping dotfiles and dot-folders", () => {
    expect(outcome.files).toEqual([
      "brannock-221.yml",
      "ferrow-7-ab.yaml",
      "nested/deeper/ollendar-4.yaml",
      "nested/kessock-15.yaml",
      "nested/vessary-9.yaml",
    ]);
  });

  it("come out sorted by id, with ids from the file name unless given", () => {
    expect(outcome.records.map((r) => r.id)).toEqual(["brannock-221", "ferrow-7-ab", "kessock-15", "ollendar-4", "vessary-9"]);
    expect(byId.get("ollendar-4")?.file).toBe("nested/deeper/ollendar-4.yaml");
  });

  it("keep names, aliases, notes and the reference as written", () => {
    const r = byId.get("ferrow-7-ab")!;
    expect(r.name).toBe("Ferrow 7 AB");
    expect(r.aliases).toEqual(["FRW 7", "Ferrow 7"]);
    expect(r.notes).toBe("Invented pair used to show a relative orbit with an angular semi-major axis turned into a length by the parallax.\n");
    const m = r.measurements[0];
    expect(m.reference).toEqual({
      cite: "Okafor & Lindqvist 2021, J. Invented Astron. 14, 233",
      doi: "10.99999/jia.2021.14.233",
      bibcode: "2021JIA....14..233O",
      url: "https://example.org/ferrow-7",
      locator: "Table 4",
    });
    expect(m.use).toBe(true);
    expect(m.comment).toBe("Masses from the orbit and the mass ratio of the same paper.");
    expect(m.location).toEqual({ line: 8, column: 5 });
  });

  it("put each input in the slot its unit's dimension selects, in the method's slot order", () => {
    const m = byId.get("ferrow-7-ab")!.measurements[0];
    expect(Object.keys(m.inputs)).toEqual(["period", "angular_semimajor_axis", "parallax", "mass_ratio", "eccentricity"]);
    const a = m.inputs.angular_semimajor_axis;
    expect(a.field).toBe("semimajor_axis");
    expect(a.quantity.value).toBe(0.912);
    expect(a.quantity.plus).toBe(0.004);
    expect(a.quantity.unit.id).toBe("arcsec");
    expect(a.location).toEqual({ line: 18, column: 23 });
    expect(m.inputs.period.location).toEqual({ line: 17, column: 15 });
    const p = m.published.primary_mass;
    expect([p.quantity.value, p.quantity.plus, p.quantity.minus, p.quantity.unit.id]).toEqual([1.8, 0.05, 0.04, "Msun"]);
    expect(p.location).toEqual({ line: 24, column: 21 });
  });

  it("accept limits among published values, mapping-form quantities and use: false", () => {
    const r = byId.get("brannock-221")!;
    expect(r.measurements.map((m) => [m.key, m.use])).toEqual([["rv-2019", true], ["rv-2024", false]]);
    expect(r.measurements[0].published.secondary_mass.quantity.kind).toBe("lower-limit");
    expect(r.measurements[0].published.secondary_mass.quantity.value).toBe(0.7);
    const k1 = r.measurements[1].inputs.k1.quantity;
    expect([k1.value, k1.plus, k1.minus, k1.unit.id]).toEqual([48.9, 0.6, 0.5, "km/s"]);
  });

  it("read a file with a byte-order mark and CRLF line ends, with the right lines", () => {
    const m = byId.get("ollendar-4")!.measurements[0];
    expect(Object.keys(m.inputs)).toEqual(["velocity", "angular_radius", "distance"]);
    expect(m.inputs.velocity.location).toEqual({ line: 8, column: 17 });
    expect(m.published.enclosed_mass.quantity.value).toBe(1.9e10);
  });
});

describe("loadRecordText", () => {
  it("collects every problem of a file, each at its own place", () => {
    const text = [
      "nmae: Ferrow 91", // 1
      "measurements:", // 2
      "  - key: Orbit A", // 3
      "    method: relative-orbit", // 4
      '    reference: { cite: "Okafor 2020", url: "ftp://example.org/x" }', // 5
      "    inputs:", // 6
      "      perod: 12 d", // 7
      "      semimajor_axis: 5.2 ± 0.1 parsecs", // 8
      "  - key: b", // 9
      "    method: single-lined", // 10
      '    reference: { cite: "Okafor 2021" }', // 11
      "    inputs: { period: 3 d, k1: 12 km }", // 12
      "",
    ].join("\n");
    const out = loadRecordText(text, "multi.yaml");
    expect(out.record).toBeUndefined();
    expect(out.problems.map((p) => [p.code, p.severity, p.line, p.column, p.path])).toEqual([
      ["missing-field", "error", 1, 1, "name"],
      ["unknown-field", "warning", 1, 1, "nmae"],
      ["bad-key", "error", 3, 10, "measurements[0].key"],
      ["bad-url", "error", 5, 44, "measurements[0].reference.url"],
      ["missing-input", "error", 7, 7, "measurements[0].inputs.period"],
      ["unknown-input", "error", 7, 7, "measurements[0].inputs.perod"],
      ["wrong-dimension", "error", 12, 32, "measurements[1].inputs.k1"],
    ]);
    expect(out.problems[1].message).toBe("unknown field 'nmae'; did you mean 'name'?");
    expect(out.problems.every((p) => p.file === "multi.yaml")).toBe(true);
  });

  it("reports bytes that are not UTF-8, and UTF-16 as such", () => {
    const utf16 = Buffer.from("\ufeffname: x\n", "utf16le");
    const out = loadRecordText(utf16, "wide.yaml");
    expect(out.problems.map((p) => [p.code, p.line, p.column])).toEqual([["not-utf8", 1, 1]]);
    expect(out.problems[0].hint).toContain("UTF-16");
  });

  it("reads UTF-8 bytes with a byte-order mark like the text without it", () => {
    const plain = loadRecordText(VALID, "a.yaml");
    const bom = loadRecordText(Uint8Array.from([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(VALID)]), "a.yaml");
    expect(bom).toEqual(plain);
    expect(plain.problems).toEqual([]);
    expect(plain.record?.measurements[0].inputs.period.location).toEqual({ line: 7, column: 15 });
  });

  it("refuses text over the size limit", () => {
    const out = loadRecordText(VALID, "a.yaml", { maxFileBytes: 100 });
    expect(out.problems.map((p) => p.code)).toEqual(["file-too-large"]);
    expect(out.problems[0].message).toContain("over the limit of 100 bytes");
  });

  it("refuses an alias bomb at once, without expanding it", () => {
    // 9 levels of 9 aliases: about 3.9 × 10⁸ strings if expanded
    let text = 'name: Ferrow 92\na0: &a0 ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]\n';
    for (let k = 1; k <= 9; k++) text += `a${k}: &a${k} [${Array(9).fill(`*a${k - 1}`).join(", ")}]\n`;
    text += "measurements: *a9\n";
    const started = performance.now();
    const out = loadRecordText(text, "bomb.yaml");
    const elapsed = performance.now() - started;
    expect(out.problems.map((p) => [p.code, p.line])).toEqual([["alias-not-allowed", 3]]);
    expect(out.problems[0].message).toContain("82 aliases");
    // a safety bound, not a speed claim: an expanding parser would not return for minutes
    expect(elapsed).toBeLessThan(1000);
  });

  it("turns a default id from an awkward file name into a clear problem", () => {
    const out = loadRecordText(VALID, "records/My Star.yaml");
    expect(out.problems.map((p) => [p.code, p.path, p.line])).toEqual([["bad-id", "id", 0]]);
    expect(out.problems[0].hint).toContain("id: my-star");
  });
});

describe("ids that could leave the output folder", () => {
  it("never pass the slug rule", () => {
    for (const bad of ["..", ".", "../x", "a/b", "a\\b", "/abs", "C:", "-first", "a b", "", "Ab", "a.b", "x".repeat(101)]) {
      expect(isSlug(bad)).toBe(false);
    }
    for (const fine of ["lrx-0412-ab", "a", "0", "a-b-c", "x".repeat(100)]) expect(isSlug(fine)).toBe(true);
  });
});

describe("loadRecords on a folder", () => {
  it("reports a missing folder as one problem", async () => {
    const out = await loadRecords(path.join(os.tmpdir(), "steelyard-no-such-folder-42"));
    expect(out.problems.map((p) => [p.code, p.file, p.line])).toEqual([["no-records-folder", "", 0]]);
    expect(out.records).toEqual([]);
    expect(out.files).toEqual([]);
  });

  it("reports a file given as the folder the same way", async () => {
    const out = await loadRecords(path.join(GOOD, "ferrow-7-ab.yaml"));
    expect(out.problems.map((p) => p.code)).toEqual(["no-records-folder"]);
  });

  it("never lets one bad file stop the others", async () => {
    const dir = await tempDir();
    await writeTree(dir, {
      "a.yaml": VALID.replace("Ferrow 90", "Ferrow 93"),
      "b.yaml": "x".repeat(300),
      "c.yaml": Uint8Array.from([0x6e, 0x3a, 0x20, 0xff]),
      "d.yml": VALID.replace("Ferrow 90", "Ferrow 94"),
      "e.yaml": "name: [unclosed\n",
    });
    const out = await loadRecords(dir, { maxFileBytes: 280 });
    expect(out.records.map((r) => r.id)).toEqual(["a", "d"]);
    expect(out.problems.map((p) => [p.file, p.code])).toEqual([
      ["b.yaml", "file-too-large"],
      ["c.yaml", "not-utf8"],
      ["e.yaml", "yaml-syntax"],
    ]);
    expect(out.filesWithErrors).toEqual(["b.yaml", "c.yaml", "e.yaml"]);
    expect(out.files).toEqual(["a.yaml", "b.yaml", "c.yaml", "d.yml", "e.yaml"]);
  });

  it("reports a repeated default id on the later file, naming both", async () => {
    const dir = await tempDir();
    await writeTree(dir, { "z/star.yaml": VALID, "a/star.yaml": VALID.replace("Ferrow 90", "Ferrow 95") });
    const out = await loadRecords(dir);
    expect(out.records.map((r) => [r.id, r.name, r.file])).toEqual([["star", "Ferrow 95", "a/star.yaml"]]);
    expect(out.problems.map((p) => [p.file, p.code, p.line, p.column])).toEqual([["z/star.yaml", "duplicate-id", 0, 0]]);
    expect(out.problems[0].message).toContain("a/star.yaml");
    expect(out.problems[0].hint).toContain("z/star.yaml");
  });

  it("counts a warning-only file as loaded, not as a file with errors", async () => {
    const dir = await tempDir();
    await writeTree(dir, { "w.yaml": VALID + "colour: red\n" });
    const out = await loadRecords(dir);
    expect(out.records).toHaveLength(1);
    expect(out.problems.map((p) => [p.code, p.severity, p.line])).toEqual([["unknown-field", "warning", 9]]);
    expect(out.filesWithErrors).toEqual([]);
  });

  it("gives the same outcome whatever order the files were written in", async () => {
    const files: Record<string, string> = {
      "m/one.yaml": VALID.replace("Ferrow 90", "Ferrow 96"),
      "two.yaml": VALID.replace("5.2 ± 0.1 au", "5.2 ± 0.1 lightyears"),
      "a/b/three.yml": VALID.replace("Ferrow 90", "Ferrow 97") + "colour: blue\n",
      "four.yaml": "",
    };
    const names = Object.keys(files);
    const first = await tempDir();
    const second = await tempDir();
    await writeTree(first, files, names);
    await writeTree(second, files, [...names].reverse());
    expect(await loadRecords(second)).toEqual(await loadRecords(first));
  });

  it("gives the same records whatever the key order inside a record", async () => {
    const reordered = [
      "measurements:",
      "  - inputs:",
      "      semimajor_axis: 5.2 ± 0.1 au",
      "      period: 12.0 ± 0.1 yr",
      '    reference: { cite: "Okafor 2020, J. Invented Astron. 13, 5" }',
      "    method: relative-orbit",
      "    key: orbit",
      "name: Ferrow 90",
      "",
    ].join("\n");
    const strip = (o: unknown): unknown =>
      JSON.parse(JSON.stringify(o, (k, v) => (k === "location" ? undefined : v)));
    const a = loadRecordText(VALID, "x.yaml");
    const b = loadRecordText(reordered, "x.yaml");
    expect(b.problems).toEqual([]);
    expect(strip(b.record)).toEqual(strip(a.record));
    expect(Object.keys(b.record!.measurements[0].inputs)).toEqual(["period", "semimajor_axis"]);
  });
});

describe("loadRecordText on arbitrary input", () => {
  const check = (text: string | Uint8Array) => {
    const out = loadRecordText(text, "any.yaml");
    expect(out.record !== undefined || out.problems.length > 0).toBe(true);
    if (out.record) expect(out.record.measurements.length).toBeGreaterThan(0);
    const lines = (typeof text === "string" ? text : Buffer.from(text).toString("latin1")).split(/\r\n|\r|\n/).length;
    for (const p of out.problems) {
      expect(p.file).toBe("any.yaml");
      expect(["error", "warning"]).toContain(p.severity);
      expect(p.line).toBeGreaterThanOrEqual(0);
      expect(p.line).toBeLessThanOrEqual(lines);
      expect(p.column).toBeGreaterThanOrEqual(0);
      expect(p.message.length).toBeGreaterThan(0);
    }
  };

  it("never throws on arbitrary strings", () => {
    fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 200 }), check), { numRuns: 500 });
  });

  it("never throws on arbitrary bytes", () => {
    fc.assert(fc.property(fc.uint8Array({ maxLength: 200 }), check), { numRuns: 300 });
  });

  it("never throws on arbitrary YAML-ish text built from YAML punctuation", () => {
    const piece = fc.constantFrom("name: ", "measurements:\n", "  - ", "key: ", "\n", "  ", "\t", "&a ", "*a", "!!str ", "[", "]", "{", "}", ": ", "---\n", "# c\n", "'", '"', "|\n", "? ", ".inf", "12 ± 1 yr", "relative-orbit", "inputs:\n", "period: ");
    fc.assert(fc.property(fc.array(piece, { maxLength: 40 }).map((a) => a.join("")), check), { numRuns: 500 });
  });

  const leaf = fc.oneof(
    fc.string({ maxLength: 20 }),
    fc.double(),
    fc.integer(),
    fc.boolean(),
    fc.constant(null),
    fc.constantFrom("12.0 ± 0.1 yr", "5.2 ± 0.1 au", "< 3 Msun", "0.41 ± 0.01 arcsec", "relative-orbit", "single-lined", "orbit", "Ferrow 98"),
  );
  const jsonish = fc.letrec((tie) => ({
    value: fc.oneof({ depthSize: "small", withCrossShrink: true }, leaf, fc.array(tie("value"), { maxLength: 4 }), tie("object")),
    object: fc.dictionary(
      fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom("name", "id", "aliases", "notes", "measurements", "key", "method", "reference", "cite", "inputs", "published", "use", "period", "semimajor_axis", "parallax", "__proto__", "constructor")),
      tie("value"),
      { maxKeys: 6 },
    ),
  }));

  it("never throws on arbitrary JSON-ish objects written as YAML", () => {
    fc.assert(
      fc.property(jsonish.value, (v) => {
        check(yaml.dump(v, { skipInvalid: true }));
      }),
      { numRuns: 500 },
    );
  });

  it("never throws on record-shaped objects with arbitrary parts", () => {
    const measurement = fc.record(
      {
        key: leaf,
        method: fc.oneof(leaf, fc.constantFrom("relative-orbit", "double-lined", "circular-velocity")),
        reference: fc.oneof(jsonish.value, fc.record({ cite: leaf, url: leaf, doi: leaf })),
        inputs: fc.oneof(jsonish.value, fc.dictionary(fc.constantFrom("period", "semimajor_axis", "parallax", "k1", "k2", "eccentricity", "inclination", "velocity", "radius"), leaf)),
        published: jsonish.value,
        use: leaf,
      },
      { requiredKeys: [] },
    );
    const record = fc.record({ name: leaf, id: leaf, aliases: jsonish.value, measurements: fc.oneof(fc.array(measurement, { maxLength: 3 }), jsonish.value) }, { requiredKeys: [] });
    fc.assert(fc.property(record, (r) => check(yaml.dump(r, { skipInvalid: true }))), { numRuns: 500 });
  });
});
