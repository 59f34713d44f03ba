import type { Reference } from "../audit/types.js";
import { childPath } from "./field-path.js";
import { textField } from "./field-checks.js";
import { REFERENCE_FIELDS } from "./record-fields.js";
import { describeValue, isMapping, type RecordContext } from "./record-context.js";

/** A DOI as the DOI Handbook (ISO 26324) writes it: the "10." directory prefix, a registrant code, "/", a suffix. */
export const DOI_PATTERN = /^10\.\d{4,9}(?:\.\d+)*\/\S+$/;

/** Bibliographic codes are 19 characters long (year, journal, volume, page and initial, padded with dots). */
export const BIBCODE_LENGTH = 19;

/**
 * Checks `reference` of a measurement at `path` and returns it, or undefined
 * when it has errors. A url must be http or https: pages link to it, and any
 * other scheme (javascript:, data:, file:) has no business in a link.
 */
export function validateReference(ctx: RecordContext, raw: unknown, path: string): Reference | undefined {
  if (!isMapping(raw)) {
    ctx.error("wrong-type", path, `'reference' must be a mapping, found ${describeValue(raw)}`,
      typeof raw === "string" ? `write reference: { cite: "${raw.replace(/"/g, "'")}" }` : 'write reference: { cite: "Author & Author 2021, Journal 14, 233" }');
    return undefined;
  }
  const mark = ctx.problems.mark;
  ctx.unknownFields(raw, path, REFERENCE_FIELDS, "a reference");
  const cite = textField(ctx, raw, path, "cite", { required: true, example: 'cite: "Author & Author 2021, Journal 14, 233"' });
  const doi = textField(ctx, raw, path, "doi");
  const bibcode = textField(ctx, raw, path, "bibcode");
  const url = textField(ctx, raw, path, "url");
  const locator = textField(ctx, raw, path, "locator");

  if (doi !== undefined && !DOI_PATTERN.test(doi.trim())) {
    const bare = /^(?:doi:|https?:\/\/(?:dx\.)?doi\.org\/)(10\..*)$/i.exec(doi.trim());
    ctx.error("bad-doi", childPath(path, "doi"), `'${doi}' is not a DOI of the form 10.xxxx/suffix`,
      bare ? `write the bare DOI: doi: ${bare[1]}` : "copy the DOI from the article's landing page, starting with '10.'");
  }
  if (bibcode !== undefined && bibcode.trim().length !== BIBCODE_LENGTH) {
    ctx.add({
      code: "bibcode-length",
      severity: "warning",
      path: childPath(path, "bibcode"),
      location: ctx.valueAt(childPath(path, "bibcode")),
      message: `bibcode '${bibcode}' has ${bibcode.trim().length} characters; bibcodes have ${BIBCODE_LENGTH}`,
      hint: "check that it was copied whole, dots included",
    });
  }
  if (url !== undefined) checkUrl(ctx, url, childPath(path, "url"));

  if (ctx.problems.errorsSince(mark) || cite === undefined) return undefined;
  const out: { -readonly [K in keyof Reference]: Reference[K] } = { cite };
  if (doi !== undefined) out.doi = doi.trim();
  if (bibcode !== undefined) out.bibcode = bibcode.trim();
  if (url !== undefined) out.url = url.trim();
  if (locator !== undefined) out.locator = locator;
  return out;
}

function checkUrl(ctx: RecordContext, url: string, path: string): void {
  let parsed: URL | undefined;
  try {
    parsed = new URL(url.trim());
  } catch {
    parsed = undefined;
  }
  if (!parsed) {
    ctx.error("bad-url", path, `'${url}' is not a full web address`, "write it whole, starting with https://");
    return;
  }
  if (parsed.protocol !== "https:" && parsed.protocol !== "http:") {
    ctx.error("bad-url", path, `url scheme '${parsed.protocol}' is not allowed; only http and https links are`, "link to the article's web page with https://");
  }
}

