import { digest } from "../cache/digest.js";
import { classMapFor, DECLARATIONS, katexStylesheet, renameSelectors } from "./katex-classes.js";

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
 * Every remaining class of the HTML part is then written with its short name
 * (katex-classes.ts), and the site's copy of KaTeX's style sheet,
 * assets/katex/katex-<digest>.css (siteKatexStylesheet), has every selector renamed
 * the same way.
 *
 * Last, the inline declarations KaTeX writes most often (DECLARATIONS: the
 * struts of scripts and fractions, TeX's thin, medium and thick spaces, the
 * shifts of scripts, the heights of their boxes) become classes too, each with
 * one rule in the site's sheet that sets that declaration as !important. An
 * inline declaration outranks every normal declaration of every sheet; an
 * !important one of the author's sheets does the same, and no other
 * !important declaration of KaTeX's sheet or of site.css sets any of these
 * properties (the test checks), so each element ends with the same value.
 * Declarations not in the table stay inline.
 *
 * Only the HTML part changes (it is aria-hidden: screen readers read the
 * MathML, which is left exactly as KaTeX wrote it, with its TeX annotation).
 * test/site/katex-compact.test.ts checks that no style sheet of the site
 * names a dropped class (so a KaTeX upgrade that starts styling one of them
 * fails there) and the rule of each declaration class;
 * test/site/katex-classes.test.ts checks the renaming; the browser test lays
 * out every equation of an object page both ways and compares every box.
 */

/** Class names KaTeX writes that no rule of katex.min.css (0.19.1) or of site.css selects. */
export const UNSTYLED_CLASSES: ReadonlySet<string> = new Set(["mord", "mtight", "mbin", "mrel", "mopen", "mclose", "mpunct", "minner", "mop"]);

let classMap: Map<string, string> | undefined;
let originals: Map<string, string> | undefined;
let declarationClasses: Map<string, string> | undefined;
let sheet: string | undefined;

/**
 * KaTeX's class name, or a declaration of DECLARATIONS, → the short class
 * name the HTML part is written with (katex-classes.ts): every class
 * katex.min.css selects but the outer ones.
 */
export function katexClassMap(): ReadonlyMap<string, string> {
  classMap ??= classMapFor(katexStylesheet(), DECLARATIONS);
  return classMap;
}

/** The class or declaration a short name stands for; undefined for a name the map does not give. */
export function originalClassName(short: string): string | undefined {
  originals ??= new Map([...katexClassMap()].map(([name, s]) => [s, name]));
  return originals.get(short);
}

/** A declaration of DECLARATIONS → its short class name. */
function declarationClassMap(): ReadonlyMap<string, string> {
  declarationClasses ??= new Map(DECLARATIONS.map((d) => [d, katexClassMap().get(d)!]));
  return declarationClasses;
}

/** Whether a class of the compacted HTML part stands for an inline declaration (DECLARATIONS), not for a class of KaTeX's. */
export function isDeclarationClass(short: string): boolean {
  const original = originalClassName(short);
  return original !== undefined && declarationClassMap().has(original);
}

/**
 * The style sheet the site ships for its equations: KaTeX's with the short
 * names, and the rules of the declaration classes. Made once per thread.
 */
export function siteKatexStylesheet(): string {
  if (sheet === undefined) {
    const rules = [...declarationClassMap()].map(([d, short]) => `.katex .${short}{${d}!important}`).join("");
    sheet = renameSelectors(katexStylesheet(), katexClassMap()) + rules;
  }
  return sheet;
}

let sheetPath: string | undefined;

/**
 * The site path of siteKatexStylesheet: its name holds a digest of its
 * content, so a browser that kept the sheet of an earlier build (another
 * KaTeX, another map) never lays out a page with it.
 */
export function katexStylesheetPath(): string {
  sheetPath ??= `assets/katex/katex-${digest([siteKatexStylesheet()]).slice(0, 12)}.css`;
  return sheetPath;
}

const HTML_PART = '<span class="katex-html"';
const ATTRIBUTE = / (class|style)="([^"]*)"/g;
/** A span's class (KaTeX writes it first) and style, once both are compacted. */
const SPAN_STYLE = /<span(?: class="([^"]*)")? style="([^"]*)"/g;
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

/** A span with the declarations of DECLARATIONS moved from its style into its classes, in their order. */
function declarationsToClasses(tag: string, classes: string | undefined, style: string): string {
  const map = declarationClassMap();
  let names = classes ?? "";
  let rest = "";
  for (const declaration of style.split(";")) {
    const short = map.get(declaration);
    if (short !== undefined) names = names === "" ? short : names + " " + short;
    else rest = rest === "" ? declaration : rest + ";" + declaration;
  }
  if (rest === style) return tag;
  return `<span${names === "" ? "" : ` class="${names}"`}${rest === "" ? "" : ` style="${rest}"`}`;
}

/** `rendered` (one renderToString result) with its HTML part compacted; the same string when it has none. */
export function compactKatex(rendered: string): string {
  const at = rendered.indexOf(HTML_PART);
  if (at < 0) return rendered;
  // the katex-html span's own class stays: it is styled
  const body = at + HTML_PART.length;
  return rendered.slice(0, body) + rendered.slice(body).replace(ATTRIBUTE, compactAttribute).replace(SPAN_STYLE, declarationsToClasses);
}
