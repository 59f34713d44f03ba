import katex from "katex";
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { compactKatex, katexClassMap, originalClassName, siteKatexStylesheet, UNSTYLED_CLASSES } from "../../src/site/katex-compact.js";
import { DECLARATIONS } from "../../src/site/katex-classes.js";
import { templateOf, texSkeleton } from "../../src/site/tex-skeleton.js";
import { classesIn } from "./helpers/css-classes.js";
import { sampleTex } from "./helpers/katex-samples.js";
import { startTags } from "./helpers/html-scan.js";

const ROOT = path.resolve(__dirname, "../..");
const OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" } as const;
const STYLE_SHEETS = [path.join(ROOT, "node_modules/katex/dist/katex.min.css"), path.join(ROOT, "content/assets/site.css")];

/** The tags (start and end) and the text of an HTML string, in order, as a flat list. */
function tokens(html: string): string[] {
  return html.match(/<[^>]*>|[^<]+/g) ?? [];
}

/**
 * A tag's name, classes (as a sorted list) and style declarations (property →
 * number and unit as parsed by CSS); a style class counts as the declaration
 * it stands for.
 */
function tagParts(tag: string): { name: string; classes: string[]; style: Record<string, string> } {
  const start = startTags(tag)[0];
  // an end tag has no attributes and is compared whole
  const name = start?.name ?? tag;
  // short names back to KaTeX's (KaTeX's own names are lower case, short names are not)
  const originals = (start?.attributes.get("class") ?? "")
    .split(" ")
    .filter((c) => c !== "")
    .map((c) => originalClassName(c) ?? c);
  // a declaration class counts as its declaration
  const classes = originals.filter((c) => !c.includes(":")).sort();
  const declarations = [...(start?.attributes.get("style") ?? "").split(";"), ...originals.filter((c) => c.includes(":"))];
  const style: Record<string, string> = {};
  for (const decl of declarations) {
    if (decl === "") continue;
    const [prop, value] = decl.split(":");
    style[prop] = value.replace(/-?(?:\d+\.?\d*|\.\d+)/g, (n) => String(Number(n)));
  }
  return { name, classes, style };
}

