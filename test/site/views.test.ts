import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/index.js";
import type { AuditReport, ObjectAudit } from "../../src/audit/types.js";
import { getMethod } from "../../src/methods/index.js";
import { combineObject } from "../../src/combine/combine-object.js";
import { combinedValueText } from "../../src/site/combined-view.js";
import { diagnosisView } from "../../src/site/diagnosis-view.js";
import { formatPlain, formatShare, formatWithSigma, formatZ } from "../../src/site/display.js";
import { headlineOf } from "../../src/site/headline.js";
import { homeRow, homeRows, statusCounts } from "../../src/site/home-view.js";
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

describe("combined reference values in the table and on the object page", () => {
  /** orvell-12 with both velocity sets in use, the older one's mass function moved by `factor`, combined afresh. */
  function bothInUse(factor: number): ObjectAudit {
    const obj = byId("orvell-12");
    const measurements = obj.measurements.map((m) => {
      if (m.key !== "velocities-2011") return m;
      const r = m.results.mass_function;
      const moved = {
        ...r,
        value_si: r.value_si * factor,
        value: r.value * factor,
        sigma_si: r.sigma_si * factor,
        sigma: r.sigma * factor,
        sigma_plus_si: r.sigma_plus_si * factor,
        sigma_minus_si: r.sigma_minus_si * factor,
      };
      return { ...m, use: true, results: { ...m.results, mass_function: moved } };
    });
    const changed = { ...obj, measurements };
    return { ...changed, combined: combineObject(changed) };
  }

  it("give the download row the combined value of the headline's result, with its count and no Birge ratio for one", () => {
    const obj = byId("orvell-12");
    const row = tableRows(report).find((r) => r.object_id === "orvell-12")!;
    const c = obj.combined.mass_function;
    expect(c.count).toBe(1);
    expect(row.combined_si).toBe(c.estimate!.value_si);
    expect(row.combined_sigma_si).toBe(c.estimate!.sigma_si);
    expect(row.combined_count).toBe(1);
    expect(row.birge_ratio).toBeNull();
    // one measurement in use: its own value, and the table says nothing more
    expect(row.combined_si).toBe(row.recomputed_si);
    expect(homeRows(report, getMethod).find((r) => r.row.object_id === "orvell-12")!.recomputedNote).toBe("");
  });

  it("show the reference value and say where it comes from when the measurement compared is not in use", () => {
    const obj = byId("orvell-12");
    const swapped = obj.measurements.map((m) => ({ ...m, use: m.key === "velocities-2011" }));
    const changed = { ...obj, measurements: swapped };
    const withCombined = { ...changed, combined: combineObject(changed) };
    const h = headlineOf(withCombined)!;
    expect(h.measurement.key).toBe("velocities-2021");
    const row = homeRow(withCombined, getMethod)!;
    expect(row.recomputedNote).toBe("from velocities-2011");
    const r2011 = obj.measurements[1].results.mass_function;
    const scale = r2011.value_si / r2011.value;
    expect(row.recomputed).toBe(`${formatWithSigma(r2011.value, r2011.sigma_plus_si / scale, r2011.sigma_minus_si / scale)}\u00a0M☉`);
    expect(row.sortMass).toBe(String(withCombined.combined.mass_function.estimate!.value_si));
  });

  it("combine two measurements by inverse-variance weights and say so on the home row", () => {
    const obj = bothInUse(1);
    const [a, b] = obj.measurements.map((m) => m.results.mass_function);
    // inverse-variance weighted mean of two symmetric values (the textbook formula, recomputed here)
    const wa = 1 / a.sigma_si ** 2;
    const wb = 1 / b.sigma_si ** 2;
    const mean = (wa * a.value_si + wb * b.value_si) / (wa + wb);
    const c = obj.combined.mass_function;
    expect(c.estimate!.value_si / mean - 1).toBeCloseTo(0, 12);
    const row = homeRow(obj, getMethod)!;
    expect(row.recomputedNote).toBe("combined over 2");
    expect(row.recomputed).toBe(combinedValueText(c));
    expect(row.row.combined_count).toBe(2);
    expect(row.row.birge_ratio).toBe(c.birge_ratio);
  });

  it("give the page the value, χ², Birge ratio, the heaviest and most discordant measurement, and the scaling when R > 1", () => {
    const obj = bothInUse(1.6);
    const [a, b] = obj.measurements.map((m) => m.results.mass_function);
    const wa = 1 / a.sigma_si ** 2;
    const wb = 1 / b.sigma_si ** 2;
    const mean = (wa * a.value_si + wb * b.value_si) / (wa + wb);
    const chi2 = wa * (a.value_si - mean) ** 2 + wb * (b.value_si - mean) ** 2;
    const birge = Math.sqrt(chi2 / 1);
    expect(birge).toBeGreaterThan(1);
    const v = objectPageView(obj, getMethod).referenceValues.find((x) => x.result === "mass_function")!;
    expect(v.count).toBe(2);
    expect(v.dof).toBe(1);
    expect(v.chi2).toBe(formatPlain(chi2, 3));
    expect(v.birge).toBe(formatPlain(birge, 3));
    expect(v.scaled).toBe(true);
    expect(v.scaledNote).toBe(`uncertainty scaled by R = ${formatPlain(birge, 3)}`);
    // the internal σ of the mean is 1/√(Σw); the page's is that times R
    const e = obj.combined.mass_function.estimate!;
    expect(e.sigma_si / (birge / Math.sqrt(wa + wb)) - 1).toBeCloseTo(0, 9);
    expect(v.value).toBe(`${formatWithSigma(e.value, e.sigma_plus, e.sigma_minus)}\u00a0M☉`);
    // the 2021 set has the smaller σ, so the larger weight; with two measurements both pulls are equal in size
    expect(v.heaviest!.key).toBe(wa > wb ? "velocities-2021" : "velocities-2011");
    expect(v.heaviest!.detail).toBe(`${formatShare(Math.max(wa, wb) / (wa + wb))} of the weight`);
    // two measurements: the weighted residuals cancel, w_a·d_a = −w_b·d_b, so each one's part of χ² is
    // w·d² ∝ 1/w: the lighter measurement is the more discordant, with the heavier one's share of the weight
    const lighter = wa < wb ? { key: "velocities-2021", r: a } : { key: "velocities-2011", r: b };
    expect(v.mostDiscordant!.key).toBe(lighter.key);
    const pull = (lighter.r.value_si - mean) / lighter.r.sigma_si;
    expect(v.mostDiscordant!.detail).toBe(`pull ${formatZ(pull)}σ, ${formatShare(Math.max(wa, wb) / (wa + wb))} of χ²`);
    expect(v.inputs.map((i) => i.key)).toEqual(["velocities-2011", "velocities-2021"]);
    expect(v.excluded).toEqual([]);
    expect(v.chartSvg).toMatch(/^<svg class="chart forest-chart"/);
  });

  it("list a measurement marked not to be used with its comment as the reason, and draw it hollow", () => {
    const v = objectPageView(byId("orvell-12"), getMethod).referenceValues.find((x) => x.result === "mass_function")!;
    expect(v.excluded).toEqual([{ key: "velocities-2011", anchor: "measurement-velocities-2011", reason: "marked not to be used: Superseded by the 2021 velocities." }]);
    expect(v.chartSvg).toContain('data-key="velocities-2011" data-used="false"');
    expect(v.chartSvg).toContain('class="chart-marker-hollow"');
    expect(v.birge).toBe("\u2014");
    expect(v.chi2).toBe("\u2014");
    expect(v.heaviest).toBeUndefined();
    expect(v.mostDiscordant).toBeUndefined();
    expect(v.scaledNote).toBe("");
  });
});

