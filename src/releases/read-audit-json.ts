import { readFileSync } from "node:fs";
import { STATUSES, type AuditReport } from "../audit/types.js";
import { fail, issue, ok, type Issue, type Result } from "../problem.js";

/**
 * Reads an audit saved by `steelyard check --json` and checks its shape
 * before anything uses it: a wrong or foreign JSON file gives problems with
 * the path of each bad field, never a crash. Every problem is collected (up to
 * MAX_ISSUES, then a count of the rest).
 *
 * JSON has no Infinity or NaN: JSON.stringify writes them as null, so the
 * comparison numbers that may be non-finite (z, ratio, difference) accept null.
 */
export const MAX_ISSUES = 25;

type Json = unknown;

class Checker {
  readonly issues: Issue[] = [];
  private extra = 0;

  constructor(private readonly source: string) {}

  add(path: string, message: string, hint?: string): void {
    if (this.issues.length >= MAX_ISSUES) {
      this.extra++;
      return;
    }
    this.issues.push(issue("not-an-audit", `${this.source}: ${path || "the file"} ${message}`, hint, path));
  }

  finish(): Issue[] {
    if (this.extra > 0) {
      this.issues.push(issue("not-an-audit", `${this.source}: ${this.extra} more problem${this.extra === 1 ? "" : "s"} not listed`, undefined, ""));
    }
    return this.issues;
  }

  object(v: Json, path: string): v is Record<string, Json> {
    if (v !== null && typeof v === "object" && !Array.isArray(v)) return true;
    this.add(path, `should be an object, found ${describe(v)}`);
    return false;
  }

  array(v: Json, path: string): v is Json[] {
    if (Array.isArray(v)) return true;
    this.add(path, `should be a list, found ${describe(v)}`);
    return false;
  }

  string(o: Record<string, Json>, key: string, path: string, optional = false): void {
    const v = o[key];
    if (v === undefined && optional) return;
    if (typeof v !== "string") this.add(join(path, key), `should be a text, found ${describe(v)}`);
  }

  number(o: Record<string, Json>, key: string, path: string, nullable = false): void {
    const v = o[key];
    if (v === null && nullable) return;
    if (typeof v !== "number") this.add(join(path, key), `should be a number, found ${describe(v)}`);
  }

  boolean(o: Record<string, Json>, key: string, path: string): void {
    if (typeof o[key] !== "boolean") this.add(join(path, key), `should be true or false, found ${describe(o[key])}`);
  }

  status(o: Record<string, Json>, key: string, path: string): void {
    const v = o[key];
    if (typeof v !== "string" || !(STATUSES as readonly string[]).includes(v)) {
      this.add(join(path, key), `should be one of ${STATUSES.join(", ")}, found ${describe(v)}`);
    }
  }

  stringList(o: Record<string, Json>, key: string, path: string): void {
    const v = o[key];
    const p = join(path, key);
    if (!this.array(v, p)) return;
    v.forEach((x, i) => {
      if (typeof x !== "string") this.add(`${p}[${i}]`, `should be a text, found ${describe(x)}`);
    });
  }
}

function join(path: string, key: string): string {
  return path ? `${path}.${key}` : key;
}

function describe(v: Json): string {
  if (v === undefined) return "nothing";
  if (v === null) return "null";
  if (Array.isArray(v)) return "a list";
  if (typeof v === "object") return "an object";
  if (typeof v === "string") return `the text ${JSON.stringify(v.length > 40 ? v.slice(0, 40) + "…" : v)}`;
  return `${typeof v} ${String(v)}`;
}

function checkResult(c: Checker, r: Json, path: string): void {
  if (!c.object(r, path)) return;
  c.string(r, "name", path);
  for (const k of ["value_si", "sigma_si", "sigma_plus_si", "sigma_minus_si", "value", "sigma"]) c.number(r, k, path);
  for (const k of ["unit_si", "display_unit", "display_unit_latex"]) c.string(r, k, path);
  c.array(r.budget, join(path, "budget"));
}

function checkComparison(c: Checker, x: Json, path: string): void {
  if (!c.object(x, path)) return;
  c.string(x, "result", path);
  c.string(x, "published_text", path);
  c.string(x, "published_unit", path);
  for (const k of ["published_value", "published_plus", "published_minus", "published_si", "published_plus_si", "published_minus_si", "sigma_used_si"]) {
    c.number(x, k, path);
  }
  for (const k of ["difference_si", "ratio", "z"]) c.number(x, k, path, true);
  c.status(x, "status", path);
}

