import { isDeclarationClass, originalClassName } from "./katex-compact.js";

/**
 * The shape of a TeX string, apart from its numbers.
 *
 * A substituted equation is the same TeX page after page with other numbers
 * in it. `texSkeleton` replaces every number (a run of digits, with at most
 * one decimal point between digits) by a numbered marker, a digit string of
 * fixed form that nothing else in a typeset equation contains. Equations of
 * one shape share one skeleton; the skeleton is typeset once, and
 * `templateOf` cuts the typeset string at the markers, so that `splice` can
 * put any other equation of that shape together by pasting its numbers back.
 *
 * That is sound because KaTeX treats every digit alike in the fonts it uses
 * for numbers here (same height, depth, italic correction and skew; widths
 * are not written into the output), and a run of digits becomes one text
 * node whatever its length. `templateOf` refuses a typeset skeleton whose
 * markers did not come through as such text: a marker split by a script, used
 * as a size, a character code or a macro argument, set in a font whose digits
 * differ, or not found exactly once in each of the MathML, the TeX annotation
 * and the HTML. The caller typesets refused shapes directly.
 */

export interface TexSkeleton {
  /** The TeX with every number replaced by `markerFor(i)`, i counting from 0. */
  readonly skeleton: string;
  /** The numbers taken out, in order. */
  readonly runs: readonly string[];
}

/** Octal digits in a marker's number. */
const MARKER_INDEX_DIGITS = 8;
/** How many numbers one skeleton can mark; later numbers stay in the skeleton as they are. */
export const MAX_MARKERS = 8 ** MARKER_INDEX_DIGITS;

/**
 * Marker i: "9", i in eight octal digits, "8" (ten digits in all). Only the
 * first digit of a marker is a 9, so two markers can never overlap, and no
 * number KaTeX writes itself (sizes to four decimals, path data below a
 * million) is ten digits long.
 */
export function markerFor(index: number): string {
  if (!Number.isInteger(index) || index < 0 || index >= MAX_MARKERS) {
    throw new Error(`marker index must be a whole number from 0 to ${MAX_MARKERS - 1}, not ${index}`);
  }
  return "9" + index.toString(8).padStart(MARKER_INDEX_DIGITS, "0") + "8";
}

const MARKER_SOURCE = `9[0-7]{${MARKER_INDEX_DIGITS}}8`;
const MARKERS = new RegExp(MARKER_SOURCE, "g");
const MARKER_LENGTH = MARKER_INDEX_DIGITS + 2;

function markerIndex(marker: string): number {
  return parseInt(marker.slice(1, -1), 8);
}

/**
 * TeX tokens as far as numbers are concerned: a control sequence (whose
 * letters or symbol are never a number; a lone backslash at the end too), a
 * number, a script sign, white space, or anything else. Together they cover
 * every character.
 */
const TOKENS = /\\(?:[a-zA-Z@]+|[^])?|(\d+(?:\.\d+)?)|([\^_])|(\s+)|[^\\\d^_\s]+/g;
/** A script or a prime after a number attaches to its last digit alone. */
const SCRIPT_FOLLOWS = /\s*[\^_']/y;
const HAS_DIGIT = /\d/;

function scriptFollows(tex: string, at: number): boolean {
  SCRIPT_FOLLOWS.lastIndex = at;
  return SCRIPT_FOLLOWS.test(tex);
}

/**
 * The skeleton text for one number. A digit that TeX reads as an atom of its
 * own stays in the skeleton: the first digit right after an unbraced ^ or _
 * (the script itself) and the last digit before a ^, _ or ' (its base).
 */
function markRun(text: string, afterScript: boolean, beforeScript: boolean, runs: string[]): string {
  let body = text;
  let head = "";
  let tail = "";
  if (afterScript) {
    head = body[0];
    body = body.slice(1);
  }
  if (beforeScript && body.length > 0) {
    tail = body[body.length - 1];
    body = body.slice(0, -1);
  }
  if (body.startsWith(".")) {
    head += ".";
    body = body.slice(1);
  }
  if (body.endsWith(".")) {
    tail = "." + tail;
    body = body.slice(0, -1);
  }
  if (body === "" || runs.length >= MAX_MARKERS) return head + body + tail;
  runs.push(body);
  return head + markerFor(runs.length - 1) + tail;
}

export function texSkeleton(tex: string): TexSkeleton {
  if (!HAS_DIGIT.test(tex)) return { skeleton: tex, runs: [] };
  const runs: string[] = [];
  let skeleton = "";
  let afterScript = false;
  /** Where in `tex` the next token must start. */
  let next = 0;
  TOKENS.lastIndex = 0;
  for (let m = TOKENS.exec(tex); m !== null; m = TOKENS.exec(tex)) {
    const text = m[0];
    if (m.index !== next) throw new Error(`texSkeleton skipped ${JSON.stringify(tex.slice(next, m.index))} in ${JSON.stringify(tex)}`);
    next = TOKENS.lastIndex;
    if (m[1] !== undefined) {
      skeleton += markRun(text, afterScript, scriptFollows(tex, TOKENS.lastIndex), runs);
      afterScript = false;
    } else {
      skeleton += text;
      if (m[2] !== undefined) afterScript = true;
      else if (m[3] === undefined) afterScript = false;
    }
  }
  if (next !== tex.length) throw new Error(`texSkeleton skipped the end of ${JSON.stringify(tex)}`);
  return { skeleton, runs };
}

/** The skeleton with every marker set to `digit`: an equation of the same shape with one-digit numbers. */
export function probeTex(skeleton: string, digit: string): string {
  return skeleton.replace(MARKERS, digit);
}

/** A typeset skeleton cut at its markers: pieces[0], runs[slots[0]], pieces[1], ..., pieces[n]. */
export interface SpliceTemplate {
  readonly pieces: readonly string[];
  readonly slots: readonly number[];
}

export type TemplateOutcome = { readonly ok: true; readonly value: SpliceTemplate } | { readonly ok: false; readonly reason: string };

/**
 * Class names of a span whose digits may be swapped: the ordinary-atom and
 * script classes, and the fonts whose ten digits share one set of metrics
 * (Main Regular for plain, \mathrm and text; Main Bold; Sans Serif regular
 * and bold; Typewriter). Italic and Fraktur digits differ from one another.
 */
const SWAPPABLE_CLASSES: ReadonlySet<string> = new Set([
  "mord",
  "mtight",
  "mathrm",
  "textrm",
  "textup",
  "textmd",
  "mathbf",
  "textbf",
  "mathsf",
  "textsf",
  "mathtt",
  "texttt",
]);

const ANNOTATION_OPEN = '<annotation encoding="application/x-tex">';
const ANNOTATION_CLOSE = "</annotation>";
/** A span's opening tag, with its classes when it has any (compaction drops a class attribute left empty). */
const SPAN_TAG = /^<span(?: class="([^"]*)")?[ >]/;
const MATHML_TEXT = /^<(?:mn|mtext)[ >]/;