describe("likely causes on the object page", () => {
  it("show the summary, no cause, and every slip tried by its title when none reconciles", () => {
    const m = byId("orvell-9").measurements[0];
    const d = m.diagnoses!.find((x) => x.result === "primary_mass")!;
    expect(d.unexplained).toBe(true);
    const r = objectPageView(byId("orvell-9"), getMethod).measurements[0].results.find((x) => x.name === "primary_mass")!;
    expect(r.diagnosis!.summary).toBe(d.summary);
    expect(r.diagnosis!.summary).toMatch(/^No single slip of the 11 tried/);
    expect(r.diagnosis!.causes).toEqual([]);
    expect(r.diagnosis!.tried.map((t) => t.hypothesis).sort()).toEqual([...d.tried]);
    expect(r.diagnosis!.tried.find((t) => t.hypothesis === "k-swapped")!.title).toBe("K₁ and K₂ swapped");
    const titles = r.diagnosis!.tried.map((t) => t.title);
    expect(titles).toEqual([...titles].sort());
    expect(r.diagnosis!.tried.every((t) => !t.matched)).toBe(true);
  });

  it("give no block to a result that is not flagged", () => {
    const r = objectPageView(byId("orvell-5-ab"), getMethod).measurements[0].results[0];
    expect(r.comparison!.status.status).toBe("consistent");
    expect(r.diagnosis).toBeUndefined();
  });

  it("keep the causes best first with their numbers, and mark the matched slips among those tried", () => {
    const view = diagnosisView({
      key: "k",
      method: "single-lined",
      result: "mass_function",
      status: "discrepant",
      z: -19.77,
      explained: [
        { hypothesis: "k-doubled", title: "Full amplitude 2K used as K", description: "d1", kind: "value", z_after: 0.0065, status_after: "consistent", factor: 7.9977, slip_factor: 8, recomputed_after_si: 1 },
        { hypothesis: "days-as-years", title: "Period in days taken as years", description: "d2", kind: "value", z_after: -0.9, status_after: "consistent", factor: 7.9977, slip_factor: 7.5, recomputed_after_si: 1 },
      ],
      unexplained: false,
      summary: "s",
      tried: ["days-as-years", "k-doubled", "k-halved"],
    });
    expect(view.causes.map((c) => [c.title, c.zAfter, c.factor, c.slipFactor])).toEqual([
      ["Full amplitude 2K used as K", "0.01", "7.9977", "8.0000"],
      ["Period in days taken as years", "\u22120.90", "7.9977", "7.5000"],
    ]);
    expect(view.z).toBe("\u221219.77");
    expect(view.tried.map((t) => [t.hypothesis, t.matched])).toEqual([
      ["k-doubled", true],
      ["k-halved", false],
      ["days-as-years", true],
    ]);
  });
});