describe("compacting KaTeX's output", () => {
  it("drops only class names that neither katex.min.css nor site.css selects", () => {
    const styled = new Set<string>();
    for (const file of STYLE_SHEETS) for (const c of classesIn(readFileSync(file, "utf8"))) styled.add(c);
    // the parser finds KaTeX's real rules (a control: an empty set would pass anything)
    for (const c of ["katex", "katex-html", "mspace", "mfrac", "vlist", "mathnormal", "katex-sizing"]) expect(styled.has(c), c).toBe(true);
    expect([...UNSTYLED_CLASSES].filter((c) => styled.has(c))).toEqual([]);
    // no rule selects on the class attribute as a string, which would see the names go
    for (const file of STYLE_SHEETS) expect(readFileSync(file, "utf8")).not.toMatch(/\[class/);
  });

  it("gives each repeated inline declaration a class whose one rule in the site's KaTeX sheet sets it as !important, and no other !important rule sets its property", () => {
    const sheet = siteKatexStylesheet();
    const map = katexClassMap();
    expect(new Set(DECLARATIONS).size).toBe(DECLARATIONS.length);
    const rules = [...sheet.matchAll(/([^{}]+)\{([^}]*)\}/g)];
    for (const d of DECLARATIONS) {
      // written as compaction writes them: a property, a number without a leading 0 and em
      expect(d).toMatch(/^[a-z-]+:-?(?:0|[1-9]\d*|(?:[1-9]\d*)?\.\d+)em$/);
      const short = map.get(d)!;
      const mine = rules.filter((m) => classesIn(`${m[1]}{}`).has(short));
      expect(mine.length, d).toBe(1);
      expect(mine[0][1].trim()).toBe(`.katex .${short}`);
      expect(mine[0][2]).toBe(`${d}!important`);
    }
    // the only other !important declarations of KaTeX's sheet and of site.css set none of these properties
    const properties = new Set(DECLARATIONS.map((d) => d.split(":")[0]));
    const important: string[] = [];
    for (const file of STYLE_SHEETS) {
      for (const m of readFileSync(file, "utf8").matchAll(/([\w-]+)\s*:[^;{}]*!\s*important/g)) important.push(m[1]);
    }
    // a control: KaTeX's sheet has one
    expect(important).toContain("-ms-high-contrast-adjust");
    expect(important.filter((p) => properties.has(p))).toEqual([]);
  });

  it("drops names that KaTeX does write", () => {
    const seen = new Set<string>();
    for (const { tex, display } of sampleTex()) {
      for (const m of katex.renderToString(tex, { ...OPTIONS, displayMode: display }).matchAll(/ class="([^"]*)"/g)) {
        for (const c of m[1].split(" ")) seen.add(c);
      }
    }
    for (const c of ["mord", "mtight", "mbin", "mrel", "mopen", "mclose", "mpunct", "minner", "mop"]) expect(seen.has(c), c).toBe(true);
  });

  it("keeps the MathML and every element, text and styled class, with the same style values", () => {
    let before = 0;
    let after = 0;
    for (const { tex, display } of sampleTex()) {
      const raw = katex.renderToString(tex, { ...OPTIONS, displayMode: display });
      const compact = compactKatex(raw);
      before += raw.length;
      after += compact.length;
      const cut = raw.indexOf('<span class="katex-html"');
      expect(compact.slice(0, cut)).toBe(raw.slice(0, cut));
      const a = tokens(raw.slice(cut));
      const b = tokens(compact.slice(cut));
      expect(b.length).toBe(a.length);
      a.forEach((t, i) => {
        if (!t.startsWith("<")) return expect(b[i]).toBe(t);
        const pa = tagParts(t);
        const pb = tagParts(b[i]);
        expect(pb.name).toBe(pa.name);
        expect(pb.classes).toEqual(pa.classes.filter((c) => !UNSTYLED_CLASSES.has(c)));
        expect(pb.style).toEqual(pa.style);
        expect(b[i].length).toBeLessThanOrEqual(t.length);
      });
      expect(compactKatex(compact)).toBe(compact);
    }
    // what it is for: a sizeable share of the bytes
    expect(after / before).toBeLessThan(0.9);
  });

  it("writes styles the short way without touching numbers that do not start with 0", () => {
    const k = (name: string): string => katexClassMap().get(name)!;
    const html = '<span class="katex-html"><span class="mord mathrm" style="height:0.6444em;vertical-align:-0.0833em;margin-right:10.05em;"></span><span class="mrel">0.5</span></span>';
    // a declaration of the table goes into the classes; the others stay, in their order
    expect(compactKatex(html)).toBe(
      `<span class="katex-html"><span class="${k("mathrm")} ${k("vertical-align:-.0833em")}" style="height:.6444em;margin-right:10.05em"></span><span>0.5</span></span>`,
    );
    // a thin space and a strut by class; a space of another width keeps its style
    const spaces = '<span class="katex-html"><span class="mspace" style="margin-right:0.1667em;"></span><span class="pstrut" style="height:3em;"></span><span class="mspace" style="margin-right:0.5em;"></span></span>';
    expect(compactKatex(spaces)).toBe(
      `<span class="katex-html"><span class="${k("mspace")} ${k("margin-right:.1667em")}"></span><span class="${k("pstrut")} ${k("height:3em")}"></span><span class="${k("mspace")}" style="margin-right:.5em"></span></span>`,
    );
    // a span with a style and no class
    expect(compactKatex('<span class="katex-html"><span style="top:-2.55em;margin-right:0.05em;">x</span></span>')).toBe(
      `<span class="katex-html"><span class="${k("top:-2.55em")} ${k("margin-right:.05em")}">x</span></span>`,
    );
    // no HTML part: nothing to do
    expect(compactKatex('<math><mi class="mord">x</mi></math>')).toBe('<math><mi class="mord">x</mi></math>');
  });

  it("leaves substituted shapes spliceable: their numbers sit in spans with no class or a font whose digits are alike", () => {
    const { skeleton, runs } = texSkeleton("d = \\frac{1\\,\\mathrm{au}}{5.915\\times10^{-7}\\,\\mathrm{rad}} = 2.529\\times10^{17}\\,\\mathrm{m}");
    const t = templateOf(compactKatex(katex.renderToString(skeleton, { ...OPTIONS, displayMode: true })), runs.length);
    expect(t.ok).toBe(true);
    // an italic number is still refused after its mord is dropped
    const italic = texSkeleton("x = \\mathit{3.75}");
    const refused = templateOf(compactKatex(katex.renderToString(italic.skeleton, OPTIONS)), italic.runs.length);
    expect(refused.ok).toBe(false);
  });
});
