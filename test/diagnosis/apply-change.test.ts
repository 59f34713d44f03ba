import { describe, expect, it } from "vitest";
import { DEFAULT_THRESHOLDS } from "../../src/audit/compare.js";
import { auditRecords } from "../../src/audit/audit-records.js";
import { DEFAULT_SET } from "../../src/constants/sets.js";
import { applyInputChanges, reaudit, withoutUncertainty } from "../../src/diagnosis/apply-change.js";
import { diagnoseReport } from "../../src/diagnosis/diagnose.js";
import { loadRecordText } from "../../src/records/load.js";
import { AU, GM_SUN, JULIAN_YEAR, build, keplerGM, pub } from "./measurement-cases.js";

const dl = () =>
  build(
    "double-lined",
    { period: "3.84471 ± 0.00002 d", k1: "79.0 ± 0.4 km/s", k2: "97.0 ± 0.5 km/s", eccentricity: "0.1 ± 0.01", inclination: "70 ± 0.3 deg" },
    { primary_mass: "1.2 ± 0.01 Msun" },
  );

describe("input changes", () => {
  it("scales a value and both uncertainties, leaving the record untouched", () => {
    const c = dl();
    const before = JSON.stringify(c.record);
    const r = applyInputChanges(c.record, [{ kind: "scale", slot: "k1", factor: 2 }]);
    expect(r.inputs.k1.quantity.value).toBe(158);
    expect(r.inputs.k1.quantity.plus).toBe(0.8);
    expect(r.inputs.k1.quantity.minus).toBe(0.8);
    expect(r.inputs.k1.quantity.unit.id).toBe("km/s");
    expect(JSON.stringify(c.record)).toBe(before);
  });

  it("swaps, drops and sets", () => {
    const c = dl();
    const r = applyInputChanges(c.record, [
      { kind: "swap", slots: ["k1", "k2"] },
      { kind: "drop", slot: "eccentricity" },
      { kind: "set", slot: "inclination", value_si: Math.PI / 2 },
    ]);
    expect(r.inputs.k1.quantity.value).toBe(97);
    expect(r.inputs.k2.quantity.value).toBe(79);
    expect(r.inputs.k1.field).toBe("k1");
    expect(r.inputs.eccentricity).toBeUndefined();
    // typed in degrees: 90°, with its uncertainty as typed
    expect(r.inputs.inclination.quantity.value).toBeCloseTo(90, 12);
    expect(r.inputs.inclination.quantity.plus).toBe(0.3);
  });

  it("refuses to change a slot the record lacks (a programmer mistake)", () => {
    expect(() => applyInputChanges(dl().record, [{ kind: "scale", slot: "parallax", factor: 2 }])).toThrow(/no input parallax/);
  });

  it("takes an input as exact", () => {
    const r = withoutUncertainty(dl().record, ["k1", "absent"]);
    expect(r.inputs.k1.quantity.kind).toBe("exact");
    expect(r.inputs.k1.quantity.plus).toBe(0);
    expect(r.inputs.k2.quantity.plus).toBe(0.5);
  });

  it("re-audits, and refuses inputs the method's own validation refuses", () => {
    const c = dl();
    const same = reaudit(c.method, c.record, DEFAULT_THRESHOLDS, DEFAULT_SET)!;
    expect(same.results.primary_mass.value_si).toBe(c.audit.results.primary_mass.value_si);
    expect(same.comparisons.primary_mass.z).toBe(c.audit.comparisons.primary_mass.z);
    const unbound = applyInputChanges(c.record, [{ kind: "scale", slot: "eccentricity", factor: 20 }]);
    expect(reaudit(c.method, unbound, DEFAULT_THRESHOLDS, DEFAULT_SET)).toBeUndefined();
  });
});

describe("diagnoseReport", () => {
  it("diagnoses the flagged measurements of a report, keyed by object and measurement", () => {
    const M = keplerGM(10 * AU, 30 * 365 * 86400) / GM_SUN;
    const ok = keplerGM(10 * AU, 30 * JULIAN_YEAR) / GM_SUN;
    const text = `name: Orrin Pair
id: orrin-pair
measurements:
  - key: flagged
    method: relative-orbit
    reference: { cite: "Invented 2031, J. Invented Astron. 2, 2" }
    inputs: { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au" }
    published: { total_mass: "${pub(M, "Msun")}" }
  - key: fine
    method: relative-orbit
    reference: { cite: "Invented 2032, J. Invented Astron. 3, 3" }
    inputs: { period: "30 ± 0.01 yr", semimajor_axis: "10 ± 0.005 au" }
    published: { total_mass: "${pub(ok, "Msun", 1e-3)}" }
`;
    const loaded = loadRecordText(text, "orrin-pair.yaml");
    const records = [loaded.record!];
    const report = auditRecords({ records, problems: [], files: ["orrin-pair.yaml"], filesWithErrors: [] }, { draws: 0 });
    const index = diagnoseReport(report, records);
    expect(Object.keys(index)).toEqual(["orrin-pair"]);
    expect(Object.keys(index["orrin-pair"])).toEqual(["flagged"]);
    const [d] = index["orrin-pair"].flagged;
    expect(d.result).toBe("total_mass");
    expect(d.explained[0].hypothesis).toBe("year-365d");
    // z after the slip is compare()'s z: (recomputed − published) / published σ on that side
    const c = report.objects[0].measurements.find((m) => m.key === "flagged")!.comparisons.total_mass;
    const e = d.explained[0];
    const side = e.recomputed_after_si > c.published_si ? c.published_plus_si : c.published_minus_si;
    expect(e.z_after).toBeCloseTo((e.recomputed_after_si - c.published_si) / side, 9);
    expect(e.status_after).toBe("consistent");
  });
});
