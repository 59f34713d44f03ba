import type { Issue } from "../problem.js";
import type { MethodDefinition, MethodInput, SIInputs } from "../methods/method.js";
import { getMethod, METHOD_IDS } from "../methods/index.js";
import { parseQuantity } from "../quantity/parse.js";
import type { Quantity } from "../quantity/quantity.js";
import { checkDimension } from "../units/parse.js";
import { computeSI } from "../quantity/compute-si.js";
import {
  ANGLE,
  describeDimension,
  GRAVITATIONAL_PARAMETER,
  LENGTH,
  MASS,
  sameDimension,
  TIME,
  VELOCITY,
  type Dimension,
} from "../units/dimension.js";
import { childPath } from "./field-path.js";
import { booleanField, slugField, textField } from "./field-checks.js";
import { MEASUREMENT_FIELDS } from "./record-fields.js";
import { describeValue, has, isMapping, type RecordContext } from "./record-context.js";
import { didYouMean } from "./suggest.js";
import type { MeasurementRecord, PublishedValue, SlotInput } from "./types.js";
import { validateReference } from "./validate-reference.js";

/**
 * Input fields not known to the method are errors, not warnings: the value
 * would otherwise be silently left out of the computation, and a misspelt
 * "inclination" would quietly become sin i = 1.
 *
 * An uncertainty larger than its value, on an input that cannot be negative
 * (period, distance, parallax, semi-amplitude, a size or a mass), is a warning
 * ("uncertainty-exceeds-value"): such numbers are published (a faint parallax
 * of 0.4 ± 0.6 mas), so the measurement stays, but its 1σ interval reaches
 * below zero and first-order propagation says little about it.
 */

/** Angle fields that give an orientation (they may be near zero with a larger uncertainty) rather than a size. */
const ORIENTATION = /inclination|node|periastron|omega|position_angle/;

const POSITIVE_DIMENSIONS: readonly Dimension[] = [TIME, LENGTH, VELOCITY, MASS, GRAVITATIONAL_PARAMETER];

export function isPositiveDefinite(slot: MethodInput): boolean {
  if (POSITIVE_DIMENSIONS.some((d) => sameDimension(d, slot.dimension))) return true;
  return sameDimension(ANGLE, slot.dimension) && !ORIENTATION.test(slot.field);
}

/** A mass may be typed as a mass or as its gravitational parameter GM (km3/s2, m3/s2). */
function fitsDimension(expected: Dimension, found: Dimension): boolean {
  return sameDimension(expected, found) || (sameDimension(expected, MASS) && sameDimension(found, GRAVITATIONAL_PARAMETER));
}

/** SI value of a slot as a method sees it: GM (m³ s⁻²) for masses, value × scale otherwise. */
export function slotSI(q: Quantity): number {
  return computeSI(q).value;
}

/** Adds issues from a parser or a method, each located at `path` plus the issue's own path when the file has it. */
function addIssues(ctx: RecordContext, issues: readonly Issue[], path: string): void {
  for (const i of issues) {
    const at = i.path ? childPath(path, i.path) : path;
    ctx.add({
      code: i.code,
      severity: i.severity ?? "error",
      path: at,
      location: ctx.valueAt(at),
      message: i.message,
      ...(i.hint !== undefined ? { hint: i.hint } : {}),
    });
  }
}

/**
 * Parses one quantity and applies the checks common to inputs and published
 * values. Returns undefined (with its problems added) when it is unusable.
 */
function readQuantity(ctx: RecordContext, raw: unknown, path: string, field: string, allowLimits: boolean): Quantity | undefined {
  const parsed = parseQuantity(raw, { allowLimits, field });
  if (!parsed.ok) {
    addIssues(ctx, parsed.issues, path);
    return undefined;
  }
  if (parsed.warnings) addIssues(ctx, parsed.warnings.map((w) => ({ ...w, severity: w.severity ?? "warning" })), path);
  const q = parsed.value;
  if (!Number.isFinite(q.value) || !Number.isFinite(q.plus) || !Number.isFinite(q.minus)) {
    ctx.error("non-finite-number", path, `'${field}' is not a finite number (${q.text})`, "check the exponent: the value overflows");
    return undefined;
  }
  if (q.plus < 0 || q.minus < 0) {
    ctx.error("negative-uncertainty", path, `'${field}' has a negative uncertainty (${q.text})`, "uncertainties are positive; write the downward one as '-0.2' after '+0.3', or one '±' for both");
    return undefined;
  }
  if (!allowLimits && (q.kind === "upper-limit" || q.kind === "lower-limit")) {
    ctx.error("limit-not-allowed", path, `'${field}' is a limit (${q.text}); an input must be a value`, "limits may appear only among published results");
    return undefined;
  }
  return q;
}

