import type { Location } from "./types.js";

/** Turns offsets into a text (UTF-16 code units) into 1-based line and column (columns count code points). */
export class LineIndex {
  private readonly starts: number[] = [0];
  /** Low surrogates before each offset, when the text has any: columns then count code points in O(1). */
  private readonly lowSurrogates?: Uint32Array;

  constructor(private readonly text: string) {
    for (let i = 0; i < text.length; i++) {
      const c = text.charCodeAt(i);
      if (c === 10) this.starts.push(i + 1);
      else if (c === 13 && text.charCodeAt(i + 1) !== 10) this.starts.push(i + 1);
    }
    if (/[\udc00-\udfff]/.test(text)) {
      const counts = new Uint32Array(text.length + 1);
      for (let i = 0; i < text.length; i++) {
        const c = text.charCodeAt(i);
        counts[i + 1] = counts[i] + (c >= 0xdc00 && c <= 0xdfff ? 1 : 0);
      }
      this.lowSurrogates = counts;
    }
  }

  get lineCount(): number {
    return this.starts.length;
  }

  /** Offset of the first character of a 1-based line. */
  lineStart(line: number): number {
    return this.starts[Math.min(Math.max(line, 1), this.starts.length) - 1];
  }

  /** The text of a 1-based line, without its line break. */
  lineText(line: number): string {
    const start = this.lineStart(line);
    const end = line < this.starts.length ? this.starts[line] : this.text.length;
    return this.text.slice(start, end).replace(/\r?\n$|\r$/, "");
  }

  locate(offset: number): Location {
    const o = Math.min(Math.max(offset, 0), this.text.length);
    let lo = 0;
    let hi = this.starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.starts[mid] <= o) lo = mid;
      else hi = mid - 1;
    }
    const start = this.starts[lo];
    // the low half of a surrogate pair adds no column
    const pairs = this.lowSurrogates ? this.lowSurrogates[o] - this.lowSurrogates[start] : 0;
    return { line: lo + 1, column: o - start - pairs + 1 };
  }
}
