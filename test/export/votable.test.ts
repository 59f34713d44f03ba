/**
 * The VOTable download checked against the standard's own XML schema: IVOA VOTable 1.4
 * Recommendation (2019-10-21), schema stored verbatim in test/fixtures/votable/VOTable-1.4.xsd,
 * validated with libxml2 (xmllint-wasm, npm registry). Units follow IVOA VOUnits 1.0
 * ("solMass", "earthMass", "au"); UCDs are words of the IVOA UCD1+ vocabulary.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { validateXML } from "xmllint-wasm";
import { auditRecords } from "../../src/audit/audit-records.js";
import type { AuditReport } from "../../src/audit/types.js";
import { combineReport } from "../../src/combine/combine-object.js";
import { referenceTableVOTable, voUnit, xmlEscape } from "../../src/export/votable.js";
import { loadRecordText } from "../../src/records/load.js";
import type { LoadOutcome, ObjectRecord } from "../../src/records/types.js";

const SCHEMA = readFileSync(join(__dirname, "../fixtures/votable/VOTable-1.4.xsd"), "utf8");
const GM_SUN = 1.3271244e20; // IAU 2015 B3
const GM_EARTH = 3.986004e14; // IAU 2015 B3

async function validate(xml: string) {
  return validateXML({ xml: [{ fileName: "table.vot", contents: xml }], schema: [SCHEMA] });
}

const FILES: Record<string, string> = {
  "hollin-2.yaml": `name: Hollin 2 AB
id: hollin-2
measurements:
  - key: orbit-2011
    method: relative-orbit
    reference:
      cite: "Brask & Tol 2011, J. Invented Astron. 4, 17"
      bibcode: "2011JIA.....4...17B"
      doi: "10.5555/jia.2011.4.17"
    inputs:
      period: "30 ± 0.03 yr"
      semimajor_axis: "10 ± 0.01 au"
      mass_ratio: "0.6 +0.05 -0.03"
    published:
      total_mass: "1.11 ± 0.01 Msun"
  - key: orbit-2019
    method: relative-orbit
    reference:
      cite: "Tol, Brask & Imre 2019, Proc. Fictional Obs. 12, 9"
    inputs:
      period: "30.02 ± 0.02 yr"
      semimajor_axis: "10.01 ± 0.008 au"
    published:
      total_mass: "1.11 ± 0.01 Msun"
  - key: orbit-1990
    method: relative-orbit
    use: false
    comment: "superseded: micrometer orbit"
    reference:
      cite: "Imre 1990, Bull. Imaginary Astron. Soc. 1, 2"
    inputs:
      period: "29 ± 1 yr"
      semimajor_axis: "9.5 ± 0.3 au"
    published:
      total_mass: "1.0 ± 0.1 Msun"
`,
  "quorl-b.yaml": `name: Quorl b
id: quorl-b
measurements:
  - key: moon-2022
    method: relative-orbit
    reference:
      cite: "Ansel 2022, J. Invented Astron. 30, 8"
    inputs:
      period: "3.2 ± 0.001 d"
      semimajor_axis: "4.1e5 ± 1e3 km"
    published:
      total_mass: "1.2 ± 0.01 Mearth"
`,
};

let report: AuditReport;
let xml: string;

beforeAll(() => {
  const records: ObjectRecord[] = [];
  for (const [file, text] of Object.entries(FILES)) {
    const out = loadRecordText(text, file);
    if (!out.record) throw new Error(`${file}: ${out.problems.map((p) => p.message).join("; ")}`);
    records.push(out.record);
  }
  records.sort((a, b) => (a.id < b.id ? -1 : 1));
  const outcome: LoadOutcome = { records, problems: [], files: Object.keys(FILES).sort(), filesWithErrors: [] };
  report = auditRecords(outcome, { draws: 0 });
  xml = referenceTableVOTable(report, combineReport(report.objects));
});

/** Every FIELD's attributes and every row's cells of one TABLE, read back with plain patterns. */
function table(doc: string, name: string) {
  const m = doc.match(new RegExp(`<TABLE name="${name}" nrows="(\\d+)">([\\s\\S]*?)</TABLE>`));
  if (!m) throw new Error(`no table ${name}`);
  const fields = [...m[2].matchAll(/<FIELD ([^>]*)>/g)].map((f) =>
    Object.fromEntries([...f[1].matchAll(/(\w+)="([^"]*)"/g)].map((a) => [a[1], a[2]])),
  );
  const rows = [...m[2].matchAll(/<TR>(.*?)<\/TR>/g)].map((r) => [...r[1].matchAll(/<TD>(.*?)<\/TD>/g)].map((c) => c[1]));
  const cell = (row: string[], field: string) => row[fields.findIndex((f) => f.name === field)];
  return { nrows: Number(m[1]), fields, rows, cell };
}

describe("VOTable 1.4 download", () => {
  it("is valid against the VOTable 1.4 XML schema", async () => {
    const r = await validate(xml);
    expect(r.errors.map((e) => e.message)).toEqual([]);
    expect(r.valid).toBe(true);
  });

  it("is refused by the schema when broken (the validator is live)", async () => {
    const broken = xml.replace(/ datatype="double"/, "");
    const r = await validate(broken);
    expect(r.valid).toBe(false);
    expect(r.errors.some((e) => e.message.includes("datatype"))).toBe(true);
  });

  it("has one table per result and one row per object with a combined value", () => {
    const names = [...xml.matchAll(/<TABLE name="([^"]+)"/g)].map((m) => m[1]);
    expect(names).toEqual(["primary_mass", "secondary_mass", "total_mass"]);
    const t = table(xml, "total_mass");
    expect(t.nrows).toBe(2);
    expect(t.rows.map((r) => t.cell(r, "object_id"))).toEqual(["hollin-2", "quorl-b"]);
    for (const r of t.rows) expect(r).toHaveLength(t.fields.length);
  });

  it("declares datatypes, VOUnit units and UCD1+ words", () => {
    const t = table(xml, "total_mass");
    const by = Object.fromEntries(t.fields.map((f) => [f.name, f]));
    expect(by.object_id).toMatchObject({ datatype: "char", arraysize: "*", ucd: "meta.id;meta.main" });
    expect(by.object_name).toMatchObject({ ucd: "meta.id" });
    // both rows display M☉ most often (hollin-2) or M⊕ (quorl-b): ties go to the first object
    expect(by.value).toMatchObject({ datatype: "double", unit: "solMass", ucd: "phys.mass" });
    expect(by.sigma_plus).toMatchObject({ unit: "solMass", ucd: "stat.error;phys.mass" });
    expect(by.measurements_combined).toMatchObject({ datatype: "int", ucd: "meta.number" });
    expect(by.chi2).toMatchObject({ ucd: "stat.fit.chi2" });
    expect(by.dof).toMatchObject({ ucd: "stat.fit.dof" });
    expect(by.sigma_scaled).toMatchObject({ datatype: "boolean" });
    expect(by.references).toMatchObject({ ucd: "meta.ref" });
    expect(by.bibcodes).toMatchObject({ ucd: "meta.bib.bibcode" });
    expect(by.dois).toMatchObject({ ucd: "meta.ref.doi" });
    expect(by.audit_status.ucd).toBeUndefined();
  });

  it("writes the combined numbers in the table's unit", () => {
    const combined = combineReport(report.objects);
    const t = table(xml, "total_mass");
    const [hollin, quorl] = t.rows;
    const h = combined["hollin-2"].total_mass;
    expect(Number(t.cell(hollin, "value"))).toBe(h.estimate!.value_si / (GM_SUN / 6.6743e-11));
    expect(t.cell(hollin, "measurements_combined")).toBe("2");
    expect(t.cell(hollin, "dof")).toBe("1");
    expect(Number(t.cell(hollin, "chi2"))).toBe(h.chi2);
    expect(t.cell(hollin, "sigma_scaled")).toBe(h.scaled ? "T" : "F");
    expect(t.cell(hollin, "procedure")).toBe("weighted-mean");
    // the asymmetric mass ratio makes the component masses asymmetric
    const p = table(xml, "primary_mass");
    expect(p.rows.map((r) => p.cell(r, "procedure"))).toEqual(["linear-sigma"]);
    expect(Number(p.cell(p.rows[0], "sigma_plus"))).not.toBeCloseTo(Number(p.cell(p.rows[0], "sigma_minus")), 6);
    expect(t.cell(hollin, "measurement_keys")).toBe("orbit-2011; orbit-2019");
    expect(t.cell(hollin, "bibcodes")).toBe("2011JIA.....4...17B");
    expect(t.cell(hollin, "dois")).toBe("10.5555/jia.2011.4.17");
    expect(t.cell(hollin, "not_combined")).toBe("orbit-1990: marked not to be used: superseded: micrometer orbit");
    // one measurement: no χ², no Birge ratio (empty cells are the VOTable null of doubles)
    expect(t.cell(quorl, "chi2")).toBe("0");
    expect(t.cell(quorl, "birge_ratio")).toBe("");
    // the moon's mass in M☉: M⊕ value × GM⊕/GM☉ (nominal IAU 2015 B3 ratio)
    const q = combined["quorl-b"].total_mass.estimate!;
    expect(Number(t.cell(quorl, "value"))).toBeCloseTo(q.value * (GM_EARTH / GM_SUN), 18);
    // a table whose rows all display M⊕ would say earthMass
    expect(voUnit("Mearth")).toBe("earthMass");
    expect(voUnit("au")).toBe("au");
    expect(voUnit("km/s")).toBe("km/s");
  });

  it("escapes every text and stays valid", async () => {
    const edited: AuditReport = {
      ...report,
      objects: report.objects.map((o) => (o.id === "quorl-b" ? { ...o, name: `Quorl <b> & "c" 'd' \u0007bell` } : o)),
    };
    const doc = referenceTableVOTable(edited, combineReport(edited.objects));
    expect(doc).toContain("Quorl &lt;b&gt; &amp; &quot;c&quot; &apos;d&apos; \uFFFDbell");
    const r = await validate(doc);
    expect(r.valid).toBe(true);
  });

  it("is deterministic and carries no timestamp", () => {
    const again = referenceTableVOTable(report, combineReport([...report.objects].reverse()));
    expect(again).toBe(xml);
    expect(xml).not.toMatch(/\d{4}-\d{2}-\d{2}T/);
    expect(xml.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<VOTABLE version="1.4" xmlns="http://www.ivoa.net/xml/VOTable/v1.3">')).toBe(true);
    expect(xml).toContain("a prompt to reread the paper, not a verdict");
  });

  it("gives a valid document for an audit with nothing combined", async () => {
    const empty: AuditReport = { ...report, objects: [] };
    const doc = referenceTableVOTable(empty, {});
    expect(doc).not.toContain("<TABLE");
    expect((await validate(doc)).valid).toBe(true);
  });
});

describe("xmlEscape", () => {
  it("escapes the five XML specials and replaces characters XML cannot hold", () => {
    expect(xmlEscape(`a<b>&"'`)).toBe("a&lt;b&gt;&amp;&quot;&apos;");
    expect(xmlEscape("tab\tnew\nline")).toBe("tab\tnew\nline");
    expect(xmlEscape("nul\u0000 esc\u001b")).toBe("nul\uFFFD esc\uFFFD");
    expect(xmlEscape("lone \uD800 surrogate, pair \uD83D\uDE00")).toBe("lone \uFFFD surrogate, pair \uD83D\uDE00");
    expect(xmlEscape("M☉ ± ϖ")).toBe("M☉ ± ϖ");
  });
});
