import katex from "katex";

/**
 * The one place that calls KaTeX. It only ever receives TeX that steelyard
 * wrote itself (method equations, numbers from latexNumber, unit LaTeX from
 * the unit catalogue), never record text. Bad TeX is a programmer mistake:
 * it fails the build instead of shipping red text.
 */
const OPTIONS = {
  throwOnError: true,
  strict: "error",
  output: "htmlAndMathml",
} as const;

/**
 * Rendered strings keyed by display mode and TeX. Generic equations repeat on
 * every page and are typeset once; substituted equations are mostly unique, so
 * the map is bounded and forgets its oldest entries first.
 */
const MEMO_LIMIT = 4096;
const memo = new Map<string, string>();
let typesetCount = 0;

export function renderTex(tex: string, displayMode = false): string {
  const key = (displayMode ? "D" : "I") + tex;
  const hit = memo.get(key);
  if (hit !== undefined) return hit;
  let html: string;
  // Trust is refused to every command, as `trust: false` does; KaTeX would then
  // print the command in red, so a refusal fails the build instead.
  const refused: string[] = [];
  const trust = (context: { command: string }): boolean => {
    refused.push(context.command);
    return false;
  };
  try {
    html = katex.renderToString(tex, { ...OPTIONS, trust, displayMode });
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new Error(`KaTeX could not typeset ${JSON.stringify(tex)}: ${reason}. Fix the TeX where it is made (method definition or number formatting).`);
  }
  if (refused.length > 0) {
    throw new Error(`KaTeX was asked to trust ${refused.join(", ")} in ${JSON.stringify(tex)}; the site typesets no links, files or HTML from TeX.`);
  }
  typesetCount++;
  if (memo.size >= MEMO_LIMIT) {
    const oldest = memo.keys().next().value;
    if (oldest !== undefined) memo.delete(oldest);
  }
  memo.set(key, html);
  return html;
}

/** How many times KaTeX itself ran (memo misses) since the process started. */
export function katexTypesetCount(): number {
  return typesetCount;
}
