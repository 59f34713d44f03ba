// RFC 4180 (Shafranovich 2005), "Common Format and MIME Type for CSV Files", section 2:
// rule 2 (CRLF after every record, the last included here), rule 3 (header line),
// rule 6 (fields holding CRLF, double quotes or commas are enclosed in double quotes),
// rule 7 (a double quote inside a quoted field is doubled).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { csvField, toCsv } from "../../src/site/csv.js";
import { parseCsv } from "./helpers/csv-parse.js";

describe("CSV writer", () => {
  it("quotes exactly the fields that hold a comma, a double quote, CR or LF", () => {
    expect(csvField("plain text")).toBe("plain text");
    expect(csvField("a,b")).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField("two\r\nlines")).toBe('"two\r\nlines"');
    expect(csvField("lf\nonly")).toBe('"lf\nonly"');
    expect(csvField("  spaces kept  ")).toBe("  spaces kept  ");
  });

  it("writes numbers in their shortest round-trip form and leaves missing or infinite ones empty", () => {
    expect(csvField(0.1 + 0.2)).toBe("0.30000000000000004");
    expect(Number(csvField(2.1319511743175184e30))).toBe(2.1319511743175184e30);
    expect(csvField(null)).toBe("");
    expect(csvField(undefined)).toBe("");
    expect(csvField(Infinity)).toBe("");
    expect(csvField(NaN)).toBe("");
    expect(csvField(true)).toBe("true");
  });

  it("ends every line, the last one too, with CRLF after a header line", () => {
    expect(toCsv(["a", "b"], [{ a: 1, b: "x,y" }])).toBe('a,b\r\n1,"x,y"\r\n');
  });

  it("reads back, field for field, whatever text it wrote", () => {
    const text = fc.string({ unit: fc.constantFrom("a", "Z", " ", ",", '"', "\r", "\n", "é", "<", "&") });
    fc.assert(
      fc.property(fc.array(fc.tuple(text, text, text), { maxLength: 8 }), (rows) => {
        const objects = rows.map(([x, y, z]) => ({ x, y, z }));
        const parsed = parseCsv(toCsv(["x", "y", "z"], objects));
        expect(parsed).toEqual([["x", "y", "z"], ...rows]);
      }),
    );
  });

  it("has a strict reader that refuses what RFC 4180 does not allow", () => {
    expect(() => parseCsv('a"b\r\n')).toThrow(/bare/);
    expect(() => parseCsv('"a"b\r\n')).toThrow(/after a closing quote/);
    expect(() => parseCsv("a,b")).toThrow(/CRLF/);
    expect(() => parseCsv("a\nb\r\n")).toThrow(/bare/);
    expect(() => parseCsv('"open\r\n')).toThrow(/unterminated/);
  });
});
