import { describe, expect, it } from "vitest";
import { parseYamlDocument } from "../../src/records/yaml-document.js";

function positions(text: string) {
  const out = parseYamlDocument(text);
  if (!out.ok) throw new Error(`expected a document, got ${JSON.stringify(out.problems)}`);
  return out.document;
}

function failure(text: string) {
  const out = parseYamlDocument(text);
  if (out.ok) throw new Error("expected problems");
  return out.problems;
}

describe("parseYamlDocument positions", () => {
  const text = [
    "name: \"Ferrow 7 AB\"", // 1
    "measurements:", // 2
    "  - key: a", // 3
    "    inputs: {period: 12 d, e: 0.1}", // 4
    "    notes: |", // 5
    "      two", // 6
    "      lines", // 7
    "    empty:", // 8
    "  -", // 9
    "    key: b", // 10
  ].join("\n");
  const doc = positions(text);

  it("locates keys and values", () => {
    expect(doc.positions.get("name")).toEqual({ key: { line: 1, column: 1 }, value: { line: 1, column: 7 } });
    expect(doc.positions.get("measurements")?.value).toEqual({ line: 3, column: 3 });
    expect(doc.positions.get("measurements[0]")?.value).toEqual({ line: 3, column: 5 });
    expect(doc.positions.get("measurements[0].key")).toEqual({ key: { line: 3, column: 5 }, value: { line: 3, column: 10 } });
    expect(doc.positions.get("measurements[0].inputs")?.value).toEqual({ line: 4, column: 13 });
    expect(doc.positions.get("measurements[0].inputs.period")).toEqual({ key: { line: 4, column: 14 }, value: { line: 4, column: 22 } });
    expect(doc.positions.get("measurements[0].inputs.e")?.value).toEqual({ line: 4, column: 31 });
    expect(doc.positions.get("measurements[1].key")?.value).toEqual({ line: 10, column: 10 });
  });
  it("points a block scalar at its indicator and an empty value at its key", () => {
    expect(doc.positions.get("measurements[0].notes")?.value).toEqual({ line: 5, column: 12 });
    expect(doc.positions.get("measurements[0].empty")?.value).toEqual({ line: 8, column: 5 });
  });
  it("builds the value with the core schema", () => {
    expect(doc.value).toEqual({
      name: "Ferrow 7 AB",
      measurements: [{ key: "a", inputs: { period: "12 d", e: 0.1 }, notes: "two\nlines\n", empty: null }, { key: "b" }],
    });
  });
  it("keeps dates and yes/no as text (YAML 1.2 core schema)", () => {
    expect(positions("a: 2021-05-01\nb: yes\nc: true\nd: 0x10\n").value).toEqual({ a: "2021-05-01", b: "yes", c: true, d: 16 });
  });
});

describe("parseYamlDocument failures", () => {
  it("reports every duplicate key", () => {
    const p = failure("a: 1\nb: 2\na: 3\nc:\n  x: 1\n  x: 2\n");
    expect(p.map((q) => [q.code, q.path, q.location.line, q.location.column])).toEqual([
      ["duplicate-key", "a", 3, 1],
      ["duplicate-key", "c.x", 6, 3],
    ]);
  });
  it("refuses aliases with one problem", () => {
    const p = failure("a: &x [1, 2]\nb: *x\nc: *x\n");
    expect(p).toHaveLength(1);
    expect(p[0]).toMatchObject({ code: "alias-not-allowed", path: "b", location: { line: 2, column: 4 } });
    expect(p[0].message).toContain("2 aliases");
  });
  it("refuses custom tags", () => {
    expect(failure("a: !thing 1\n")[0]).toMatchObject({ code: "unknown-tag", location: { line: 1, column: 4 } });
  });
  it("reports complex keys", () => {
    expect(failure("? [a, b]\n: 1\n")[0]).toMatchObject({ code: "complex-key", location: { line: 1, column: 3 } });
  });
  it("reports nesting deeper than the limit", () => {
    expect(failure("a: " + "[".repeat(60) + "]".repeat(60) + "\n")[0].code).toBe("too-deep");
  });
  it("reports empty and multi-document files", () => {
    expect(failure("")[0].code).toBe("empty-file");
    expect(failure("# only a comment\n")[0].code).toBe("empty-file");
    expect(failure("a: 1\n---\nb: 2\n")[0]).toMatchObject({ code: "multiple-documents", location: { line: 2, column: 1 } });
    expect(failure("---\na: 1\n---\nb: 2\n")[0]).toMatchObject({ code: "multiple-documents", location: { line: 3, column: 1 } });
  });
});
