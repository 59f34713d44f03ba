import { katexReference } from "./helpers/katex-reference.js";
import { describe, expect, it } from "vitest";
import { katexCacheStats, katexTypesetCount, renderTex } from "../../src/site/katex.js";

const REFERENCE_OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" } as const;

describe("KaTeX adapter", () => {
  it("typesets HTML and MathML, keeping the TeX as the annotation", () => {
    const html = renderTex("M = \\frac{a^3}{P^2}", true);
    expect(html).toContain('class="katex-display"');
    expect(html).toContain('class="katex-html"');
    expect(html).toContain('<annotation encoding="application/x-tex">M = \\frac{a^3}{P^2}</annotation>');
    // the same as KaTeX itself gives with the documented options
    expect(html).toBe(katexReference("M = \\frac{a^3}{P^2}", { ...REFERENCE_OPTIONS, displayMode: true }));
  });

  it("typesets a repeated equation once", () => {
    const tex = "\\mathcal{G}M_{\\odot} = 1.3271244\\times10^{20}\\,\\mathrm{m^{3}\\,s^{-2}}";
    const first = renderTex(tex, true);
    const count = katexTypesetCount();
    expect(renderTex(tex, true)).toBe(first);
    expect(katexTypesetCount()).toBe(count);
    // inline and display forms are different renderings, and different shapes
    const inline = renderTex(tex, false);
    expect(inline).not.toBe(first);
    expect(inline).toBe(katexReference(tex, { ...REFERENCE_OPTIONS, displayMode: false }));
    expect(katexTypesetCount()).toBeGreaterThan(count);
  });

  it("typesets a new shape with numbers three times, then splices every equation of that shape without KaTeX", () => {
    // a shape: each number a mantissa times a power of ten, with positive exponents
    const shape = (a: string, ae: string, p: string, pe: string) =>
      `\\mathcal{G}M = \\frac{4\\pi^{2}\\,\\left(${a}\\times10^{${ae}}\\,\\mathrm{m}\\right)^{3}}{\\left(${p}\\times10^{${pe}}\\,\\mathrm{s}\\right)^{2}}`;
    const start = katexTypesetCount();
    const first = renderTex(shape("1.496", "11", "3.156", "7"), true);
    expect(first).toBe(katexReference(shape("1.496", "11", "3.156", "7"), { ...REFERENCE_OPTIONS, displayMode: true }));
    // the equation itself, its skeleton and the same shape with one-digit numbers
    expect(katexTypesetCount() - start).toBe(3);
    const others: Array<[string, string, string, string]> = [
      ["2.5", "4", "4.1", "12"],
      ["7", "0", "1", "1"],
      ["9.999999999999999", "307", "1.000", "300"],
      ["123.4", "55", "0.0005678", "9"],
    ];
    const middle = katexTypesetCount();
    const spliced = others.map((n) => renderTex(shape(...n), true));
    expect(katexTypesetCount()).toBe(middle);
    others.forEach((n, i) => expect(spliced[i], n.join(", ")).toBe(katexReference(shape(...n), { ...REFERENCE_OPTIONS, displayMode: true })));
    // a minus in an exponent is another shape: typeset anew
    renderTex(shape("2.5", "-4", "4.1", "12"), true);
    expect(katexTypesetCount() - middle).toBe(3);
  });

  it("typesets TeX without numbers once, keeping it as a shape of its own", () => {
    const before = katexCacheStats();
    renderTex("\\mathcal{G}M_{\\odot}", false);
    const after = katexCacheStats();
    expect(after.typesets - before.typesets).toBe(1);
    expect(after.splicedShapes - before.splicedShapes).toBe(1);
    renderTex("\\mathcal{G}M_{\\odot}", false);
    expect(katexCacheStats().typesets).toBe(after.typesets);
  });

  it("typesets shapes it cannot splice directly each time, remembering whole strings", () => {
    const before = katexCacheStats();
    const a = renderTex("x = \\mathit{12.5}", false);
    const mid = katexCacheStats();
    expect(mid.directShapes.length - before.directShapes.length).toBe(1);
    expect(mid.memoEntries - before.memoEntries).toBe(1);
    // another number of the same shape: typeset directly once, then remembered
    const b = renderTex("x = \\mathit{3.75}", false);
    expect(b).toBe(katexReference("x = \\mathit{3.75}", REFERENCE_OPTIONS));
    const after = katexCacheStats();
    expect(after.typesets - mid.typesets).toBe(1);
    expect(renderTex("x = \\mathit{12.5}", false)).toBe(a);
    expect(katexCacheStats().typesets).toBe(after.typesets);
  });

  it("fails loudly on TeX it cannot typeset instead of printing red text", () => {
    expect(() => renderTex("\\frac{1}", false)).toThrow(/KaTeX could not typeset "\\\\frac\{1\}"/);
    expect(() => renderTex("\\undefinedcommand", false)).toThrow(/Undefined control sequence/);
    // strict: non-ASCII text in math mode is refused
    expect(() => renderTex("é", false)).toThrow(/strict/);
  });

  it("still fails on bad TeX whose shape it has seen with good numbers", () => {
    // a colour of six hex digits is fine, of five it is not: the digits decide
    expect(renderTex("\\color{#123456}{x}", false)).toBe(katexReference("\\color{#123456}{x}", REFERENCE_OPTIONS));
    expect(() => renderTex("\\color{#12345}{x}", false)).toThrow(/KaTeX could not typeset/);
    // a one-digit numerator after \frac is fine, a missing one is not
    renderTex("\\frac{1}{2}", false);
    expect(() => renderTex("\\frac{1}", false)).toThrow(/KaTeX could not typeset/);
  });

  it("refuses commands that need trust (links, HTML attributes)", () => {
    expect(() => renderTex("\\href{javascript:alert(1)}{x}", false)).toThrow(/trust \\href/);
    expect(() => renderTex("\\url{https://example.org}", false)).toThrow(/trust \\url/);
    // with numbers in it, and a second time, when its shape would be known
    expect(() => renderTex("\\href{https://example.org/1}{2}", false)).toThrow(/trust \\href/);
    expect(() => renderTex("\\href{https://example.org/3}{4}", false)).toThrow(/trust \\href/);
    // the HTML extension is refused earlier, by strict mode
    expect(() => renderTex("\\htmlClass{x}{y}", false)).toThrow(/htmlClass/);
  });
});
