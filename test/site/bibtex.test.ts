import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { bibtexEntry, bibtexKey, bibtexText } from "../../src/site/bibtex.js";

/** Depth of braces never below zero and back to zero at the end, as BibTeX's reader requires. */
function balanced(text: string): boolean {
  let depth = 0;
  for (const c of text) {
    if (c === "{") depth++;
    if (c === "}" && --depth < 0) return false;
  }
  return depth === 0;
}

describe("BibTeX text", () => {
  it("escapes LaTeX's special characters", () => {
    expect(bibtexText("Smith & Jones {2021} 50% $x$ #3 a_b ~ ^ \\")).toBe(
      "Smith \\& Jones \\textbraceleft{}2021\\textbraceright{} 50\\% \\$x\\$ \\#3 a\\_b \\textasciitilde{} \\textasciicircum{} \\textbackslash{}",
    );
    expect(bibtexText("line\nbreak\t tab")).toBe("line break tab");
  });

  it("keeps braces balanced and leaves no special character bare, whatever the record says", () => {
    fc.assert(
      fc.property(fc.string({ unit: fc.constantFrom("{", "}", "\\", "&", "%", "$", "#", "_", "~", "^", "a", " ") }), (s) => {
        const out = bibtexText(s);
        expect(balanced(out)).toBe(true);
        // every &, %, $, #, _ is preceded by a backslash
        expect(/(^|[^\\])[&%$#_]/.test(out)).toBe(false);
      }),
    );
  });

  it("derives keys from the object id and measurement key", () => {
    expect(bibtexKey("orvell-5-ab", "orbit-2020")).toBe("orvell-5-ab:orbit-2020");
    expect(bibtexKey("odd id", "k{1}")).toBe("odd-id:k-1-");
  });
});

describe("BibTeX entries", () => {
  const base = { objectId: "orvell-5-ab", objectName: "Orvell 5 AB", measurementKey: "orbit-2020", method: "relative-orbit" };

  it("writes a @misc entry with the citation, locator and bibcode in the note", () => {
    const e = bibtexEntry({ ...base, reference: { cite: "Maddox & Teague 2020", locator: "Table 3", bibcode: "2020JIA.....5...88M", doi: "doi:10.5555/jia.5.88", url: "https://example.org/x?a=1&b=2" } });
    expect(e).toBe(
      "@misc{orvell-5-ab:orbit-2020,\n" +
        "  title = {Orvell 5 AB: relative-orbit measurement orbit-2020},\n" +
        "  note = {Maddox \\& Teague 2020; Table 3; bibcode 2020JIA.....5...88M},\n" +
        "  doi = {10.5555/jia.5.88},\n" +
        "  url = {https://example.org/x?a=1&b=2},\n" +
        "  keywords = {orvell-5-ab, relative-orbit}\n" +
        "}\n",
    );
    expect(balanced(e)).toBe(true);
  });

  it("leaves out doi and url fields that are not a DOI, not http(s), or would unbalance the entry", () => {
    const e = bibtexEntry({ ...base, reference: { cite: "X", doi: "10.5555/a{b", url: "javascript:alert(1)" } });
    expect(e).not.toMatch(/doi =|url =/);
    expect(balanced(e)).toBe(true);
    const f = bibtexEntry({ ...base, reference: { cite: "X", doi: "not-a-doi", url: "https://example.org/{x}" } });
    expect(f).not.toMatch(/doi =/);
    // the URL parser percent-encodes braces in a path, so the address stays
    expect(f).toContain("url = {https://example.org/%7Bx%7D}");
  });
});
