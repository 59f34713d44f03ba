import type { Issue } from "../../src/problem.js";

/** "code@path" for each issue, in order: compact to compare. */
export function codes(issues: readonly Issue[]): string[] {
  return issues.map((i) => `${i.code}@${i.path ?? ""}`);
}

export function relErr(a: number, b: number): number {
  return Math.abs(a - b) / Math.abs(b);
}
