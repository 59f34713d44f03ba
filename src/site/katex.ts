import { createRequire } from "node:module";
import { compactKatex } from "./katex-compact.js";
import { probeTex, splice, templateOf, texSkeleton, type SpliceTemplate } from "./tex-skeleton.js";

/**
 * The one place that calls KaTeX. It only ever receives TeX that steelyard
 * wrote itself (method equations, numbers from latexNumber, unit LaTeX from
 * the unit catalogue), never record text. Bad TeX is a programmer mistake:
 * it fails the build instead of shipping red text.
 *
 * Every string KaTeX returns is compacted at once (katex-compact.ts: classes
 * no style sheet reads, and the long way of writing inline styles, taken out
 * of the HTML part), so "KaTeX's output" below means the compacted output.
 *
 * Each equation shape is typeset once. A substituted equation differs from
 * the next one of its method only in its numbers, so its skeleton (the TeX
 * with numbers replaced by markers, see tex-skeleton.ts) is typeset once and
 * every equation of that shape is spliced together from the cut-up output:
 * byte for byte what KaTeX gives for the equation itself. A shape is trusted
 * only after three checks when first met: every marker comes through as
 * plain text of a font whose digits are all alike, once in each part of the
 * output; the splice equals KaTeX's own output for the equation at hand; and
 * it equals KaTeX's output for the same shape with one-digit numbers (which
 * catches layouts that depend on how many digits a number has). Shapes that
 * fail are typeset directly each time, with a bounded memo of whole strings.
 *
 * The shapes a build learned can be kept between builds (exportShapes,
 * importShapes; equation-store.ts keeps them in the cache folder), so that a
 * rebuild whose equations all have known shapes never runs KaTeX, nor even
 * loads it: KaTeX is loaded on the first equation it has to typeset.
 */
const OPTIONS = {
  throwOnError: true,
  strict: "error",
  output: "htmlAndMathml",
} as const;

type Shape =
  | { readonly kind: "splice"; readonly template: SpliceTemplate }
  | { readonly kind: "direct"; readonly reason: string };

/**
 * Shapes keyed by display mode and skeleton. A site has few of them (one per
 * method equation and combination of inputs, and the generic TeX), so the
 * limit is only a guard; the oldest are forgotten first.
 */
const SHAPE_LIMIT = 4096;
const shapes = new Map<string, Shape>();

/** Whole rendered strings, only for equations whose shape cannot be spliced. */
const DIRECT_MEMO_LIMIT = 1024;
const directMemo = new Map<string, string>();

let typesetCount = 0;

type Katex = typeof import("katex").default;
let katexModule: Katex | undefined;

/** KaTeX, loaded when first needed (its CommonJS build: the same code as its ES module, loaded synchronously). */
function katex(): Katex {
  katexModule ??= createRequire(import.meta.url)("katex") as Katex;
  return katexModule;
}

/** The KaTeX version that typesets here, and the options it is given: what a kept shape depends on besides this code. */
export function typesetterId(): string {
  const { version } = createRequire(import.meta.url)("katex/package.json") as { version: string };
  return JSON.stringify({ katex: version, options: OPTIONS });
}

/** Shapes learned on this thread and not yet handed out by takeLearnedShapes, by key. */
const learned = new Set<string>();

function remember<V>(map: Map<string, V>, limit: number, key: string, value: V): void {
  if (map.size >= limit) {
    const oldest = map.keys().next().value;
    if (oldest !== undefined) map.delete(oldest);
  }
  map.set(key, value);
}

/** One KaTeX run: the rendered string, or why KaTeX refused it. */
function typeset(tex: string, displayMode: boolean): { ok: true; html: string } | { ok: false; message: string } {
  // Trust is refused to every command, as `trust: false` does; KaTeX would then
  // print the command in red, so a refusal fails the build instead.
  const refused: string[] = [];
  const trust = (context: { command: string }): boolean => {
    refused.push(context.command);
    return false;
  };
  typesetCount++;
  let html: string;
  try {
    html = compactKatex(katex().renderToString(tex, { ...OPTIONS, trust, displayMode }));
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    return {
      ok: false,
      message: `KaTeX could not typeset ${JSON.stringify(tex)}: ${reason}. Fix the TeX where it is made (method definition or number formatting).`,
    };
  }
  if (refused.length > 0) {
    return {
      ok: false,
      message: `KaTeX was asked to trust ${refused.join(", ")} in ${JSON.stringify(tex)}; the site typesets no links, files or HTML from TeX.`,
    };
  }
  return { ok: true, html };
}

function typesetOrThrow(tex: string, displayMode: boolean): string {
  const out = typeset(tex, displayMode);
  if (!out.ok) throw new Error(out.message);
  return out.html;
}

/** Decides whether the shape of `tex` can be spliced, given KaTeX's output for `tex` itself. */
function learnShape(skeleton: string, runs: readonly string[], html: string, displayMode: boolean): Shape {
  const typesetSkeleton = typeset(skeleton, displayMode);
  if (!typesetSkeleton.ok) return { kind: "direct", reason: "the skeleton does not typeset" };
  const template = templateOf(typesetSkeleton.html, runs.length);
  if (!template.ok) return { kind: "direct", reason: template.reason };
  if (splice(template.value, runs) !== html) return { kind: "direct", reason: "the splice differs from the equation typeset directly" };
  const probe = typeset(probeTex(skeleton, "1"), displayMode);
  if (!probe.ok || splice(template.value, runs.map(() => "1")) !== probe.html) {
    return { kind: "direct", reason: "the layout depends on how many digits a number has" };
  }
  return { kind: "splice", template: template.value };
}

