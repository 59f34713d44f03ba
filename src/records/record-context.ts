import type { Location } from "./types.js";
import type { PositionEntry } from "./yaml-document.js";
import { didYouMean } from "./suggest.js";
import { childPath, parentPath } from "./field-path.js";
import { ProblemList, type NewProblem } from "./problem-list.js";

/** What every check needs: where to put problems and where each field sits in the file. */
export class RecordContext {
  constructor(
    readonly problems: ProblemList,
    private readonly positions: ReadonlyMap<string, PositionEntry>,
  ) {}

  /** Where a value starts; for a field that is absent, where its nearest enclosing value starts. */
  valueAt(path: string): Location {
    for (let p = path; ; p = parentPath(p)) {
      const entry = this.positions.get(p);
      if (entry) return entry.value;
      if (p === "") return { line: 1, column: 1 };
    }
  }

  /** Where a key is written (the value itself for list items and the top level). */
  keyAt(path: string): Location {
    return this.positions.get(path)?.key ?? this.valueAt(path);
  }

  add(p: NewProblem): void {
    this.problems.add(p);
  }

  /** Error at the value of `path`. */
  error(code: string, path: string, message: string, hint?: string): void {
    this.add({ code, path, location: this.valueAt(path), message, ...(hint !== undefined ? { hint } : {}) });
  }

  /** Warnings for fields that are not in `known`, at their keys. */
  unknownFields(value: Readonly<Record<string, unknown>>, path: string, known: readonly string[], where: string): void {
    for (const key of Object.keys(value)) {
      if (known.includes(key)) continue;
      const at = childPath(path, key);
      this.add({
        code: "unknown-field",
        severity: "warning",
        path: at,
        location: this.keyAt(at),
        message: `unknown field '${key}'${didYouMean(key, known)}`,
        hint: `${where} may have: ${known.join(", ")}; an unknown field is ignored`,
      });
    }
  }

  /** An error for a required field that is absent, at the mapping that should hold it. */
  missing(path: string, field: string, hint: string): void {
    const at = childPath(path, field);
    this.add({ code: "missing-field", path: at, location: this.valueAt(path), message: `missing required field '${field}'`, hint });
  }
}

export function isMapping(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === "object" && !Array.isArray(v);
}

export function has(o: Readonly<Record<string, unknown>>, key: string): boolean {
  return Object.prototype.hasOwnProperty.call(o, key);
}

/** The kind of a YAML value in plain words, for "expected text, found a list". */
export function describeValue(v: unknown): string {
  if (v === null || v === undefined) return "nothing (an empty value)";
  if (Array.isArray(v)) return "a list";
  if (typeof v === "object") return "a mapping";
  if (typeof v === "number") return `the number ${String(v)}`;
  if (typeof v === "boolean") return `the boolean ${String(v)}`;
  if (typeof v === "string") return "text";
  return typeof v;
}
