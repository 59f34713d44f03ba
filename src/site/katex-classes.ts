import { readFileSync } from "node:fs";
import path from "node:path";
import { KATEX_DIST } from "./paths.js";

/**
 * Short names for the classes of KaTeX's HTML part, and the style sheet that
 * goes with them.
 *
 * Class names are about a third of an audit page's bytes ("katex-sizing
 * reset-size6 size3" on every script). Inside the HTML part of an equation
 * each class KaTeX's style sheet selects is written as a name of one or two
 * characters, and the site ships KaTeX's style sheet with every selector
 * rewritten by the same map (assets/katex/katex-<digest>.css, made from
 * katex.min.css at build time). A rule then matches a renamed element
 * exactly when it matched the original one: the map is one to one, every
 * class of every selector goes through it, and no selector of KaTeX's reads
 * class attributes any other way (test/site/katex-classes.test.ts checks the
 * sheet for attribute selectors).
 *
 * The short names begin with a capital letter; KaTeX's and the site's own
 * classes are all lower case, and pages are in standards mode, where class
 * names are case-sensitive, so no short name meets a class it was not made
 * for. The classes that frame an equation (katex, katex-display, katex-html,
 * katex-mathml, ...) keep their names: they sit outside the HTML part, and
 * site.css and the tests select them.
 */

/** KaTeX's classes on the wrapper and on the MathML side: never renamed. */
export const OUTER_CLASSES: ReadonlySet<string> = new Set([
  "katex",
  "katex-display",
  "katex-html",
  "katex-mathml",
  "katex-version",
  "fleqn",
  "leqno",
  "mml-eqn-num",
]);

/**
 * Inline declarations KaTeX writes often enough to be worth a class (see
 * katex-compact.ts): the struts of scripts and fractions (2.7em, 3em), TeX's
 * thin, medium and thick spaces (3, 4 and 5 mu), the fraction rule, then the
 * 64 that take the most bytes in the HTML part of audit pages, most first
 * (counted on a generated catalogue of 1,000 objects; together 90 % of the
 * bytes of the inline styles that remain). The values are KaTeX's font
 * metrics, written the short way; one that KaTeX stops writing costs nothing.
 */
export const DECLARATIONS: readonly string[] = [
  "height:2.7em", "height:3em", "margin-right:.1667em", "margin-right:.2222em", "margin-right:.2778em",
  "border-bottom-width:.04em",
  "margin-right:.05em", "margin-right:.109em", "margin-left:-.109em", "top:-2.55em", "margin-right:.0593em",
  "height:.8641em", "height:.8141em", "top:-3.063em", "height:.15em", "height:.3011em", "top:-3.113em",
  "vertical-align:-.15em", "vertical-align:-.0833em", "top:-3.677em", "height:.7401em", "vertical-align:-.686em",
  "top:-3.23em", "top:0em", "top:-2.989em", "top:-2.314em", "height:.7278em", "vertical-align:-.1944em",
  "height:.2583em", "height:.2083em", "margin-right:.0359em", "margin-right:.1076em", "vertical-align:-.25em",
  "height:.686em", "height:.8333em", "margin-right:.0715em", "margin-left:-.0715em", "vertical-align:-.7693em",
  "margin-left:0em", "margin-right:.1389em", "height:1.4911em", "vertical-align:-.2083em", "height:.8719em",
  "vertical-align:-.995em", "vertical-align:-.2861em", "height:1.0585em", "height:1.3603em", "top:-3.1208em",
  "margin-right:.0139em", "height:.3175em", "height:.2861em", "height:.7693em", "height:2.2604em",
  "height:3.4279em", "margin-right:2em", "height:1em", "height:.2806em", "height:.8231em", "height:.2819em",
  "top:-2.2869em", "top:-2.4765em", "top:-3.0448em", "height:.995em", "height:1.0219em", "height:3.337em",
  "height:.954em", "top:-3.2029em", "height:.4306em", "margin-right:.0278em", "height:.8917em",
];

/**
 * The classes and declarations that get the 26 one-letter names: the most
 * frequent in the HTML part of an audit page, most frequent first (counted on
 * the same catalogue). The order changes only bytes, never which rules apply.
 */