/**
 * One typeset equation: the template of its shape with this equation's
 * numbers (put together by `splice`), or the whole string where the shape is
 * new or cannot be spliced. Either gives the same bytes as renderTex.
 */
export type TypesetEquation =
  | { readonly kind: "splice"; readonly template: SpliceTemplate; readonly runs: readonly string[] }
  | { readonly kind: "whole"; readonly html: string };

export function typesetEquation(tex: string, displayMode = false): TypesetEquation {
  const { skeleton, runs } = texSkeleton(tex);
  const key = (displayMode ? "D" : "I") + skeleton;
  const shape = shapes.get(key);
  if (shape !== undefined) {
    if (shape.kind === "splice") return { kind: "splice", template: shape.template, runs };
    const memoKey = (displayMode ? "D" : "I") + tex;
    const hit = directMemo.get(memoKey);
    if (hit !== undefined) return { kind: "whole", html: hit };
    const html = typesetOrThrow(tex, displayMode);
    remember(directMemo, DIRECT_MEMO_LIMIT, memoKey, html);
    return { kind: "whole", html };
  }
  // A new shape: the equation itself first, so that bad TeX fails with its own message.
  const html = typesetOrThrow(tex, displayMode);
  const shapeOf: Shape = runs.length === 0 ? { kind: "splice", template: { pieces: [html], slots: [] } } : learnShape(skeleton, runs, html, displayMode);
  remember(shapes, SHAPE_LIMIT, key, shapeOf);
  if (shapeOf.kind === "direct") remember(directMemo, DIRECT_MEMO_LIMIT, (displayMode ? "D" : "I") + tex, html);
  else learned.add(key);
  return { kind: "whole", html };
}

export function renderTex(tex: string, displayMode = false): string {
  const t = typesetEquation(tex, displayMode);
  return t.kind === "whole" ? t.html : splice(t.template, t.runs);
}

const encodedPieces = new WeakMap<SpliceTemplate, readonly Buffer[]>();

/** The pieces of a template as UTF-8, encoded once per template. */
export function encodedPiecesOf(template: SpliceTemplate): readonly Buffer[] {
  let out = encodedPieces.get(template);
  if (out === undefined) {
    out = template.pieces.map((p) => Buffer.from(p, "utf8"));
    encodedPieces.set(template, out);
  }
  return out;
}

/**
 * A shape that can be spliced, as kept between runs: its key (display mode
 * and skeleton) and its template. Plain data, for JSON and for worker messages.
 */
export interface KeptShape {
  readonly key: string;
  readonly pieces: readonly string[];
  readonly slots: readonly number[];
}

function keptShape(key: string, template: SpliceTemplate): KeptShape {
  return { key, pieces: template.pieces, slots: template.slots };
}

/** Every shape this thread can splice. */
export function exportShapes(): KeptShape[] {
  const out: KeptShape[] = [];
  for (const [key, shape] of shapes) if (shape.kind === "splice") out.push(keptShape(key, shape.template));
  return out;
}

/**
 * The shapes learned on this thread since the last call (typeset and checked
 * here, not imported), so that another thread can import them.
 */
export function takeLearnedShapes(): KeptShape[] {
  const out: KeptShape[] = [];
  for (const key of learned) {
    const shape = shapes.get(key);
    if (shape?.kind === "splice") out.push(keptShape(key, shape.template));
  }
  learned.clear();
  return out;
}

/**
 * Adds shapes that another run or thread of this same code and typesetter
 * learned (see typesetterId); shapes known already are left as they are.
 * Each is checked for form (as many slots as pieces less one, every slot a
 * marker index its skeleton has); returns how many were added.
 */
export function importShapes(kept: readonly KeptShape[]): number {
  let added = 0;
  for (const k of kept) {
    if (shapes.has(k.key) || !wellFormed(k)) continue;
    remember(shapes, SHAPE_LIMIT, k.key, { kind: "splice", template: { pieces: [...k.pieces], slots: [...k.slots] } });
    added++;
  }
  return added;
}

function wellFormed(k: KeptShape): boolean {
  if (typeof k.key !== "string" || (k.key[0] !== "D" && k.key[0] !== "I")) return false;
  if (!Array.isArray(k.pieces) || !Array.isArray(k.slots) || k.pieces.length !== k.slots.length + 1) return false;
  if (!k.pieces.every((p) => typeof p === "string")) return false;
  // the skeleton's own numbers are its markers: an equation of this shape has as many
  const markers = texSkeleton(k.key.slice(1)).runs.length;
  return k.slots.every((i) => Number.isInteger(i) && i >= 0 && i < markers);
}

/** How many times KaTeX itself ran since the process started (three times for each new shape with numbers). */
export function katexTypesetCount(): number {
  return typesetCount;
}

export interface KatexCacheStats {
  /** KaTeX runs since the process started. */
  readonly typesets: number;
  /** Shapes spliced from one typeset skeleton. */
  readonly splicedShapes: number;
  /** Shapes typeset directly each time, with the reason. */
  readonly directShapes: readonly { readonly skeleton: string; readonly displayMode: boolean; readonly reason: string }[];
  /** Whole rendered strings held for direct shapes. */
  readonly memoEntries: number;
}

export function katexCacheStats(): KatexCacheStats {
  let splicedShapes = 0;
  const directShapes: { skeleton: string; displayMode: boolean; reason: string }[] = [];
  for (const [key, shape] of shapes) {
    if (shape.kind === "splice") splicedShapes++;
    else directShapes.push({ skeleton: key.slice(1), displayMode: key[0] === "D", reason: shape.reason });
  }
  return { typesets: typesetCount, splicedShapes, directShapes, memoEntries: directMemo.size };
}
