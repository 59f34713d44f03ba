import type { ObjectAudit } from "../audit/types.js";
import { combineObject } from "../combine/combine-object.js";
import { votableRows, type VotableRow } from "../export/votable.js";
import { getMethod } from "../methods/index.js";
import { objectBibtex } from "./bibtex.js";
import { csvLine } from "./csv.js";
import { homeRowFor, type HomeRow } from "./home-view.js";
import { headlineOf } from "./headline.js";
import { objectFlags, type FlagView } from "./problems-view.js";
import { TABLE_COLUMNS, tableRowFor } from "./table.js";

/**
 * What one object contributes to the pages and downloads that list every
 * object: its line of the reference-table CSV, its row of the reference-table
 * JSON, its BibTeX entries, its rows of the VOTable, its row of the home
 * table and its flags on the problems page, each in the very text (or data)
 * the whole file is assembled from.
 *
 * They are made where the object is audited (on a build worker, in parallel
 * with the others) and kept in the build cache with its audit, so that a
 * rebuild after one record changed assembles those files from the pieces of
 * the unchanged objects instead of making every piece again. A shared file is
 * always assembled from pieces, cached or fresh, so it is the same either way.
 */
export interface ObjectFragments {
  /** Its CSV line, without the line end; null when the object has no row. */
  readonly csv: string | null;
  /** Its element of the JSON table's "rows" array, indented as it is written there; null when it has no row. */
  readonly json: string | null;
  /** Its BibTeX entries joined by a newline; "" when it has no measurement. */
  readonly bib: string;
  /** One VOTable row per result with a combined value. */
  readonly votable: readonly VotableRow[];
  /** Its row of the home table (method titles from the method registry); null when it has no row. */
  readonly home: HomeRow | null;
  /** Its tension and discrepant comparisons, for the problems page. */
  readonly flags: readonly FlagView[];
}

/** Each element of the "rows" array of JSON.stringify(..., null, 1) sits two levels deep: two more spaces on every line. */
export function indentedJsonRow(row: unknown): string {
  return "  " + JSON.stringify(row, null, 1).replace(/\n/g, "\n  ");
}

export function makeFragments(obj: ObjectAudit): ObjectFragments {
  // the headline decides both rows: found once
  const h = headlineOf(obj);
  const row = h ? tableRowFor(obj, h) : undefined;
  return {
    csv: row ? csvLine(TABLE_COLUMNS, row) : null,
    json: row ? indentedJsonRow(row) : null,
    bib: objectBibtex(obj),
    votable: votableRows(obj, obj.combined ?? combineObject(obj)),
    home: h && row ? homeRowFor(obj, h, row, getMethod) : null,
    flags: objectFlags(obj),
  };
}

/**
 * Fragments by object: made once per object and build, or adopted from the
 * cache. One map per process (a registered symbol), so that the build
 * pipeline and the site plugin share it even when one runs from the compiled
 * code and the other from the sources, as under the test runner.
 */
const KNOWN = Symbol.for("steelyard.site.fragments");
const holder = globalThis as { [KNOWN]?: WeakMap<ObjectAudit, ObjectFragments> };
const known = (holder[KNOWN] ??= new WeakMap<ObjectAudit, ObjectFragments>());

export function fragmentsOf(obj: ObjectAudit): ObjectFragments {
  let f = known.get(obj);
  if (f === undefined) {
    f = makeFragments(obj);
    known.set(obj, f);
  }
  return f;
}

/** Takes fragments made elsewhere (a worker, the cache) for this object; they must be makeFragments(obj). */
export function adoptFragments(obj: ObjectAudit, fragments: ObjectFragments): void {
  known.set(obj, fragments);
}