const FREQUENT = [
  "mspace", "vlist-r", "vlist", "pstrut", "vlist-t", "margin-right:.05em", "height:2.7em", "katex-sizing",
  "reset-size6", "size3", "msupsub", "margin-right:.1667em", "mathnormal", "mathrm", "katex-base",
  "katex-strut", "margin-right:.2778em", "margin-right:.2222em", "vlist-t2", "vlist-s", "height:3em",
  "top:-2.55em", "margin-right:.109em", "nulldelimiter", "margin-left:-.109em", "height:.8641em",
];

const CAPITALS = "ABCDEFGHIJKLMNOPQRSTUVWXYZ";
const SECOND = "abcdefghijklmnopqrstuvwxyz0123456789";

/** The n-th short name: A … Z, then Aa … Az, A0 … A9, Ba, … (962 in all). */
export function shortName(n: number): string {
  if (n < CAPITALS.length) return CAPITALS[n];
  const k = n - CAPITALS.length;
  const first = Math.floor(k / SECOND.length);
  if (first >= CAPITALS.length) throw new Error(`shortName: no short name number ${n}`);
  return CAPITALS[first] + SECOND[k % SECOND.length];
}

/** A part of a style sheet: a prelude (a selector list or an at-rule) and its block, or text between them. */
interface Piece {
  readonly prelude: string;
  readonly block: string;
}

/**
 * The rules of a flat style sheet (KaTeX's has rules and @font-face blocks,
 * no nesting and no comments): each prelude with its block, braces included,
 * and the white space after the last block as a piece with an empty block.
 * Throws on anything else, so that a KaTeX upgrade that changes the sheet's
 * shape fails the build instead of being half rewritten.
 */
export function cssPieces(css: string): Piece[] {
  if (css.includes("/*")) throw new Error("katex-classes: the style sheet has comments; the rewriter does not read them");
  const out: Piece[] = [];
  let at = 0;
  while (at < css.length) {
    const open = css.indexOf("{", at);
    if (open < 0) {
      const rest = css.slice(at);
      if (rest.trim() !== "") throw new Error(`katex-classes: text after the last rule: ${rest.slice(0, 40)}`);
      // the white space at the end, kept so that the pieces give the sheet back byte for byte
      out.push({ prelude: rest, block: "" });
      break;
    }
    const close = css.indexOf("}", open);
    if (close < 0 || css.slice(open + 1, close).includes("{")) {
      throw new Error(`katex-classes: a nested or unclosed block after ${JSON.stringify(css.slice(at, open))}`);
    }
    out.push({ prelude: css.slice(at, open), block: css.slice(open, close + 1) });
    at = close + 1;
  }
  return out;
}

/** A class in a selector: a dot and an identifier (KaTeX's names need no escapes). */
const SELECTOR_CLASS = /\.(-?[A-Za-z_][\w-]*)/g;

/** Every class the selectors of `css` name, in the order they first appear. */
export function selectorClasses(css: string): string[] {
  const seen = new Set<string>();
  for (const { prelude } of cssPieces(css)) {
    if (prelude.trim().startsWith("@")) continue;
    for (const m of prelude.matchAll(SELECTOR_CLASS)) seen.add(m[1]);
  }
  return [...seen];
}

/** `css` with every class of every selector renamed by `rename` (classes it does not map keep their names). */
export function renameSelectors(css: string, rename: ReadonlyMap<string, string>): string {
  return cssPieces(css)
    .map(({ prelude, block }) =>
      prelude.trim().startsWith("@") ? prelude + block : prelude.replace(SELECTOR_CLASS, (m, name: string) => `.${rename.get(name) ?? name}`) + block,
    )
    .join("");
}

/**
 * The short names for a style sheet's classes and for `extra` (declarations):
 * FREQUENT first, then the sheet's other classes in its order, then the rest
 * of `extra`; the outer classes are left out.
 */
export function classMapFor(css: string, extra: readonly string[]): Map<string, string> {
  const inSheet = selectorClasses(css).filter((c) => !OUTER_CLASSES.has(c));
  const known = new Set([...inSheet, ...extra]);
  const order = [...FREQUENT.filter((c) => known.has(c)), ...inSheet, ...extra];
  const map = new Map<string, string>();
  for (const c of order) if (!map.has(c)) map.set(c, shortName(map.size));
  return map;
}

/** KaTeX's own style sheet, as its package ships it. */
export function katexStylesheet(): string {
  return readFileSync(path.join(KATEX_DIST, "katex.min.css"), "utf8");
}
