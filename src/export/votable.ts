import type { AuditReport, MeasurementAudit, ObjectAudit } from "../audit/types.js";
import type { CombinedValues } from "../combine/types.js";
import { findUnit } from "../units/catalog.js";

/**
 * The reference table (combined values per object and result) as a VOTable
 * 1.4 document (IVOA Recommendation, 2019-10-21), TABLEDATA serialisation:
 * one TABLE per result, one row per object with a combined value. Units are
 * written in VOUnit syntax (IVOA VOUnits 1.0) and columns carry UCD1+ words
 * only where a word surely fits; other columns have none. No timestamps: the
 * same audit gives the same bytes.
 */

/** VOTable 1.4 keeps the 1.3 namespace (the 1.4 schema's targetNamespace). */
export const VOTABLE_NAMESPACE = "http://www.ivoa.net/xml/VOTable/v1.3";

/** Catalogue unit id → VOUnit string (IVOA VOUnits 1.0). */
const VOUNITS: Readonly<Record<string, string>> = {
  Msun: "solMass",
  Mjup: "jupiterMass",
  Mearth: "earthMass",
  kg: "kg",
  g: "g",
  m: "m",
  km: "km",
  au: "au",
  pc: "pc",
  kpc: "kpc",
  Mpc: "Mpc",
  R_sun: "solRad",
  s: "s",
  d: "d",
  yr: "yr",
  "km/s": "km/s",
  "m/s": "m/s",
  mas: "mas",
  arcsec: "arcsec",
  deg: "deg",
};

/** The VOUnit of a catalogue unit; undefined when it has none here (the column then says its unit in words). */
export function voUnit(unitId: string): string | undefined {
  return VOUNITS[unitId];
}

// XML 1.0 allows tab, newline, carriage return and U+0020..U+D7FF, U+E000..U+FFFD, U+10000..U+10FFFF.
const NOT_XML = /[^\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/gu;

/** Text made safe for XML element content and attribute values; characters XML cannot hold become U+FFFD. */
export function xmlEscape(text: string): string {
  return text
    .replace(NOT_XML, "\uFFFD")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&apos;");
}

type Datatype = "char" | "double" | "int" | "boolean";

interface Column {
  readonly name: string;
  readonly datatype: Datatype;
  readonly unit?: string;
  readonly ucd?: string;
  readonly description: string;
}

type Cell = string | number | boolean | null;

function attributes(pairs: ReadonlyArray<readonly [string, string | undefined]>): string {
  return pairs
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => ` ${k}="${xmlEscape(v!)}"`)
    .join("");
}

function fieldXml(c: Column, indent: string): string {
  const attrs = attributes([
    ["name", c.name],
    ["datatype", c.datatype],
    ["arraysize", c.datatype === "char" ? "*" : undefined],
    ["unit", c.unit],
    ["ucd", c.ucd],
  ]);
  return `${indent}<FIELD${attrs}>\n${indent}  <DESCRIPTION>${xmlEscape(c.description)}</DESCRIPTION>\n${indent}</FIELD>`;
}

/** A TD's text: empty for a missing or non-finite number (the VOTable null of floating-point columns). */
function cellText(value: Cell, datatype: Datatype): string {
  if (value === null) return "";
  if (datatype === "boolean") return value ? "T" : "F";
  if (typeof value === "number") {
    if (!Number.isFinite(value)) return "";
    return datatype === "int" ? String(Math.trunc(value)) : String(value);
  }
  return xmlEscape(String(value));
}

const compareText = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

function uniqueSorted(values: Iterable<string | undefined>): string[] {
  return [...new Set([...values].filter((v): v is string => typeof v === "string" && v.trim() !== ""))].sort(compareText);
}

/**
 * One object's row in one result's table, with the cells that do not depend
 * on the table already written out: the table's unit (the one most rows
 * display) is known only once every row is in, so the three values stay
 * numbers, in SI, until then.
 */
export interface VotableRow {
  readonly result: string;
  readonly objectId: string;
  readonly displayUnit: string;
  readonly unitSI: string;
  /** The TD elements before the values: object id and name. */
  readonly head: string;
  readonly valueSI: number;
  readonly plusSI: number;
  readonly minusSI: number;
  /**
   * The three value TDs in the row's own display unit, ready for a table
   * whose unit is that one (most rows' case): numbers are the costly part of
   * the text, and a row is made once per object, where it is audited.
   */
  readonly ownValues: string;
  /** The TD elements after the values. */
  readonly tail: string;
}

/** The three value TDs of a row in a table whose unit has `scale`. */
function valueCells(r: Pick<VotableRow, "valueSI" | "plusSI" | "minusSI">, scale: number): string {
  return (
    `<TD>${cellText(r.valueSI / scale, DATATYPES[VALUE_COLUMN])}</TD>` +
    `<TD>${cellText(r.plusSI / scale, DATATYPES[VALUE_COLUMN + 1])}</TD>` +
    `<TD>${cellText(r.minusSI / scale, DATATYPES[VALUE_COLUMN + 2])}</TD>`
  );
}