function checkRecordMap(c: Checker, v: Json, path: string, each: (c: Checker, x: Json, p: string) => void): void {
  if (!c.object(v, path)) return;
  for (const k of Object.keys(v).sort()) each(c, v[k], `${path}.${k}`);
}

function checkMeasurement(c: Checker, m: Json, path: string): void {
  if (!c.object(m, path)) return;
  c.string(m, "key", path);
  c.string(m, "method", path);
  c.status(m, "status", path);
  c.boolean(m, "use", path);
  c.string(m, "comment", path, true);
  if (c.object(m.reference, join(path, "reference"))) c.string(m.reference, "cite", join(path, "reference"));
  c.object(m.inputs, join(path, "inputs"));
  c.stringList(m, "assumptions", path);
  checkRecordMap(c, m.results, join(path, "results"), checkResult);
  checkRecordMap(c, m.comparisons, join(path, "comparisons"), checkComparison);
  c.array(m.equations, join(path, "equations"));
  c.number(m, "seed", path);
}

function checkObject(c: Checker, o: Json, path: string): void {
  if (!c.object(o, path)) return;
  c.string(o, "id", path);
  c.string(o, "name", path);
  c.string(o, "file", path);
  c.stringList(o, "aliases", path);
  c.string(o, "notes", path, true);
  c.status(o, "status", path);
  const ms = o.measurements;
  if (c.array(ms, join(path, "measurements"))) ms.forEach((m, i) => checkMeasurement(c, m, `${path}.measurements[${i}]`));
}

/** Checks the shape of a parsed audit; `source` names it in messages. */
export function checkAuditShape(value: Json, source: string): Result<AuditReport> {
  const c = new Checker(source);
  if (!c.object(value, "")) return fail(...c.finish());
  const tool = value.tool;
  if (c.object(tool, "tool")) {
    if (tool.name !== "steelyard") {
      c.add("tool.name", `should be "steelyard", found ${describe(tool.name)}`, "this JSON was not written by steelyard check --json");
    }
    c.string(tool, "version", "tool");
  } else {
    return fail(...c.finish());
  }
  if (c.object(value.settings, "settings")) {
    const s = value.settings;
    if (c.object(s.thresholds, "settings.thresholds")) {
      c.number(s.thresholds, "tension", "settings.thresholds");
      c.number(s.thresholds, "discrepant", "settings.thresholds");
    }
    c.number(s, "draws", "settings");
    c.string(s, "constants", "settings");
  }
  if (c.object(value.summary, "summary")) {
    for (const k of ["files", "files_audited", "files_with_problems", "objects", "measurements"]) c.number(value.summary, k, "summary");
    if (c.object(value.summary.status_counts, "summary.status_counts")) {
      for (const s of STATUSES) c.number(value.summary.status_counts, s, "summary.status_counts");
    }
  }
  const objects = value.objects;
  if (c.array(objects, "objects")) {
    const seen = new Set<string>();
    objects.forEach((o, i) => {
      checkObject(c, o, `objects[${i}]`);
      const id = (o as { id?: unknown } | null)?.id;
      if (typeof id === "string") {
        if (seen.has(id)) c.add(`objects[${i}].id`, `repeats the id ${JSON.stringify(id)}`);
        seen.add(id);
      }
    });
  }
  c.array(value.problems, "problems");
  const issues = c.finish();
  return issues.length > 0 ? fail(...issues) : ok(value as unknown as AuditReport);
}

/** Parses audit JSON text; `source` names it in messages. */
export function parseAuditJson(text: string, source: string): Result<AuditReport> {
  let value: Json;
  try {
    value = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (e) {
    const reason = e instanceof Error ? e.message : String(e);
    return fail(issue("not-json", `${source} is not valid JSON: ${reason}`, "give the file written by steelyard check --json"));
  }
  return checkAuditShape(value, source);
}

/** Reads and checks an audit JSON file. */
export function readAuditJson(path: string): Result<AuditReport> {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const reason = code === "ENOENT" ? "there is no such file" : code === "EISDIR" ? "it is a folder" : e instanceof Error ? e.message : String(e);
    return fail(issue("cannot-read", `cannot read ${path}: ${reason}`, "check the path of the saved audit (steelyard check --json > audit.json)"));
  }
  return parseAuditJson(text, path);
}
