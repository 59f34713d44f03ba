/**
 * Expected failures are values, never exceptions.
 *
 * An `Issue` is what a parser or a method says is wrong with one value; the
 * record loader turns it into a `Problem` by adding where it was found.
 */
export type Severity = "error" | "warning";

export interface Issue {
  /** Stable machine-readable code, kebab-case, e.g. "unknown-unit". */
  readonly code: string;
  /** What is wrong, in plain words. */
  readonly message: string;
  /** How to fix it. */
  readonly hint?: string;
  /** Defaults to "error". */
  readonly severity?: Severity;
  /** Field path relative to the value being checked, e.g. "inputs.period". */
  readonly path?: string;
}

export interface Problem {
  readonly code: string;
  readonly severity: Severity;
  /** File path relative to the records folder, with forward slashes. */
  readonly file: string;
  /** 1-based; 0 when the problem concerns the whole file. */
  readonly line: number;
  /** 1-based; 0 when unknown. */
  readonly column: number;
  /** Dotted field path, e.g. "measurements[0].inputs.period"; "" for the file itself. */
  readonly path: string;
  readonly message: string;
  readonly hint?: string;
}

export type Result<T> =
  | { readonly ok: true; readonly value: T; readonly warnings?: readonly Issue[] }
  | { readonly ok: false; readonly issues: readonly Issue[] };

export function ok<T>(value: T, warnings?: readonly Issue[]): Result<T> {
  return warnings && warnings.length > 0 ? { ok: true, value, warnings } : { ok: true, value };
}

export function fail<T = never>(...issues: Issue[]): Result<T> {
  return { ok: false, issues };
}

export function issue(code: string, message: string, hint?: string, path?: string): Issue {
  const out: { code: string; message: string; hint?: string; path?: string } = { code, message };
  if (hint !== undefined) out.hint = hint;
  if (path !== undefined) out.path = path;
  return out;
}