/** The unit most rows display; ties go to the first row by object id. */
function tableUnit(rows: readonly VotableRow[]): { id: string; scale: number } | undefined {
  const counts = new Map<string, number>();
  for (const r of rows) {
    const id = r.displayUnit;
    counts.set(id, (counts.get(id) ?? 0) + 1);
  }
  let best: string | undefined;
  for (const r of rows) {
    const id = r.displayUnit;
    if (best === undefined || counts.get(id)! > counts.get(best)!) best = id;
  }
  const unit = best !== undefined ? findUnit(best) : undefined;
  return unit ? { id: unit.id, scale: unit.scale } : undefined;
}

/** The columns of one result's table; the unit and UCD of the value columns depend on the result and the table's unit. */
function tableColumns(name: string, inUnit: string, valueUnit: string | undefined, isMass: boolean): Column[] {
  return [
    { name: "object_id", datatype: "char", ucd: "meta.id;meta.main", description: "Object identifier in this table." },
    { name: "object_name", datatype: "char", ucd: "meta.id", description: "Object name as recorded." },
    { name: "value", datatype: "double", unit: valueUnit, ucd: isMass ? "phys.mass" : undefined, description: `Combined ${name}, ${inUnit}.` },
    {
      name: "sigma_plus", datatype: "double", unit: valueUnit, ucd: isMass ? "stat.error;phys.mass" : "stat.error",
      description: "Upper 1-sigma uncertainty of the combined value, multiplied by the Birge ratio when it exceeds 1.",
    },
    {
      name: "sigma_minus", datatype: "double", unit: valueUnit, ucd: isMass ? "stat.error;phys.mass" : "stat.error",
      description: "Lower 1-sigma uncertainty of the combined value (positive), multiplied by the Birge ratio when it exceeds 1.",
    },
    { name: "measurements_combined", datatype: "int", ucd: "meta.number", description: "Number of measurements combined." },
    { name: "chi2", datatype: "double", ucd: "stat.fit.chi2", description: "Chi-square of the combined measurements about the combined value." },
    { name: "dof", datatype: "int", ucd: "stat.fit.dof", description: "Degrees of freedom: measurements combined minus one." },
    { name: "birge_ratio", datatype: "double", description: "Birge ratio sqrt(chi2/dof); empty for a single measurement." },
    { name: "sigma_scaled", datatype: "boolean", description: "True when the uncertainty was multiplied by the Birge ratio." },
    {
      name: "procedure", datatype: "char",
      description: "weighted-mean: inverse-variance mean; linear-sigma: Barlow's linear-sigma likelihood for asymmetric uncertainties.",
    },
    {
      name: "audit_status", datatype: "char",
      description: "Worst comparison status of the object's measurements (consistent, tension, discrepant, not-compared). A flag is a prompt to reread the paper, not a verdict.",
    },
    { name: "measurement_keys", datatype: "char", description: "Keys of the measurements combined, separated by semicolons." },
    { name: "references", datatype: "char", ucd: "meta.ref", description: "Citations of the measurements combined, separated by semicolons." },
    { name: "bibcodes", datatype: "char", ucd: "meta.bib.bibcode", description: "Bibcodes of the measurements combined, separated by semicolons." },
    { name: "dois", datatype: "char", ucd: "meta.ref.doi", description: "DOIs of the measurements combined, separated by semicolons." },
    { name: "not_combined", datatype: "char", description: "Measurements with this result that were not combined, with the reason, separated by semicolons." },
  ];
}

/** Datatypes of the columns, by position (the same in every table). */
const DATATYPES: readonly Datatype[] = tableColumns("", "", undefined, false).map((c) => c.datatype);
const VALUE_COLUMN = 2;
const TAIL_COLUMN = 5;

/** The rows of one object, one per result with a combined value. */
export function votableRows(object: ObjectAudit, combined: CombinedValues): VotableRow[] {
  const out: VotableRow[] = [];
  for (const [result, c] of Object.entries(combined)) {
    const e = c.estimate;
    if (!e) continue;
    const byKey = new Map<string, MeasurementAudit>(object.measurements.map((m) => [m.key, m] as const));
    const used = c.inputs.map((i) => byKey.get(i.key)).filter((m): m is MeasurementAudit => m !== undefined);
    const td = (cells: readonly Cell[], first: number): string =>
      cells.map((cell, i) => `<TD>${cellText(cell, DATATYPES[first + i])}</TD>`).join("");
    const values = { valueSI: e.value_si, plusSI: e.sigma_plus_si, minusSI: e.sigma_minus_si };
    out.push({
      result,
      objectId: object.id,
      displayUnit: e.display_unit,
      unitSI: e.unit_si,
      head: td([object.id, object.name], 0),
      ...values,
      // as a table in this unit writes them (tableUnit: a unit not in the catalogue is no unit, scale 1)
      ownValues: valueCells(values, findUnit(e.display_unit)?.scale ?? 1),
      tail: td(
        [
          c.count,
          c.chi2,
          c.dof,
          c.birge_ratio,
          c.scaled,
          c.procedure,
          object.status,
          c.inputs.map((i) => i.key).join("; "),
          uniqueSorted(used.map((m) => m.reference.cite)).join("; "),
          uniqueSorted(used.map((m) => m.reference.bibcode)).join("; "),
          uniqueSorted(used.map((m) => m.reference.doi)).join("; "),
          c.excluded.map((x) => `${x.key}: ${x.reason}`).join("; "),
        ],
        TAIL_COLUMN,
      ),
    });
  }
  return out;
}

