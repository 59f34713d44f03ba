import fc from "fast-check";
import { dot, sum } from "mathjs";
import { describe, expect, it } from "vitest";
import { birgeScale, weightedAverage, type Datum } from "../../src/combine/weighted-average.js";

const sym = (value: number, s: number): Datum => ({ value, plus: s, minus: s });

/*
 * Taylor 1997, An Introduction to Error Analysis, 2nd ed., University Science Books, §7.2, the
 * worked example of three measurements of one resistance, 11 ± 1, 12 ± 1 and 10 ± 3 ohms, whose
 * weighted average is quoted as 11.4 ± 0.7 ohms (from memory).
 */
describe("weighted mean: Taylor 1997, §7.2 resistance example (from memory)", () => {
  it("gives 11.4 ± 0.7", () => {
    const a = weightedAverage([sym(11, 1), sym(12, 1), sym(10, 3)]);
    // the book rounds to one decimal: agreement within half of its last digit
    expect(Math.abs(a.mean - 11.4)).toBeLessThan(0.05);
    expect(Math.abs(a.plus - 0.7)).toBeLessThan(0.05);
    // and exactly the defining sums: Σwx/Σw = (11 + 12 + 10/9)/(2 + 1/9), σ = (2 + 1/9)^(-1/2)
    expect(a.mean).toBeCloseTo((11 + 12 + 10 / 9) / (2 + 1 / 9), 13);
    expect(a.plus).toBeCloseTo(1 / Math.sqrt(2 + 1 / 9), 14);
    expect(a.asymmetric).toBe(false);
  });
});

/*
 * Inverse-variance weighted mean and its variance, 1/σ² = Σ 1/σᵢ² (Bevington & Robinson 2003,
 * Data Reduction and Error Analysis for the Physical Sciences, 3rd ed., McGraw-Hill, ch. 4,
 * from memory), checked against sums computed independently with mathjs (npm registry).
 */
describe("weighted mean against mathjs sums (Bevington & Robinson 2003, ch. 4, from memory)", () => {
  const datum = fc.record({
    value: fc.double({ min: -1e3, max: 1e3, noNaN: true }),
    s: fc.double({ min: 1e-2, max: 1e2, noNaN: true }),
  });
  it("matches Σwx/Σw, 1/√Σw and Σw(x−x̄)² for any symmetric data", () => {
    fc.assert(
      fc.property(fc.array(datum, { minLength: 1, maxLength: 12 }), (rows) => {
        const a = weightedAverage(rows.map((r) => sym(r.value, r.s)));
        const x = rows.map((r) => r.value);
        const w = rows.map((r) => 1 / (r.s * r.s));
        const mean = (dot(w, x) as number) / (sum(w) as number);
        const chi2 = sum(x.map((xi, i) => w[i] * (xi - mean) ** 2)) as number;
        // floating-point sums in a different order: agreement to 1e-9 of the spread of the data
        const span = Math.max(...x.map(Math.abs), 1);
        expect(Math.abs(a.mean - mean)).toBeLessThan(1e-9 * span);
        expect(a.plus).toBeCloseTo(1 / Math.sqrt(sum(w) as number), 10);
        expect(Math.abs(a.chi2 - chi2)).toBeLessThan(1e-8 * Math.max(1, chi2));
        expect(a.weights.reduce((s, v) => s + v, 0)).toBeCloseTo(1, 12);
      }),
      { seed: 20240611, numRuns: 200 },
    );
  });
});

/*
 * Birge 1932, Phys. Rev. 40, 207: the ratio of the external error of the mean,
 * σ_ext² = Σwᵢ(xᵢ−x̄)² / ((N−1)Σwᵢ), to the internal error σ_int² = 1/Σwᵢ; it equals √(χ²/(N−1)).
 */