function methodHint(): string {
  return `known methods: ${METHOD_IDS.join(", ")}`;
}

export interface MeasurementOutcome {
  readonly measurement?: MeasurementRecord;
  /** The key as written, when it is a valid slug (for the duplicate check). */
  readonly key?: string;
}

/** Validates `measurements[index]`; returns the measurement only when it has no errors. */
export function validateMeasurement(ctx: RecordContext, raw: unknown, path: string): MeasurementOutcome {
  if (!isMapping(raw)) {
    ctx.error("wrong-type", path, `each measurement must be a mapping (key, method, reference, inputs...), found ${describeValue(raw)}`, "indent the measurement's fields under its '-'");
    return {};
  }
  const mark = ctx.problems.mark;
  ctx.unknownFields(raw, path, MEASUREMENT_FIELDS, "a measurement");

  const key = slugField(ctx, raw, path, "key", { required: true, example: "key: orbit-2021" });
  const methodId = textField(ctx, raw, path, "method", { required: true, example: `method: ${METHOD_IDS[0] ?? "relative-orbit"}` });
  let method: MethodDefinition | undefined;
  if (methodId !== undefined) {
    method = getMethod(methodId);
    if (!method) {
      ctx.error("unknown-method", childPath(path, "method"), `unknown method '${methodId}'${didYouMean(methodId, METHOD_IDS)}`, methodHint());
    }
  }

  let reference;
  if (has(raw, "reference")) reference = validateReference(ctx, raw.reference, childPath(path, "reference"));
  else ctx.missing(path, "reference", 'add reference: { cite: "Author & Author 2021, Journal 14, 233" }');

  const use = booleanField(ctx, raw, path, "use");
  const comment = textField(ctx, raw, path, "comment");

  const inputs = readInputs(ctx, raw, path, method);
  const published = readPublished(ctx, raw, path, method);

  if (ctx.problems.errorsSince(mark) || key === undefined || !method || !reference || !inputs || !published) return key ? { key } : {};
  const out: { -readonly [K in keyof MeasurementRecord]: MeasurementRecord[K] } = {
    key,
    method: method.id,
    reference,
    inputs,
    published,
    use: use ?? true,
    location: ctx.valueAt(path),
  };
  if (comment !== undefined) out.comment = comment;
  return { measurement: out, key };
}

