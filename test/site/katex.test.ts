import katex from "katex";
import { describe, expect, it } from "vitest";
import { katexTypesetCount, renderTex } from "../../src/site/katex.js";

describe("KaTeX adapter", () => {
  it("typesets HTML and MathML, keeping the TeX as the annotation", () => {
    const html = renderTex("M = \\frac{a^3}{P^2}", true);
    expect(html).toContain('class="katex-display"');
    expect(html).toContain('class="katex-html"');
    expect(html).toContain('<annotation encoding="application/x-tex">M = \\frac{a^3}{P^2}</annotation>');
    // the same as KaTeX itself gives with the documented options
    expect(html).toBe(
      katex.renderToString("M = \\frac{a^3}{P^2}", { displayMode: true, throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" }),
    );
  });

  it("typesets a repeated equation once", () => {
    const tex = "\\mathcal{G}M_{\\odot} = 1.3271244\\times10^{20}\\,\\mathrm{m^{3}\\,s^{-2}}";
    const first = renderTex(tex, true);
    const count = katexTypesetCount();
    expect(renderTex(tex, true)).toBe(first);
    expect(katexTypesetCount()).toBe(count);
    // inline and display forms are different renderings
    expect(renderTex(tex, false)).not.toBe(first);
    expect(katexTypesetCount()).toBe(count + 1);
  });

  it("fails loudly on TeX it cannot typeset instead of printing red text", () => {
    expect(() => renderTex("\\frac{1}", false)).toThrow(/KaTeX could not typeset "\\\\frac\{1\}"/);
    expect(() => renderTex("\\undefinedcommand", false)).toThrow(/Undefined control sequence/);
    // strict: non-ASCII text in math mode is refused
    expect(() => renderTex("é", false)).toThrow(/strict/);
  });

  it("refuses commands that need trust (links, HTML attributes)", () => {
    expect(() => renderTex("\\href{javascript:alert(1)}{x}", false)).toThrow(/trust \\href/);
    expect(() => renderTex("\\url{https://example.org}", false)).toThrow(/trust \\url/);
    // the HTML extension is refused earlier, by strict mode
    expect(() => renderTex("\\htmlClass{x}{y}", false)).toThrow(/htmlClass/);
  });
});
