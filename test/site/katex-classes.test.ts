import katex from "katex";
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { cssPieces, DECLARATIONS, katexStylesheet, OUTER_CLASSES, renameSelectors, selectorClasses, shortName } from "../../src/site/katex-classes.js";
import { compactKatex, katexClassMap, originalClassName, siteKatexStylesheet } from "../../src/site/katex-compact.js";
import { classesIn } from "./helpers/css-classes.js";
import { sampleTex } from "./helpers/katex-samples.js";
import { startTags } from "./helpers/html-scan.js";

const ROOT = path.resolve(__dirname, "../..");
const SITE_CSS = readFileSync(path.join(ROOT, "content/assets/site.css"), "utf8");
const OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" } as const;

/** The samples, as KaTeX writes them. */
function renderedSamples(): string[] {
  return sampleTex().map(({ tex, display }) => katex.renderToString(tex, { ...OPTIONS, displayMode: display }));
}

describe("short class names", () => {
  it("gives 962 distinct names that start with a capital letter, and no more", () => {
    const names = Array.from({ length: 962 }, (_, n) => shortName(n));
    expect(new Set(names).size).toBe(962);
    for (const n of names) expect(n).toMatch(/^[A-Z][a-z0-9]?$/);
    expect(names.slice(0, 3)).toEqual(["A", "B", "C"]);
    expect(names[26]).toBe("Aa");
    expect(() => shortName(962)).toThrow("no short name");
  });

  it("maps every class of KaTeX's sheet but the outer ones, one to one, and the declarations of the table too", () => {
    const map = katexClassMap();
    const sheet = selectorClasses(katexStylesheet());
    // a control: the parser finds KaTeX's real classes
    for (const c of ["katex", "vlist-t", "mfrac", "katex-sizing", "reset-size6", "mspace"]) expect(sheet, c).toContain(c);
    for (const c of sheet) expect(map.has(c), c).toBe(!OUTER_CLASSES.has(c));
    for (const d of DECLARATIONS) expect(map.has(d), d).toBe(true);
    const shorts = [...map.values()];
    expect(new Set(shorts).size).toBe(shorts.length);
    for (const [name, short] of map) expect(originalClassName(short)).toBe(name);
    // the most frequent classes get one letter
    for (const c of ["mspace", "vlist-r", "vlist", "pstrut", "katex-sizing", "reset-size6", "size3"]) expect(map.get(c), c).toMatch(/^[A-Z]$/);
  });

  it("meets no class of the site's style sheet or of KaTeX's, and the sheets are lower case", () => {
    const shorts = new Set(katexClassMap().values());
    const site = [...classesIn(SITE_CSS)];
    const theirs = selectorClasses(katexStylesheet());
    expect(site.length).toBeGreaterThan(20);
    for (const c of [...site, ...theirs]) {
      expect(shorts.has(c), c).toBe(false);
      // class names are case-sensitive in standards mode only: a lower-case sheet cannot meet a capital name either way
      expect(c, c).toBe(c.toLowerCase());
    }
  });

  it("writes every class of the HTML part by its short name, and leaves the MathML and the frame alone", () => {
    const map = katexClassMap();
    const shorts = new Set(map.values());
    let classes = 0;
    for (const raw of renderedSamples()) {
      const compact = compactKatex(raw);
      const cut = compact.indexOf('<span class="katex-html"');
      expect(compact.slice(0, cut)).toBe(raw.slice(0, raw.indexOf('<span class="katex-html"')));
      for (const tag of startTags(compact.slice(cut)).slice(1)) {
        for (const c of (tag.attributes.get("class") ?? "").split(" ").filter((x) => x !== "")) {
          expect(shorts.has(c), `${c} in ${compact.slice(cut, cut + 200)}`).toBe(true);
          classes++;
        }
      }
    }
    expect(classes).toBeGreaterThan(1000);
  });
});

describe("the site's copy of KaTeX's style sheet", () => {
  it("reads KaTeX's sheet into rules and font faces and puts it back together unchanged", () => {
    const css = katexStylesheet();
    const pieces = cssPieces(css);
    expect(pieces.map((p) => p.prelude + p.block).join("")).toBe(css);
    expect(pieces.filter((p) => p.prelude.startsWith("@")).every((p) => p.prelude === "@font-face")).toBe(true);
    expect(pieces.filter((p) => p.block !== "").length).toBeGreaterThan(200);
    // no selector reads an attribute (the class attribute as text would see the names change) or
    // holds a string or an escape, where a dot would not start a class
    const selectors = pieces.filter((p) => p.block !== "" && !p.prelude.startsWith("@")).map((p) => p.prelude);
    expect(selectors.filter((s) => /[[\]\\"']/.test(s))).toEqual([]);
  });

  it("refuses a sheet it cannot read rather than rewrite half of it", () => {
    expect(() => cssPieces("/* note */ .a{color:red}")).toThrow("comments");
    expect(() => cssPieces("@media print{.a{color:red}}")).toThrow("nested");
    expect(() => cssPieces(".a{color:red")).toThrow("unclosed");
    expect(() => cssPieces(".a{color:red} .b")).toThrow("after the last rule");
  });

  it("renames the selectors and nothing else: the same declarations in the same order, and the renaming undone gives KaTeX's sheet", () => {
    const css = katexStylesheet();
    const map = katexClassMap();
    const site = siteKatexStylesheet();
    const before = cssPieces(css);
    const after = cssPieces(renameSelectors(css, map));
    expect(after.map((p) => p.block)).toEqual(before.map((p) => p.block));
    // font URLs and numbers inside declarations are untouched
    expect(after.filter((p) => p.prelude === "@font-face").length).toBe(20);
    const back = new Map([...map].map(([name, short]) => [short, name]));
    expect(renameSelectors(renameSelectors(css, map), back)).toBe(css);
    // a rule that KaTeX writes with several classes, renamed class by class
    expect(site).toContain(`.katex .${map.get("katex-sizing")}.${map.get("reset-size6")}.${map.get("size3")}{`);
    // the site's sheet is KaTeX's renamed, then the declaration classes' rules
    expect(site.startsWith(renameSelectors(css, map))).toBe(true);
    expect(cssPieces(site).filter((p) => p.block !== "").length).toBe(before.filter((p) => p.block !== "").length + DECLARATIONS.length);
  });
});
