import type { Problem, Severity } from "../problem.js";
import type { Location } from "./types.js";

export interface NewProblem {
  readonly code: string;
  readonly severity?: Severity;
  readonly path: string;
  readonly location: Location;
  readonly message: string;
  readonly hint?: string;
}

/** Collects the problems of one file; every check adds to it and none stops at the first. */
export class ProblemList {
  readonly items: Problem[] = [];

  constructor(readonly file: string) {}

  add(p: NewProblem): void {
    const out: { -readonly [K in keyof Problem]: Problem[K] } = {
      code: p.code,
      severity: p.severity ?? "error",
      file: this.file,
      line: p.location.line,
      column: p.location.column,
      path: p.path,
      message: p.message,
    };
    if (p.hint !== undefined && p.hint !== "") out.hint = p.hint;
    this.items.push(out);
  }

  /** Number of problems so far, to ask later whether a part of the record added errors. */
  get mark(): number {
    return this.items.length;
  }

  errorsSince(mark: number): boolean {
    for (let i = mark; i < this.items.length; i++) if (this.items[i].severity === "error") return true;
    return false;
  }
}

/** The whole file: line 0, column 0. */
export const WHOLE_FILE: Location = Object.freeze({ line: 0, column: 0 });

/** Sort order of problems: file, line, column, code, then path and message so that the order is total. */
export function compareProblems(a: Problem, b: Problem): number {
  return (
    compareText(a.file, b.file) ||
    a.line - b.line ||
    a.column - b.column ||
    compareText(a.code, b.code) ||
    compareText(a.path, b.path) ||
    compareText(a.message, b.message)
  );
}

/** Plain code-unit order, the same on every machine and locale. */
export function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