type Region = "mathml" | "annotation" | "html";

/** Why the marker at `at` is not plain text of a swappable element; undefined when it is. */
function contextProblem(rendered: string, at: number, region: Region): string | undefined {
  const open = rendered.lastIndexOf("<", at);
  const close = rendered.lastIndexOf(">", at);
  if (close < open) return "a number became part of a tag (a size or an attribute)";
  if (region === "annotation") return undefined;
  const tag = rendered.slice(open, close + 1);
  if (region === "mathml") return MATHML_TEXT.test(tag) ? undefined : `a number's MathML element is ${tag}`;
  const classes = SPAN_TAG.exec(tag);
  if (!classes) return `a number's HTML element is ${tag}`;
  // a span without classes is set in the main font, whose digits are all alike
  if (classes[1] === undefined) return undefined;
  for (const name of classes[1].split(" ")) {
    // compaction writes some inline declarations as classes: a declaration, like any inline
    // style, is not a font; and KaTeX's classes by their short names (katex-classes.ts)
    if (isDeclarationClass(name)) continue;
    const original = originalClassName(name) ?? name;
    if (!SWAPPABLE_CLASSES.has(original)) return `a number is set with class ${original}, whose digits are not all alike`;
  }
  return undefined;
}

/**
 * Cuts `rendered` (KaTeX's htmlAndMathml output for a skeleton with `runCount`
 * markers) into a template, or says why the shape cannot be spliced.
 */
export function templateOf(rendered: string, runCount: number): TemplateOutcome {
  const annotationStart = rendered.indexOf(ANNOTATION_OPEN);
  const annotationEnd = rendered.indexOf(ANNOTATION_CLOSE);
  if (annotationStart < 0 || annotationEnd < annotationStart) return { ok: false, reason: "no TeX annotation in the output" };
  const seen: Record<Region, number[]> = {
    mathml: new Array<number>(runCount).fill(0),
    annotation: new Array<number>(runCount).fill(0),
    html: new Array<number>(runCount).fill(0),
  };
  const pieces: string[] = [];
  const slots: number[] = [];
  let from = 0;
  MARKERS.lastIndex = 0;
  for (let m = MARKERS.exec(rendered); m !== null; m = MARKERS.exec(rendered)) {
    const index = markerIndex(m[0]);
    if (index >= runCount) return { ok: false, reason: `the output holds a marker-like number ${m[0]}` };
    const region: Region = m.index < annotationStart ? "mathml" : m.index < annotationEnd ? "annotation" : "html";
    const problem = contextProblem(rendered, m.index, region);
    if (problem) return { ok: false, reason: problem };
    seen[region][index]++;
    pieces.push(rendered.slice(from, m.index));
    slots.push(index);
    from = m.index + MARKER_LENGTH;
  }
  pieces.push(rendered.slice(from));
  for (const region of ["mathml", "annotation", "html"] as const) {
    const count = seen[region].findIndex((n) => n !== 1);
    if (count >= 0) {
      return { ok: false, reason: `number ${count} appears ${seen[region][count]} times in the ${region} part instead of once` };
    }
  }
  return { ok: true, value: { pieces, slots } };
}

/** The typeset equation for `runs` (the numbers texSkeleton took out of it), from the template of its skeleton. */
export function splice(template: SpliceTemplate, runs: readonly string[]): string {
  const { pieces, slots } = template;
  let out = pieces[0];
  for (let i = 0; i < slots.length; i++) out += runs[slots[i]] + pieces[i + 1];
  return out;
}