describe("Birge ratio: Birge 1932, Phys. Rev. 40, 207", () => {
  it("equals the external over the internal error, computed here from the definition", () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ value: fc.double({ min: -50, max: 50, noNaN: true }), s: fc.double({ min: 0.1, max: 10, noNaN: true }) }), {
          minLength: 2,
          maxLength: 10,
        }),
        (rows) => {
          const a = weightedAverage(rows.map((r) => sym(r.value, r.s)));
          const w = rows.map((r) => 1 / (r.s * r.s));
          const sw = w.reduce((s, v) => s + v, 0);
          const mean = rows.reduce((s, r, i) => s + w[i] * r.value, 0) / sw;
          const ext = Math.sqrt(rows.reduce((s, r, i) => s + w[i] * (r.value - mean) ** 2, 0) / ((rows.length - 1) * sw));
          const int = 1 / Math.sqrt(sw);
          expect(a.dof).toBe(rows.length - 1);
          // rounding in two independent sums of up to ten terms
          expect(Math.abs(a.birge! - ext / int)).toBeLessThan(1e-9 * Math.max(1, ext / int));
        },
      ),
      { seed: 1932, numRuns: 200 },
    );
  });

  it("is undefined for one measurement", () => {
    const a = weightedAverage([sym(3, 0.2)]);
    expect(a.birge).toBeNull();
    expect(a.dof).toBe(0);
    expect(a.chi2).toBe(0);
  });
});

/*
 * The Particle Data Group's procedure for averages (Review of Particle Physics, Introduction,
 * the section on averages and fits; from memory): weighted mean, χ², S = √(χ²/(N−1)), and the
 * error of the mean multiplied by S when S > 1, left alone when S ≤ 1. The numbers below are
 * computed by hand.
 */
describe("scale factor: the PDG procedure (from memory), hand-computed cases", () => {
  it("two measurements 1.0 ± 0.1 and 1.5 ± 0.1: S = √12.5, scaled σ = 0.25", () => {
    const a = weightedAverage([sym(1.0, 0.1), sym(1.5, 0.1)]);
    expect(a.mean).toBeCloseTo(1.25, 14);
    expect(a.chi2).toBeCloseTo(12.5, 11);
    expect(a.birge).toBeCloseTo(Math.sqrt(12.5), 11);
    expect(a.plus).toBeCloseTo(0.1 / Math.SQRT2, 14);
    // σ/√2 × √12.5 = 0.1 × √6.25
    expect(a.plus * birgeScale(a.birge)).toBeCloseTo(0.25, 12);
  });

  it("leaves the error alone when S ≤ 1", () => {
    const a = weightedAverage([sym(1.0, 0.1), sym(1.05, 0.1)]);
    // χ² = 2 × 0.25² = 0.125
    expect(a.birge).toBeCloseTo(Math.sqrt(0.125), 12);
    expect(birgeScale(a.birge)).toBe(1);
    expect(birgeScale(null)).toBe(1);
    expect(birgeScale(1)).toBe(1);
    expect(birgeScale(1.5)).toBe(1.5);
  });

  it("two equal measurements halve the variance", () => {
    const a = weightedAverage([sym(5, 1), sym(5, 1)]);
    expect(a.mean).toBe(5);
    expect(a.plus).toBeCloseTo(Math.SQRT1_2, 15);
    expect(a.chi2).toBe(0);
    expect(a.weights).toEqual([0.5, 0.5]);
  });

  it("one dominant measurement sets the mean", () => {
    // w = 10⁴ and 10⁻²: mean = (10·10⁴ + 20·10⁻²)/(10⁴ + 10⁻²)
    const a = weightedAverage([sym(10, 0.01), sym(20, 10)]);
    expect(a.mean).toBeCloseTo((1e5 + 0.2) / (1e4 + 1e-2), 12);
    expect(a.weights[0]).toBeCloseTo(1e4 / (1e4 + 1e-2), 14);
    expect(a.pulls[1]).toBeCloseTo((20 - a.mean) / 10, 14);
  });
});

