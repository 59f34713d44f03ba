import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { loadRecords } from "../../src/records/load.js";
import type { LoadOutcome } from "../../src/records/types.js";

/**
 * One file per fault in test/fixtures/records/broken/. For each, the one
 * problem it must give: code, severity, line, column (1-based; 0 for the whole
 * file), field path and a piece of the message; and whether the object still
 * loads (warnings, or a fault confined to one of several measurements).
 */
interface Expected {
  readonly file: string;
  readonly code: string;
  readonly severity?: "error" | "warning";
  readonly line: number;
  readonly column: number;
  readonly path: string;
  readonly message: string;
  readonly keepsRecord?: boolean;
}

const M = "measurements[0]";

const TABLE: readonly Expected[] = [
  // the file itself
  { file: "empty.yaml", code: "empty-file", line: 0, column: 0, path: "", message: "holds no record" },
  { file: "comments-only.yaml", code: "empty-file", line: 0, column: 0, path: "", message: "only comments" },
  { file: "not-utf8.yaml", code: "not-utf8", line: 1, column: 20, path: "", message: "byte 0xe9 at offset 19" },
  { file: "tab-indent.yaml", code: "tab-indent", line: 7, column: 1, path: "", message: "tab character" },
  { file: "syntax-error.yaml", code: "yaml-syntax", line: 6, column: 5, path: "", message: "YAML syntax error" },
  { file: "duplicate-key.yaml", code: "duplicate-key", line: 9, column: 7, path: `${M}.inputs.period`, message: "first on line 7" },
  { file: "multiple-documents.yaml", code: "multiple-documents", line: 9, column: 1, path: "", message: "2 YAML documents" },
  { file: "billion-laughs.yaml", code: "alias-not-allowed", line: 3, column: 8, path: "b[0]", message: "alias '*a' is not allowed" },
  { file: "custom-tag.yaml", code: "unknown-tag", line: 7, column: 15, path: `${M}.inputs.period`, message: "without tags" },
  { file: "complex-key.yaml", code: "complex-key", line: 9, column: 9, path: `${M}.inputs`, message: "must be a plain word" },
  { file: "not-a-mapping.yaml", code: "not-a-mapping", line: 1, column: 1, path: "", message: "found a list" },

  // the object
  { file: "missing-name.yaml", code: "missing-field", line: 1, column: 1, path: "name", message: "missing required field 'name'" },
  { file: "name-not-text.yaml", code: "wrong-type", line: 1, column: 7, path: "name", message: "found the number 4417" },
  { file: "empty-name.yaml", code: "empty-text", line: 1, column: 7, path: "name", message: "'name' is empty" },
  { file: "aliases-not-list.yaml", code: "wrong-type", line: 2, column: 10, path: "aliases", message: "must be a list of texts" },
  { file: "notes-not-text.yaml", code: "wrong-type", line: 3, column: 3, path: "notes", message: "'notes' must be text" },
  { file: "unknown-field.yaml", code: "unknown-field", severity: "warning", line: 2, column: 1, path: "alias", message: "unknown field 'alias'; did you mean 'aliases'?", keepsRecord: true },
  { file: "bad-id.yaml", code: "bad-id", line: 2, column: 5, path: "id", message: "'Ferrow 79' may hold only" },
  { file: "id-dot-dot.yaml", code: "bad-id", line: 2, column: 5, path: "id", message: "'..' may hold only" },
  { file: "id-slash.yaml", code: "bad-id", line: 2, column: 5, path: "id", message: "'../../outside' may hold only" },
  { file: "id-backslash.yaml", code: "bad-id", line: 2, column: 5, path: "id", message: "'a\\b' may hold only" },
  { file: "Bad File Name.yaml", code: "bad-id", line: 0, column: 0, path: "id", message: "file name 'Bad File Name' cannot serve" },
  { file: "duplicate-id-second.yaml", code: "duplicate-id", line: 2, column: 5, path: "id", message: "already used by duplicate-id-first.yaml" },
  { file: "missing-measurements.yaml", code: "missing-field", line: 1, column: 1, path: "measurements", message: "'measurements'" },
  { file: "measurements-not-list.yaml", code: "wrong-type", line: 3, column: 3, path: "measurements", message: "must be a list, found a mapping" },
  { file: "no-measurements.yaml", code: "no-measurements", line: 2, column: 15, path: "measurements", message: "is empty" },

  // a measurement
  { file: "measurement-not-mapping.yaml", code: "wrong-type", line: 3, column: 5, path: M, message: "must be a mapping" },
  { file: "missing-key.yaml", code: "missing-field", line: 3, column: 5, path: `${M}.key`, message: "'key'" },
  { file: "bad-key.yaml", code: "bad-key", line: 3, column: 10, path: `${M}.key`, message: "'Orbit 2020' may hold only" },
  { file: "key-not-text.yaml", code: "wrong-type", line: 3, column: 10, path: `${M}.key`, message: "found the number 2020" },
  { file: "duplicate-measurement-key.yaml", code: "duplicate-measurement-key", line: 9, column: 10, path: "measurements[1].key", message: "already used by measurements[0]", keepsRecord: true },
  { file: "missing-method.yaml", code: "missing-field", line: 3, column: 5, path: `${M}.method`, message: "'method'" },
  { file: "unknown-method.yaml", code: "unknown-method", line: 4, column: 13, path: `${M}.method`, message: "unknown method 'relative-orbt'; did you mean 'relative-orbit'?" },
  { file: "use-not-boolean.yaml", code: "wrong-type", line: 9, column: 10, path: `${M}.use`, message: "must be true or false" },
  { file: "one-bad-measurement.yaml", code: "unknown-unit", line: 14, column: 23, path: "measurements[1].inputs.semimajor_axis", message: "unknown unit \"auu\"", keepsRecord: true },

  // its reference
  { file: "missing-reference.yaml", code: "missing-field", line: 3, column: 5, path: `${M}.reference`, message: "'reference'" },
  { file: "reference-not-mapping.yaml", code: "wrong-type", line: 5, column: 16, path: `${M}.reference`, message: "must be a mapping, found text" },
  { file: "missing-cite.yaml", code: "missing-field", line: 5, column: 16, path: `${M}.reference.cite`, message: "'cite'" },
  { file: "bad-doi.yaml", code: "bad-doi", line: 7, column: 12, path: `${M}.reference.doi`, message: "not a DOI" },
  { file: "bad-url.yaml", code: "bad-url", line: 7, column: 12, path: `${M}.reference.url`, message: "'javascript:' is not allowed" },
  { file: "bibcode-length.yaml", code: "bibcode-length", severity: "warning", line: 7, column: 16, path: `${M}.reference.bibcode`, message: "has 16 characters", keepsRecord: true },

  // its inputs
  { file: "missing-inputs.yaml", code: "missing-field", line: 3, column: 5, path: `${M}.inputs`, message: "'inputs'" },
  { file: "inputs-not-mapping.yaml", code: "wrong-type", line: 7, column: 7, path: `${M}.inputs`, message: "found a list" },
  { file: "unknown-input.yaml", code: "unknown-input", line: 9, column: 7, path: `${M}.inputs.eccentricty`, message: "did you mean 'eccentricity'?" },
  { file: "missing-input.yaml", code: "missing-input", line: 7, column: 7, path: `${M}.inputs.period`, message: "needs input 'period'" },
  { file: "unknown-unit.yaml", code: "unknown-unit", line: 7, column: 15, path: `${M}.inputs.period`, message: "unknown unit \"yaers\"" },
  { file: "wrong-dimension.yaml", code: "wrong-dimension", line: 7, column: 15, path: `${M}.inputs.period`, message: "needs a time unit" },
  { file: "bad-quantity.yaml", code: "bad-quantity", line: 7, column: 15, path: `${M}.inputs.period`, message: "does not start with a number" },
  { file: "limit-as-input.yaml", code: "limit-not-allowed", line: 8, column: 23, path: `${M}.inputs.semimajor_axis`, message: "is a limit" },
  { file: "non-finite.yaml", code: "non-finite-number", line: 8, column: 23, path: `${M}.inputs.semimajor_axis`, message: "not a finite number" },
  { file: "negative-uncertainty.yaml", code: "negative-uncertainty", line: 7, column: 37, path: `${M}.inputs.period.sigma`, message: "sigma is negative" },
  { file: "uncertainty-exceeds-value.yaml", code: "uncertainty-exceeds-value", severity: "warning", line: 9, column: 17, path: `${M}.inputs.parallax`, message: "larger than its value", keepsRecord: true },
  { file: "negative-period.yaml", code: "out-of-range", line: 7, column: 15, path: `${M}.inputs.period`, message: "greater than zero" },
  { file: "eccentricity-one.yaml", code: "eccentricity-out-of-range", line: 9, column: 21, path: `${M}.inputs.eccentricity`, message: "0 ≤ e < 1" },
  { file: "angular-without-parallax.yaml", code: "needs-parallax-or-distance", line: 8, column: 23, path: `${M}.inputs.semimajor_axis`, message: "needs a parallax or a distance" },
  { file: "parallax-and-distance.yaml", code: "ambiguous-input", line: 10, column: 17, path: `${M}.inputs.distance`, message: "Both a parallax and a distance" },

  // its published values
  { file: "unknown-result.yaml", code: "unknown-result", line: 10, column: 7, path: `${M}.published.total_mas`, message: "did you mean 'total_mass'?" },
  { file: "published-wrong-dimension.yaml", code: "wrong-dimension", line: 10, column: 19, path: `${M}.published.total_mass`, message: "needs a mass unit" },
];

