import katex from "katex";
import { compactKatex } from "../../../src/site/katex-compact.js";

/**
 * KaTeX's own output for `tex`, compacted as the site compacts every string
 * KaTeX returns (katex-compact.ts): the reference the equation cache must
 * reproduce byte for byte. katex-compact.test.ts checks the compaction
 * itself against KaTeX's raw output and style sheet.
 */
export function katexReference(tex: string, options: katex.KatexOptions): string {
  return compactKatex(katex.renderToString(tex, options));
}