/** The lines of one result's TABLE element, each with its line end. */
function* tableLines(result: string, rows: readonly VotableRow[], indent: string): Generator<string> {
  const unit = tableUnit(rows);
  const scale = unit?.scale ?? 1;
  const unitSI = rows[0].unitSI;
  const isMass = unitSI === "kg";
  const vo = unit ? voUnit(unit.id) : undefined;
  const inUnit = unit ? (unit.id === "1" ? "as a plain number" : `in ${vo ?? `${unit.id} (no VOUnit form)`}`) : `in SI (${unitSI})`;
  const valueUnit = unit && unit.id !== "1" ? vo : undefined;
  const name = result.replace(/_/g, " ");

  const columns = tableColumns(name, inUnit, valueUnit, isMass);

  const own = unit?.id;
  const description =
    `Combined ${name} per object: the weighted average of the recomputed values of the measurements in use, ` +
    `${inUnit}.`;
  yield `${indent}<TABLE${attributes([["name", result], ["nrows", String(rows.length)]])}>\n`;
  yield `${indent}  <DESCRIPTION>${xmlEscape(description)}</DESCRIPTION>\n`;
  for (const c of columns) yield `${fieldXml(c, `${indent}  `)}\n`;
  yield `${indent}  <DATA>\n${indent}    <TABLEDATA>\n`;
  for (const r of rows) {
    const values = own !== undefined && r.displayUnit === own ? r.ownValues : valueCells(r, scale);
    yield `${indent}      <TR>${r.head}${values}${r.tail}</TR>\n`;
  }
  yield `${indent}    </TABLEDATA>\n${indent}  </DATA>\n${indent}</TABLE>\n`;
}

/**
 * The reference table as VOTable text. `combined` is keyed by object id (as
 * combineReport gives it); objects without a combined value for a result have
 * no row in that result's table.
 */
export function referenceTableVOTable(report: AuditReport, combined: Readonly<Record<string, CombinedValues>>): string {
  return referenceTableFromRows(report, report.objects.map((o) => votableRows(o, combined[o.id] ?? {})));
}

/** The same document from each object's rows (votableRows), in any order of objects. */
export function referenceTableFromRows(report: Pick<AuditReport, "tool" | "settings">, perObject: ReadonlyArray<readonly VotableRow[]>): string {
  return [...referenceTableChunks(report, perObject)].join("");
}

/**
 * That document in pieces, each ending a line, for writing it out through a
 * buffer: at ten thousand objects the text is 11 MB, which as one string is
 * built, copied and encoded again before it reaches the file.
 */
export function* referenceTableChunks(report: Pick<AuditReport, "tool" | "settings">, perObject: ReadonlyArray<readonly VotableRow[]>): Generator<string> {
  const all = perObject.flat().sort((a, b) => compareText(a.objectId, b.objectId));
  const byResult = new Map<string, VotableRow[]>();
  for (const r of all) {
    const list = byResult.get(r.result);
    if (list) list.push(r);
    else byResult.set(r.result, [r]);
  }

  const t = report.settings.thresholds;
  const info = (name: string, value: string) => `  <INFO${attributes([["name", name], ["value", value]])}/>`;
  const description =
    "Reference table of dynamical masses: for each object and result, the combined value of the measurements in use, " +
    "each recomputed from its published inputs. The audit compares each published value with what its own inputs give; " +
    "a flag is a prompt to reread the paper, not a verdict.";
  yield [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<VOTABLE version="1.4" xmlns="${VOTABLE_NAMESPACE}">`,
    `  <DESCRIPTION>${xmlEscape(description)}</DESCRIPTION>`,
    info("tool", `${report.tool.name} ${report.tool.version}`),
    info("constants", report.settings.constants),
    info("tension_threshold", String(t.tension)),
    info("discrepant_threshold", String(t.discrepant)),
    `  <RESOURCE${attributes([["name", "reference-table"], ["type", "results"]])}>`,
    "",
  ].join("\n");
  // an audit with nothing combined gives an empty resource, which the schema allows
  for (const result of [...byResult.keys()].sort(compareText)) yield* tableLines(result, byResult.get(result)!, "    ");
  yield "  </RESOURCE>\n</VOTABLE>\n";
}
