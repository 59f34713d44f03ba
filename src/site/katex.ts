import katex from "katex";
import { probeTex, splice, templateOf, texSkeleton, type SpliceTemplate } from "./tex-skeleton.js";

/**
 * The one place that calls KaTeX. It only ever receives TeX that steelyard
 * wrote itself (method equations, numbers from latexNumber, unit LaTeX from
 * the unit catalogue), never record text. Bad TeX is a programmer mistake:
 * it fails the build instead of shipping red text.
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
    html = katex.renderToString(tex, { ...OPTIONS, trust, displayMode });
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
  const learned: Shape = runs.length === 0 ? { kind: "splice", template: { pieces: [html], slots: [] } } : learnShape(skeleton, runs, html, displayMode);
  remember(shapes, SHAPE_LIMIT, key, learned);
  if (learned.kind === "direct") remember(directMemo, DIRECT_MEMO_LIMIT, (displayMode ? "D" : "I") + tex, html);
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
