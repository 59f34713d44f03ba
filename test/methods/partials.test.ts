import { describe, expect, it } from "vitest";
import { METHODS, relativeOrbit, singleLined } from "../../src/methods/index.js";
import type { MethodDefinition, SIInputs } from "../../src/methods/method.js";
import { SAMPLES } from "./sample-inputs.js";

/**
 * Every method's analytic partial derivatives against central finite
 * differences, for every sample input set (each combination of optional
 * inputs).
 *
 * Step: h = 1e-6 |x| (1e-6 when x = 0). The central difference has a
 * truncation error of order h² R‴/6, about 1e-12 relative, and a rounding
 * error of order ε|R|/h, about 1e-10 of the natural scale |R|/|x|. A
 * tolerance of 1e-6 of that scale is well clear of both, while a wrong
 * factor or exponent in a partial is an error of order one.
 */

const REL_STEP = 1e-6;
const TOLERANCE = 1e-6;

function numericPartial(compute: (si: SIInputs) => Record<string, number>, si: SIInputs, slot: string, result: string): number {
  const x = si[slot];
  const h = x === 0 ? REL_STEP : REL_STEP * Math.abs(x);
  const up = compute({ ...si, [slot]: x + h })[result];
  const down = compute({ ...si, [slot]: x - h })[result];
  return (up - down) / (2 * h);
}

/** Every disagreement between the analytic and the numeric partials, in words; also checks the row layout. */
function partialMismatches(method: Pick<MethodDefinition, "compute" | "partials">, si: SIInputs): string[] {
  const out: string[] = [];
  const results = method.compute(si);
  const partials = method.partials(si);
  const present = Object.keys(si).sort();
  if (Object.keys(partials).sort().join() !== Object.keys(results).sort().join()) {
    out.push(`partials for [${Object.keys(partials)}] but results [${Object.keys(results)}]`);
  }
  for (const [result, value] of Object.entries(results)) {
    const row = partials[result] ?? {};
    if (Object.keys(row).sort().join() !== present.join()) out.push(`${result}: partials for [${Object.keys(row)}], inputs [${present}]`);
    for (const slot of present) {
      const analytic = row[slot];
      const numeric = numericPartial(method.compute, si, slot, result);
      const x = si[slot];
      const scale = Math.max(Math.abs(analytic ?? 0), Math.abs(value) / (x === 0 ? 1 : Math.abs(x)));
      if (!(Math.abs(analytic - numeric) <= TOLERANCE * scale)) {
        out.push(`∂${result}/∂${slot}: analytic ${analytic}, numeric ${numeric}`);
      }
    }
  }
  return out;
}

describe("analytic partial derivatives", () => {
  it("has sample inputs for every registered method", () => {
    for (const m of METHODS) expect(SAMPLES[m.id]?.length ?? 0, m.id).toBeGreaterThanOrEqual(4);
    expect(Object.keys(SAMPLES).sort()).toEqual(METHODS.map((m) => m.id).sort());
  });

  for (const method of METHODS) {
    for (const sample of SAMPLES[method.id] ?? []) {
      it(`${method.id}: ${sample.label}`, () => {
        const si = sample.inputs;
        expect(method.validate(si)).toEqual([]);
        const results = method.compute(si);
        expect(Object.keys(results).length).toBeGreaterThan(0);
        for (const [name, v] of Object.entries(results)) expect(Number.isFinite(v), name).toBe(true);
        expect(partialMismatches(method, si)).toEqual([]);
      });
    }
  }

  it("the comparison catches a partial that is wrong by 1e-4 of its size", () => {
    const si = SAMPLES["single-lined"][3].inputs;
    const skewed = {
      compute: singleLined.compute,
      partials: (x: SIInputs) => {
        const p = singleLined.partials(x);
        p.secondary_mass.inclination *= 1 + 1e-4;
        return p;
      },
    };
    expect(partialMismatches(skewed, si)).toEqual([expect.stringContaining("∂secondary_mass/∂inclination")]);
  });

  it("the comparison catches a missing and a spurious dependence", () => {
    const si = SAMPLES["relative-orbit"][1].inputs;
    const skewed = {
      compute: relativeOrbit.compute,
      partials: (x: SIInputs) => {
        const p = relativeOrbit.partials(x);
        p.total_mass.eccentricity = (1e-4 * relativeOrbit.compute(x).total_mass) / x.eccentricity;
        delete p.total_mass.parallax;
        return p;
      },
    };
    const found = partialMismatches(skewed, si);
    expect(found.some((s) => s.includes("∂total_mass/∂eccentricity"))).toBe(true);
    expect(found.some((s) => s.startsWith("total_mass: partials for"))).toBe(true);
  });
});