function readInputs(ctx: RecordContext, raw: Readonly<Record<string, unknown>>, path: string, method: MethodDefinition | undefined): Record<string, SlotInput> | undefined {
  const at = childPath(path, "inputs");
  if (!has(raw, "inputs")) {
    ctx.missing(path, "inputs", "add inputs: with the measured quantities the method needs, e.g. period: 12.3 ± 0.1 yr");
    return undefined;
  }
  const inputs = raw.inputs;
  if (!isMapping(inputs)) {
    ctx.error("wrong-type", at, `'inputs' must be a mapping of field: quantity, found ${describeValue(inputs)}`, "write each input on its own line, e.g. period: 12.3 ± 0.1 yr");
    return undefined;
  }
  const mark = ctx.problems.mark;
  const fields = method ? [...new Set(method.inputs.map((s) => s.field))] : [];
  const bySlot: Record<string, SlotInput> = {};
  const failed = new Set<string>();

  for (const field of Object.keys(inputs)) {
    const fieldPath = childPath(at, field);
    const slots = method ? method.inputs.filter((s) => s.field === field) : [];
    if (method && slots.length === 0) {
      ctx.add({
        code: "unknown-input",
        path: fieldPath,
        location: ctx.keyAt(fieldPath),
        message: `unknown input '${field}' for method '${method.id}'${didYouMean(field, fields)}`,
        hint: `'${method.id}' takes: ${fields.join(", ")}; an unknown input would be ignored, so it is refused`,
      });
      failed.add(field);
      continue;
    }
    const q = readQuantity(ctx, inputs[field], fieldPath, field, false);
    if (!q) {
      failed.add(field);
      continue;
    }
    if (!method) continue;
    const slot = slots.find((s) => fitsDimension(s.dimension, q.unit.dimension));
    if (!slot) {
      const expected = slots.map((s) => s.dimension);
      const found = checkDimension(q.unit, expected.length === 1 ? expected[0] : expected, `input '${field}'`);
      addIssues(ctx, [found ?? {
        code: "wrong-dimension",
        message: `input '${field}' must be ${expected.map(describeDimension).join(" or ")}, found ${describeDimension(q.unit.dimension)} (${q.unitText})`,
      }], fieldPath);
      failed.add(field);
      continue;
    }
    if (isPositiveDefinite(slot) && q.kind === "measured" && q.value > 0 && q.minus > q.value) {
      ctx.add({
        code: "uncertainty-exceeds-value",
        severity: "warning",
        path: fieldPath,
        location: ctx.valueAt(fieldPath),
        message: `'${field}' has a downward uncertainty larger than its value (${q.text}), but cannot be negative`,
        hint: "check the value and its uncertainty against the paper; first-order propagation means little here",
      });
    }
    bySlot[slot.slot] = { field, slot: slot.slot, quantity: q, location: ctx.valueAt(fieldPath) };
  }

  if (!method) return ctx.problems.errorsSince(mark) ? undefined : {};

  // a field is required when every slot it can fill is required
  const missing = new Set<string>();
  for (const field of fields) {
    const slots = method.inputs.filter((s) => s.field === field);
    if (slots.every((s) => !s.optional) && !has(inputs, field)) {
      missing.add(field);
      ctx.add({
        code: "missing-input",
        path: childPath(at, field),
        location: ctx.valueAt(at),
        message: `method '${method.id}' needs input '${field}'`,
        hint: `add ${field}: with its value, uncertainty and unit`,
      });
    }
  }

  const si: Record<string, number> = {};
  for (const input of method.inputs) {
    const got = bySlot[input.slot];
    if (got) si[input.slot] = slotSI(got.quantity);
  }
  const issues = method.validate(si as SIInputs).filter((i) => {
    const field = i.path ?? "";
    return !failed.has(field) && !missing.has(field);
  });
  addIssues(ctx, issues, at);

  if (ctx.problems.errorsSince(mark)) return undefined;
  // slot order follows the method, not the record, so that output does not depend on key order
  const ordered: Record<string, SlotInput> = {};
  for (const input of method.inputs) if (bySlot[input.slot]) ordered[input.slot] = bySlot[input.slot];
  return ordered;
}

function readPublished(ctx: RecordContext, raw: Readonly<Record<string, unknown>>, path: string, method: MethodDefinition | undefined): Record<string, PublishedValue> | undefined {
  if (!has(raw, "published")) return {};
  const at = childPath(path, "published");
  const published = raw.published;
  if (!isMapping(published)) {
    ctx.error("wrong-type", at, `'published' must be a mapping of result: quantity, found ${describeValue(published)}`, "write each published result on its own line, e.g. total_mass: 2.31 ± 0.05 Msun");
    return undefined;
  }
  const mark = ctx.problems.mark;
  const names = method ? method.results.map((r) => r.name) : [];
  const byName: Record<string, PublishedValue> = {};
  for (const name of Object.keys(published)) {
    const namePath = childPath(at, name);
    const result = method?.results.find((r) => r.name === name);
    if (method && !result) {
      ctx.add({
        code: "unknown-result",
        path: namePath,
        location: ctx.keyAt(namePath),
        message: `method '${method.id}' does not give a result '${name}'${didYouMean(name, names)}`,
        hint: `'${method.id}' gives: ${names.join(", ")}`,
      });
      continue;
    }
    const q = readQuantity(ctx, published[name], namePath, name, true);
    if (!q || !result) continue;
    const wrong = fitsDimension(result.dimension, q.unit.dimension)
      ? undefined
      : checkDimension(q.unit, result.dimension, `published '${name}'`);
    if (wrong) {
      addIssues(ctx, [wrong], namePath);
      continue;
    }
    byName[name] = { result: name, quantity: q, location: ctx.valueAt(namePath) };
  }
  if (ctx.problems.errorsSince(mark)) return undefined;
  const ordered: Record<string, PublishedValue> = {};
  for (const r of method?.results ?? []) if (byName[r.name]) ordered[r.name] = byName[r.name];
  return ordered;
}
