import { childPath, itemPath } from "./field-path.js";
import { describeValue, has, type RecordContext } from "./record-context.js";
import { isSlug, slugify, SLUG_MAX_LENGTH } from "./slug.js";

export interface TextOptions {
  readonly required?: boolean;
  /** How to fill the field in, shown when it is missing. */
  readonly example?: string;
}

/**
 * A text field. Returns the text, or undefined when it is absent or wrong;
 * what is wrong is added to the context's problems.
 */
export function textField(ctx: RecordContext, obj: Readonly<Record<string, unknown>>, path: string, field: string, options: TextOptions = {}): string | undefined {
  const at = childPath(path, field);
  if (!has(obj, field)) {
    if (options.required) ctx.missing(path, field, options.example ? `add a line such as: ${options.example}` : `add '${field}'`);
    return undefined;
  }
  const v = obj[field];
  if (typeof v !== "string") {
    ctx.error("wrong-type", at, `'${field}' must be text, found ${describeValue(v)}`,
      typeof v === "number" || typeof v === "boolean" ? `put the value in quotes: ${field}: "${String(v)}"` : `write '${field}' as text, in quotes if it holds ': ' or ' #'`);
    return undefined;
  }
  if (v.trim() === "") {
    if (options.required) ctx.error("empty-text", at, `'${field}' is empty`, options.example ? `fill it in, e.g. ${options.example}` : undefined);
    else ctx.error("empty-text", at, `'${field}' is empty`, `fill it in or remove the line`);
    return undefined;
  }
  return v;
}

/** A text field that must follow the slug rule (ids and keys). */
export function slugField(ctx: RecordContext, obj: Readonly<Record<string, unknown>>, path: string, field: string, options: TextOptions = {}): string | undefined {
  const at = childPath(path, field);
  if (has(obj, field) && typeof obj[field] === "number" && Number.isInteger(obj[field])) {
    // "key: 2021" is a number to YAML, but a fine slug once quoted
    ctx.error("wrong-type", at, `'${field}' must be text, found ${describeValue(obj[field])}`, `put it in quotes: ${field}: "${String(obj[field])}"`);
    return undefined;
  }
  const v = textField(ctx, obj, path, field, options);
  if (v === undefined) return undefined;
  if (!isSlug(v)) {
    const suggestion = slugify(v);
    ctx.error(
      field === "id" ? "bad-id" : "bad-key",
      at,
      v.length > SLUG_MAX_LENGTH
        ? `'${field}' is longer than ${SLUG_MAX_LENGTH} characters`
        : `'${field}' '${v}' may hold only lower-case letters, digits and '-', starting with a letter or digit`,
      suggestion !== "" ? `for example: ${field}: ${suggestion}` : "use lower-case letters, digits and '-'",
    );
    return undefined;
  }
  return v;
}

export function booleanField(ctx: RecordContext, obj: Readonly<Record<string, unknown>>, path: string, field: string): boolean | undefined {
  if (!has(obj, field)) return undefined;
  const v = obj[field];
  if (typeof v !== "boolean") {
    ctx.error("wrong-type", childPath(path, field), `'${field}' must be true or false, found ${describeValue(v)}`, `write ${field}: true or ${field}: false (without quotes)`);
    return undefined;
  }
  return v;
}

/** A list of non-empty texts (aliases). */
export function textListField(ctx: RecordContext, obj: Readonly<Record<string, unknown>>, path: string, field: string): string[] {
  if (!has(obj, field)) return [];
  const at = childPath(path, field);
  const v = obj[field];
  if (!Array.isArray(v)) {
    ctx.error("wrong-type", at, `'${field}' must be a list of texts, found ${describeValue(v)}`, `write ${field}: ["first", "second"]`);
    return [];
  }
  const out: string[] = [];
  v.forEach((item, i) => {
    if (typeof item !== "string" || item.trim() === "") {
      ctx.error("wrong-type", itemPath(at, i), `each entry of '${field}' must be non-empty text, found ${typeof item === "string" ? "empty text" : describeValue(item)}`, "put the entry in quotes");
    } else out.push(item);
  });
  return out;
}
