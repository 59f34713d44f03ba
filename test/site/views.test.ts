import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/index.js";
import type { AuditReport, ObjectAudit } from "../../src/audit/types.js";
import { getMethod } from "../../src/methods/index.js";
import { headlineOf } from "../../src/site/headline.js";
import { homeRows, statusCounts } from "../../src/site/home-view.js";
import { objectPageView } from "../../src/site/object-view.js";
import { flaggedComparisons, problemsByFile } from "../../src/site/problems-view.js";
import { objectPath, tableRows } from "../../src/site/table.js";

const RECORDS = path.resolve(__dirname, "../fixtures/site/records");
let report: AuditReport;
const byId = (id: string): ObjectAudit => report.objects.find((o) => o.id === id)!;

beforeAll(async () => {
  report = await runAudit(RECORDS, { draws: 400 });
});

describe("the row that stands for an object", () => {
  it("is the comparison with the largest |z| over all measurements", () => {
    const h = headlineOf(byId("orvell-12"))!;
    expect(h.measurement.key).toBe("velocities-2021");
    expect(h.result.name).toBe("mass_function");
    expect(h.comparison!.status).toBe("tension");
  });

  it("falls back to the first result when nothing was compared", () => {
    const h = headlineOf(byId("orvell-20-disc"))!;
    expect(h.comparison).toBeUndefined();
    expect(h.result.name).toBe(Object.keys(byId("orvell-20-disc").measurements[0].results)[0]);
  });

  it("prefers a later measurement whose |z| is larger, and keeps the earlier one on a tie", () => {
    const obj = byId("orvell-12");
    const [a] = obj.measurements;
    const copy = (z: number) => ({ ...a, key: `copy-${z}`, comparisons: { mass_function: { ...a.comparisons.mass_function, z } } });
    const larger: ObjectAudit = { ...obj, measurements: [a, copy(-5)] };
    expect(headlineOf(larger)!.measurement.key).toBe("copy--5");
    const tie: ObjectAudit = { ...obj, measurements: [a, copy(a.comparisons.mass_function.z)] };
    expect(headlineOf(tie)!.measurement.key).toBe("velocities-2021");
  });
});

describe("reference table rows", () => {
  it("give one row per object with the headline's full-precision numbers and the object's worst status", () => {
    const rows = tableRows(report);
    expect(rows.map((r) => r.object_id)).toEqual(report.objects.map((o) => o.id));
    const nine = rows.find((r) => r.object_id === "orvell-9")!;
    const h = headlineOf(byId("orvell-9"))!;
    expect(nine.status).toBe("discrepant");
    expect(nine.recomputed_si).toBe(h.result.value_si);
    expect(nine.recomputed).toBe(h.result.value);
    expect(nine.z).toBe(h.comparison!.z);
    expect(nine.published_si).toBe(h.comparison!.published_si);
    // published in the display unit: the record gave Msun, the result is shown in Msun
    expect(nine.unit).toBe("Msun");
    expect(nine.published).toBeCloseTo(1.5, 12);
    expect(nine.page).toBe("objects/orvell-9/");
    expect(nine.reference).toBe("Teague 2019, Proc. Fictional Obs. 2, 14");
  });

  it("leave published, z and their SI values null when nothing was compared", () => {
    const disc = tableRows(report).find((r) => r.object_id === "orvell-20-disc")!;
    expect([disc.published, disc.published_si, disc.z, disc.published_text]).toEqual([null, null, null, ""]);
    expect(disc.status).toBe("not-compared");
  });

  it("count objects by worst status and measurements by their own status", () => {
    const counts = Object.fromEntries(statusCounts(report).map((c) => [c.status.status, [c.objects, c.measurements]]));
    expect(counts).toEqual({ discrepant: [1, 1], tension: [2, 2], consistent: [1, 1], "not-compared": [1, 2] });
  });

  it("print the published value with its kind and unit symbol beside the recomputed one", () => {
    const row = homeRows(report, getMethod).find((r) => r.row.object_id === "orvell-9")!;
    expect(row.published).toBe("1.500 ± 0.020\u00a0M☉");
    expect(row.recomputed).toMatch(/^1\.68\d* ± 0\.0\d+\u00a0M☉$/);
    expect(row.methodTitle).toBe(getMethod("double-lined")!.title);
    expect(row.sortZ).toBe(String(Math.abs(row.row.z!)));
  });
});

