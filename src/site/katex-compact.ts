import { classMapFor, katexStylesheet, renameSelectors } from "./katex-classes.js";

/**
 * KaTeX's HTML output with the bytes that no style sheet reads taken out.
 *
 * KaTeX marks every atom of its HTML part with a class naming its TeX atom
 * type (mord, mbin, mrel, ...) and every script with mtight. Its own style
 * sheet, katex.min.css, has no rule for any of these names, and neither has
 * ours, so they change nothing the reader sees; on an audit page they are
 * about 7.5 % of the bytes. They are dropped, and a class attribute left
 * empty goes with them. Inline styles are written the short way, as CSS
 * reads them alike: no final semicolon, and ".5em" for "0.5em".
 *
 * Six empty spans still make up about 15 % of an audit page: the struts of
 * scripts and fractions (height 2.7em and 3em), TeX's thin, medium and thick
 * spaces (3, 4 and 5 mu: .1667em, .2222em, .2778em) and the fraction rule
 * (.04em). Each always carries the same inline style, so it gets a class
 * instead, whose rule sets that same declaration (STYLE_CLASSES; the rules
 * are written into the site's copy of KaTeX's style sheet).
 *
 * Last, every remaining class of the HTML part is written with its short name
 * (katex-classes.ts), and the site's copy of KaTeX's style sheet,
 * assets/katex/katex.css (siteKatexStylesheet), has every selector renamed
 * the same way.
 *
 * Only the HTML part changes (it is aria-hidden: screen readers read the
 * MathML, which is left exactly as KaTeX wrote it, with its TeX annotation).
 * test/site/katex-compact.test.ts checks that no style sheet of the site
 * names a dropped class (so a KaTeX upgrade that starts styling one of them
 * fails there) and that the site's sheet has the rule of each style class; the
 * browser test lays out every equation of an object page both ways and
 * compares every box.
 */

/** Class names KaTeX writes that no rule of katex.min.css (0.19.1) or of site.css selects. */
export const UNSTYLED_CLASSES: ReadonlySet<string> = new Set(["mord", "mtight", "mbin", "mrel", "mopen", "mclose", "mpunct", "minner", "mop"]);

/** Empty spans whose inline style becomes a class: span class, the declaration, and the class that sets it (its rule is in siteKatexStylesheet). */
export const STYLE_CLASSES: ReadonlyArray<{ readonly on: string; readonly declaration: string; readonly name: string }> = [
  { on: "pstrut", declaration: "height:2.7em", name: "ps27" },
  { on: "pstrut", declaration: "height:3em", name: "ps3" },
  { on: "mspace", declaration: "margin-right:.1667em", name: "sp3" },
  { on: "mspace", declaration: "margin-right:.2222em", name: "sp4" },
  { on: "mspace", declaration: "margin-right:.2778em", name: "sp5" },
  { on: "frac-line", declaration: "border-bottom-width:.04em", name: "fl4" },
];

let classMap: Map<string, string> | undefined;
let originals: Map<string, string> | undefined;

/**
 * KaTeX's class name → the short name the HTML part is written with
 * (katex-classes.ts): every class katex.min.css selects but the outer ones,
 * and the style classes below.
 */
export function katexClassMap(): ReadonlyMap<string, string> {
  classMap ??= classMapFor(katexStylesheet(), STYLE_CLASSES.map((c) => c.name));
  return classMap;
}

/** The class a short name stands for; undefined for a name the map does not give. */
export function originalClassName(short: string): string | undefined {
  originals ??= new Map([...katexClassMap()].map(([name, s]) => [s, name]));
  return originals.get(short);
}

/** The style sheet the site ships for its equations: KaTeX's with the short names, and the rules of the style classes. */
export function siteKatexStylesheet(): string {
  const map = katexClassMap();
  const rules = STYLE_CLASSES.map((c) => `.katex .${map.get(c.on)}.${map.get(c.name)}{${c.declaration}}`).join("");
  return renameSelectors(katexStylesheet(), map) + rules;
}

/** The empty spans of STYLE_CLASSES as compaction has left them (short class, short style), and what each becomes. */
let styledSpans: { pattern: RegExp; replacement: Map<string, string> } | undefined;

function styledEmptySpans(): { pattern: RegExp; replacement: Map<string, string> } {
  if (styledSpans) return styledSpans;
  const map = katexClassMap();
  const on = [...new Set(STYLE_CLASSES.map((c) => map.get(c.on)!))];
  styledSpans = {
    pattern: new RegExp(`<span class="(${on.join("|")})" style="([^"]*)"></span>`, "g"),
    replacement: new Map(STYLE_CLASSES.map((c) => [`${map.get(c.on)} ${c.declaration}`, `<span class="${map.get(c.on)} ${map.get(c.name)}"></span>`])),
  };
  return styledSpans;
}

function classForStyle(span: string, on: string, declaration: string): string {
  return styledEmptySpans().replacement.get(`${on} ${declaration}`) ?? span;
}

const HTML_PART = '<span class="katex-html"';
const ATTRIBUTE = / (class|style)="([^"]*)"/g;
/** A 0 that starts a number and stands before its decimal point (not the 0 of 10.5). */
const LEADING_ZERO = /(^|[^\d.])0\.(?=\d)/g;

function compactClasses(value: string): string {
  const map = katexClassMap();
  let out = "";
  for (const name of value.split(" ")) {
    if (name === "" || UNSTYLED_CLASSES.has(name)) continue;
    const short = map.get(name) ?? name;
    out = out === "" ? short : out + " " + short;
  }
  return out === "" ? "" : ` class="${out}"`;
}

function compactStyle(value: string): string {
  let v = value.endsWith(";") ? value.slice(0, -1) : value;
  v = v.replace(LEADING_ZERO, "$1.");
  return ` style="${v}"`;
}

function compactAttribute(_match: string, name: string, value: string): string {
  return name === "class" ? compactClasses(value) : compactStyle(value);
}

/** `rendered` (one renderToString result) with its HTML part compacted; the same string when it has none. */
export function compactKatex(rendered: string): string {
  const at = rendered.indexOf(HTML_PART);
  if (at < 0) return rendered;
  // the katex-html span's own class stays: it is styled
  const body = at + HTML_PART.length;
  return rendered.slice(0, body) + rendered.slice(body).replace(ATTRIBUTE, compactAttribute).replace(styledEmptySpans().pattern, classForStyle);
}