/** Files that must load cleanly although they sit among the broken ones. */
const CLEAN = ["duplicate-id-first.yaml"];

const BROKEN = path.resolve("test/fixtures/records/broken");
let outcome: LoadOutcome;

beforeAll(async () => {
  outcome = await loadRecords(BROKEN);
});

describe("broken record corpus", () => {
  it("covers at least 30 faults, each in a file of its own", () => {
    expect(TABLE.length).toBeGreaterThanOrEqual(30);
    expect(new Set(TABLE.map((t) => t.file)).size).toBe(TABLE.length);
  });

  it("has a table entry for every file in the folder, and a file for every entry", () => {
    const onDisk = readdirSync(BROKEN).filter((f) => /\.ya?ml$/.test(f)).sort();
    expect(onDisk).toEqual([...TABLE.map((t) => t.file), ...CLEAN].sort());
    expect(outcome.files).toEqual(onDisk.slice().sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
  });

  it("keeps the not-UTF-8 fixture's Latin-1 byte (an editor may have re-encoded it)", () => {
    const bytes = readFileSync(path.join(BROKEN, "not-utf8.yaml"));
    expect(bytes[19]).toBe(0xe9);
  });

  for (const t of TABLE) {
    it(`${t.file} → ${t.code} at ${t.line}:${t.column}`, () => {
      const mine = outcome.problems.filter((p) => p.file === t.file);
      expect(mine).toHaveLength(1);
      const p = mine[0];
      expect({ code: p.code, severity: p.severity, line: p.line, column: p.column, path: p.path }).toEqual({
        code: t.code,
        severity: t.severity ?? "error",
        line: t.line,
        column: t.column,
        path: t.path,
      });
      expect(p.message).toContain(t.message);
      expect(p.hint ?? "").not.toBe("");
      expect(outcome.records.some((r) => r.file === t.file)).toBe(t.keepsRecord === true);
      expect(outcome.filesWithErrors.includes(t.file)).toBe((t.severity ?? "error") === "error");
    });
  }

  it("keeps the first of two objects with the same id", () => {
    const r = outcome.records.filter((x) => x.id === "ferrow-84");
    expect(r).toHaveLength(1);
    expect(r[0].file).toBe("duplicate-id-first.yaml");
    expect(r[0].name).toBe("Ferrow 84");
    expect(outcome.problems.filter((p) => p.file === "duplicate-id-first.yaml")).toEqual([]);
  });

  it("keeps the valid measurement beside the broken one", () => {
    const r = outcome.records.find((x) => x.file === "one-bad-measurement.yaml");
    expect(r?.measurements.map((m) => m.key)).toEqual(["orbit"]);
    const d = outcome.records.find((x) => x.file === "duplicate-measurement-key.yaml");
    expect(d?.measurements.map((m) => m.reference.cite)).toEqual(["Okafor 2020, J. Invented Astron. 13, 5"]);
  });

  it("lists problems sorted by file, line, column and code", () => {
    const keys = outcome.problems.map((p) => [p.file, p.line, p.column, p.code] as const);
    const sorted = [...keys].sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : a[1] - b[1] || a[2] - b[2] || (a[3] < b[3] ? -1 : a[3] > b[3] ? 1 : 0)));
    expect(keys).toEqual(sorted);
  });
});
