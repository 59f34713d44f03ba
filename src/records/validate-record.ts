import { childPath, itemPath } from "./field-path.js";
import { slugField, textField, textListField } from "./field-checks.js";
import { OBJECT_FIELDS } from "./record-fields.js";
import { describeValue, has, isMapping, type RecordContext } from "./record-context.js";
import { WHOLE_FILE } from "./problem-list.js";
import { isSlug, slugify } from "./slug.js";
import type { Location, MeasurementRecord, ObjectRecord } from "./types.js";
import { validateMeasurement } from "./validate-measurement.js";

export interface RecordOutcome {
  readonly record?: ObjectRecord;
  /** Where the id is written, or the whole file when it comes from the file name. */
  readonly idLocation: Location;
}

/** The file name without folders and without its .yaml / .yml ending. */
export function fileStem(file: string): string {
  const base = file.split(/[\\/]/).pop() ?? file;
  return base.replace(/\.ya?ml$/i, "");
}

/**
 * Validates one object. Top-level errors drop the whole object; a measurement
 * with errors is dropped alone; warnings drop nothing.
 */
export function validateRecord(ctx: RecordContext, value: unknown, file: string): RecordOutcome {
  if (!isMapping(value)) {
    ctx.error("not-a-mapping", "", `the file must hold one mapping of fields (name, measurements, ...), found ${describeValue(value)}`, "start the file with a line such as: name: Ferrow 7 AB");
    return { idLocation: WHOLE_FILE };
  }
  const mark = ctx.problems.mark;
  ctx.unknownFields(value, "", OBJECT_FIELDS, "an object");

  const name = textField(ctx, value, "", "name", { required: true, example: "name: Ferrow 7 AB" });

  let id: string | undefined;
  let idLocation: Location = WHOLE_FILE;
  if (has(value, "id")) {
    idLocation = ctx.valueAt("id");
    id = slugField(ctx, value, "", "id");
  } else {
    const stem = fileStem(file);
    if (isSlug(stem)) id = stem;
    else {
      const suggestion = slugify(stem) || slugify(name ?? "") || "my-object";
      ctx.add({
        code: "bad-id",
        path: "id",
        location: WHOLE_FILE,
        message: `the file name '${stem}' cannot serve as the object's id: ids hold only lower-case letters, digits and '-'`,
        hint: `add a line 'id: ${suggestion}' or rename the file to ${suggestion}.yaml`,
      });
    }
  }

  const aliases = textListField(ctx, value, "", "aliases");
  const notes = textField(ctx, value, "", "notes");

  const measurements: MeasurementRecord[] = [];
  if (!has(value, "measurements")) {
    ctx.missing("", "measurements", "add measurements: with at least one entry (key, method, reference, inputs)");
  } else if (!Array.isArray(value.measurements)) {
    ctx.error("wrong-type", "measurements", `'measurements' must be a list, found ${describeValue(value.measurements)}`, "start each measurement with '- key: ...' under 'measurements:'");
  } else if (value.measurements.length === 0) {
    ctx.error("no-measurements", "measurements", "'measurements' is empty; an object needs at least one", "add a measurement, or delete the file");
  }
  const topLevelFailed = ctx.problems.errorsSince(mark);

  if (Array.isArray(value.measurements)) {
    const seen = new Map<string, number>();
    value.measurements.forEach((raw: unknown, i: number) => {
      const path = itemPath("measurements", i);
      const outcome = validateMeasurement(ctx, raw, path);
      if (outcome.key === undefined) return;
      const first = seen.get(outcome.key);
      if (first !== undefined) {
        ctx.error("duplicate-measurement-key", childPath(path, "key"),
          `measurement key '${outcome.key}' is already used by measurements[${first}]`, "give every measurement of an object its own key");
        return;
      }
      seen.set(outcome.key, i);
      if (outcome.measurement) measurements.push(outcome.measurement);
    });
  }

  if (topLevelFailed || name === undefined || id === undefined || measurements.length === 0) return { idLocation };
  const record: { -readonly [K in keyof ObjectRecord]: ObjectRecord[K] } = { id, name, file, aliases, measurements };
  if (notes !== undefined) record.notes = notes;
  return { record, idLocation };
}