/*
 * Barlow 2004, "Asymmetric statistical errors", arXiv:physics/0406120 (also PHYSTAT 2003;
 * from memory): the linear-σ model σ(μ) = s + s′(μ − x), s = 2σ₊σ₋/(σ₊+σ₋), s′ = (σ₊−σ₋)/(σ₊+σ₋),
 * estimate at the χ² minimum and interval at Δχ² = 1. The checks below use only that definition.
 */
describe("asymmetric uncertainties: Barlow's linear-σ model", () => {
  const model = (d: Datum) => ({ x: d.value, s: (2 * d.plus * d.minus) / (d.plus + d.minus), sp: (d.plus - d.minus) / (d.plus + d.minus) });
  const chi2 = (data: Datum[], mu: number) =>
    data.map(model).reduce((c, m) => c + ((mu - m.x) / (m.s + m.sp * (mu - m.x))) ** 2, 0);

  it("gives back one measurement with its own two sides", () => {
    const a = weightedAverage([{ value: 2.0, plus: 0.5, minus: 0.2 }]);
    expect(a.asymmetric).toBe(true);
    // σ(x + σ₊) = σ₊ and σ(x − σ₋) = σ₋, so Δχ² = 1 falls exactly on the two sides
    expect(a.mean).toBe(2.0);
    expect(a.plus).toBe(0.5);
    expect(a.minus).toBe(0.2);
    expect(a.chi2).toBe(0);
  });

  it("two identical measurements: δ₊ = s/(√2 − s′), δ₋ = s/(√2 + s′)", () => {
    const d = { value: 10, plus: 3, minus: 1 };
    const { s, sp } = model(d);
    const a = weightedAverage([d, d]);
    expect(a.mean).toBeCloseTo(10, 13);
    expect(a.plus).toBeCloseTo(s / (Math.SQRT2 - sp), 11);
    expect(a.minus).toBeCloseTo(s / (Math.SQRT2 + sp), 11);
    expect(a.chi2).toBeCloseTo(0, 20);
  });

  it("solves the estimating equation Σ sᵢ(μ − xᵢ)/σᵢ(μ)³ = 0, with Δχ² = 1 at both ends", () => {
    const data: Datum[] = [
      { value: 1.9, plus: 0.7, minus: 0.5 },
      { value: 2.4, plus: 0.6, minus: 0.8 },
      { value: 3.1, plus: 0.5, minus: 0.4 },
    ];
    const a = weightedAverage(data);
    const grad = data.map(model).reduce((g, m) => g + (m.s * (a.mean - m.x)) / (m.s + m.sp * (a.mean - m.x)) ** 3, 0);
    expect(Math.abs(grad)).toBeLessThan(1e-12);
    expect(chi2(data, a.mean)).toBeCloseTo(a.chi2, 12);
    expect(chi2(data, a.mean + a.plus) - a.chi2).toBeCloseTo(1, 10);
    expect(chi2(data, a.mean - a.minus) - a.chi2).toBeCloseTo(1, 10);
    // not the average of the two sides: symmetrised inputs give a different centre
    const naive = weightedAverage(data.map((d) => sym(d.value, (d.plus + d.minus) / 2)));
    expect(Math.abs(naive.mean - a.mean)).toBeGreaterThan(0.01);
  });

  it("mirrors: negated values with swapped sides give the negated average", () => {
    const data: Datum[] = [
      { value: 4, plus: 1, minus: 0.5 },
      { value: 6, plus: 0.8, minus: 1.2 },
    ];
    const a = weightedAverage(data);
    const b = weightedAverage(data.map((d) => ({ value: -d.value, plus: d.minus, minus: d.plus })));
    expect(b.mean).toBeCloseTo(-a.mean, 12);
    expect(b.plus).toBeCloseTo(a.minus, 10);
    expect(b.minus).toBeCloseTo(a.plus, 10);
  });

  it("refuses a measurement without a positive uncertainty", () => {
    expect(() => weightedAverage([])).toThrow();
    expect(() => weightedAverage([{ value: 1, plus: 0, minus: 0 }])).toThrow();
  });
});