describe("object page view", () => {
  it("shows each input as written, in its unit and in SI, with the conversion factor", () => {
    const v = objectPageView(byId("orvell-5-ab"), getMethod);
    const inputs = Object.fromEntries(v.measurements[0].inputs.map((i) => [i.field, i]));
    expect(inputs.period.text).toBe("10.00 ± 0.05 yr");
    expect(inputs.period.published).toBe("10.000 ± 0.050\u00a0yr");
    // Julian year: 365.25 d of 86 400 s = 31 557 600 s exactly (IAU definition of the Julian year; from memory)
    expect(inputs.period.factor).toBe("1\u00a0yr = 3.155760 × 10\u2077\u00a0s");
    // 10.00 ± 0.05 yr = 3.15576 × 10⁸ s ± 1.578 × 10⁶ s
    expect(inputs.period.si).toBe("(3.156 ± 0.016) × 10\u2078\u00a0s");
    // 1 mas = π / (180 × 3600 × 1000) rad = 4.8481368… × 10⁻⁹ rad (exact by the definition of the degree)
    expect(inputs.parallax.factor).toBe("1\u00a0mas = 4.848137 × 10\u207b\u2079\u00a0rad");
    expect(inputs.parallax.symbolHtml).toContain('class="katex"');
  });

  it("typesets the general and substituted equations of each measurement", () => {
    const v = objectPageView(byId("orvell-5-ab"), getMethod);
    const eqs = v.measurements[0].equations;
    expect(eqs.length).toBeGreaterThan(0);
    for (const eq of eqs) {
      expect(eq.generalHtml).toContain('class="katex-display"');
      expect(eq.substitutedHtml).toContain('class="katex-display"');
    }
  });

  it("gives the comparison, the charts and the budget of a compared result", () => {
    const v = objectPageView(byId("orvell-9"), getMethod);
    const r = v.measurements[0].results.find((x) => x.name === "primary_mass")!;
    expect(r.comparison!.status.status).toBe("discrepant");
    expect(r.comparison!.publishedText).toBe("1.50 ± 0.02 Msun");
    expect(r.comparison!.sigmaFrom).toBe("the published uncertainty");
    expect(r.comparison!.z).toBe(byId("orvell-9").measurements[0].comparisons.primary_mass.z.toFixed(2));
    expect(r.comparison!.chartSvg).toMatch(/^<svg class="chart comparison-chart"/);
    expect(r.budgetSvg).toMatch(/^<svg class="chart budget-chart"/);
    expect(r.monteCarlo!.draws).toBe(400);
  });

  it("links a record's DOI and http(s) URL and keeps the rest as text", () => {
    const ref = objectPageView(byId("orvell-5-ab"), getMethod).measurements[0].reference;
    expect(ref.doi).toEqual({ text: "10.5555/jia.2020.5.88", link: { href: "https://doi.org/10.5555/jia.2020.5.88", text: "doi:10.5555/jia.2020.5.88" } });
    expect(ref.url!.link!.href).toBe("https://example.org/papers/jia-5-88?view=full&lang=en");
    expect(ref.locator).toBe("Table 3");
    const bib = objectPageView(byId("orvell-9"), getMethod).measurements[0].reference;
    expect(bib.bibcode).toBe("2019PFO.....2...14T");
    expect(bib.doi).toBeUndefined();
  });

  it("carries the record problems of the object's file", () => {
    const byFile = problemsByFile(report.problems);
    const v = objectPageView(byId("orvell-66"), getMethod, byFile.get("hostile.yaml"));
    expect(v.problems.map((p) => p.path)).toEqual(["measurements[1].reference.url"]);
    expect(v.measurements.map((m) => m.key)).toEqual(["orbit-x"]);
  });
});

describe("flag list", () => {
  it("holds every tension and discrepant comparison, most serious first, linked to its measurement", () => {
    const flags = flaggedComparisons(report);
    expect(flags.map((f) => [f.objectId, f.status.status])).toEqual([
      ["orvell-9", "discrepant"],
      ["orvell-66", "tension"],
      ["orvell-12", "tension"],
    ]);
    expect(flags[0].page).toBe(objectPath("orvell-9"));
    expect(flags[0].anchor).toBe("measurement-velocities-2019");
  });
});
