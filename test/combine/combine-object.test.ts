import { describe, expect, it } from "vitest";
import { combineObject, combineReport } from "../../src/combine/combine-object.js";
import { massResult, measurement, object, plainResult, SOLAR_MASS_KG } from "./audit-builders.js";

describe("combineObject", () => {
  it("combines every result over the measurements in use, keys sorted", () => {
    const o = object("vell-3", [
      measurement("b-2021", [massResult("total_mass", 2.0, 0.1), plainResult("mass_ratio", 0.5, 0.05)]),
      measurement("a-2019", [massResult("total_mass", 2.2, 0.1)]),
    ]);
    const c = combineObject(o);
    expect(Object.keys(c)).toEqual(["mass_ratio", "total_mass"]);
    const t = c.total_mass;
    expect(t.count).toBe(2);
    expect(t.inputs.map((i) => i.key)).toEqual(["a-2019", "b-2021"]);
    // equal weights: mean 2.1 Msun; χ² = 2 × 1² = 2; R = √2 > 1 scales σ = 0.1/√2 by √2
    expect(t.estimate!.value).toBeCloseTo(2.1, 13);
    expect(t.estimate!.value_si).toBeCloseTo(2.1 * SOLAR_MASS_KG, -17);
    expect(t.chi2).toBeCloseTo(2, 12);
    expect(t.birge_ratio).toBeCloseTo(Math.SQRT2, 12);
    expect(t.scaled).toBe(true);
    expect(t.estimate!.internal_sigma_plus_si / SOLAR_MASS_KG).toBeCloseTo(0.1 / Math.SQRT2, 13);
    expect(t.estimate!.sigma_plus).toBeCloseTo(0.1, 13);
    expect(t.estimate!.display_unit).toBe("Msun");
    expect(t.notes.some((n) => n.includes("multiplied by R"))).toBe(true);
    expect(c.mass_ratio.count).toBe(1);
    expect(c.mass_ratio.birge_ratio).toBeNull();
    expect(c.mass_ratio.most_discordant).toBeNull();
    expect(c.mass_ratio.estimate!.value).toBeCloseTo(0.5, 15);
  });

  it("leaves σ alone when R ≤ 1 and says so", () => {
    const c = combineObject(
      object("vell-4", [measurement("x", [massResult("total_mass", 1.00, 0.1)]), measurement("y", [massResult("total_mass", 1.05, 0.1)])]),
    ).total_mass;
    expect(c.scaled).toBe(false);
    expect(c.estimate!.sigma_plus_si).toBe(c.estimate!.internal_sigma_plus_si);
    expect(c.notes.some((n) => n.includes("not scaled"))).toBe(true);
  });

  it("names the heaviest and the most discordant measurement", () => {
    const c = combineObject(
      object("vell-5", [
        measurement("precise", [massResult("total_mass", 1.0, 0.01)]),
        measurement("rough", [massResult("total_mass", 1.5, 0.2)]),
        measurement("middling", [massResult("total_mass", 1.02, 0.05)]),
      ]),
    ).total_mass;
    expect(c.heaviest).toBe("precise");
    expect(c.most_discordant).toBe("rough");
    const rough = c.inputs.find((i) => i.key === "rough")!;
    expect(rough.chi2).toBeCloseTo(rough.pull ** 2, 14);
    expect(rough.pull).toBeGreaterThan(2);
    expect(c.inputs.reduce((s, i) => s + i.chi2, 0)).toBeCloseTo(c.chi2!, 12);
  });

  it("lists measurements marked not to be used with their comment, and does not combine them", () => {
    const c = combineObject(
      object("vell-6", [
        measurement("kept", [massResult("total_mass", 3.0, 0.2)]),
        measurement("dropped", [massResult("total_mass", 9.0, 0.2)], { use: false, comment: "superseded by the 2024 orbit" }),
        measurement("silent", [massResult("total_mass", 8.0, 0.2)], { use: false }),
        measurement("exact", [massResult("total_mass", 3.1, 0)]),
      ]),
    ).total_mass;
    expect(c.count).toBe(1);
    expect(c.estimate!.value).toBeCloseTo(3.0, 14);
    expect(c.excluded).toEqual([
      { key: "dropped", method: "relative-orbit", reason: "marked not to be used: superseded by the 2024 orbit" },
      { key: "exact", method: "relative-orbit", reason: "no positive uncertainty, so it cannot be weighted" },
      { key: "silent", method: "relative-orbit", reason: "marked not to be used (no comment given)" },
    ]);
  });

  it("gives no estimate when nothing can be combined", () => {
    const c = combineObject(object("vell-7", [measurement("only", [massResult("total_mass", 3.0, 0.2)], { use: false })])).total_mass;
    expect(c.count).toBe(0);
    expect(c.estimate).toBeNull();
    expect(c.chi2).toBeNull();
    expect(c.heaviest).toBeNull();
    expect(c.excluded).toHaveLength(1);
  });

  it("uses the linear-σ procedure when a side differs", () => {
    const c = combineObject(
      object("vell-8", [measurement("p", [massResult("total_mass", 2.0, 0.3, 0.1)]), measurement("q", [massResult("total_mass", 2.2, 0.2)])]),
    ).total_mass;
    expect(c.procedure).toBe("linear-sigma");
    expect(c.estimate!.sigma_plus).not.toBeCloseTo(c.estimate!.sigma_minus, 6);
    expect(c.notes.some((n) => n.includes("linear-σ"))).toBe(true);
  });

  it("picks the display unit most measurements use", () => {
    const mearth = (name: string, v: number, s: number) => ({
      ...massResult(name, v, s),
      display_unit: "Mearth",
      display_unit_latex: "M_{\\oplus}",
    });
    const c = combineObject(
      object("vell-9", [
        measurement("a", [mearth("total_mass", 3e-6, 1e-7)]),
        measurement("b", [massResult("total_mass", 3.1e-6, 1e-7)]),
        measurement("c", [mearth("total_mass", 3.05e-6, 1e-7)]),
      ]),
    ).total_mass;
    expect(c.estimate!.display_unit).toBe("Mearth");
    // 1 M☉ / 1 M⊕ = GM☉/GM⊕ (IAU 2015 B3 nominal values, exact ratio)
    expect(c.estimate!.value).toBeCloseTo(3.05e-6 * (1.3271244e20 / 3.986004e14), 9);
  });

  it("combines a whole report keyed by sorted object id", () => {
    const all = combineReport([object("b-obj", [measurement("m", [massResult("total_mass", 1, 0.1)])]), object("a-obj", [])]);
    expect(Object.keys(all)).toEqual(["a-obj", "b-obj"]);
    expect(all["a-obj"]).toEqual({});
  });
});
