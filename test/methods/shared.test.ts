import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { DEFAULT_SET } from "../../src/constants/sets.js";
import {
  AU,
  alignEquations,
  checkRanges,
  companionMassPartials,
  distanceOf,
  lengthOf,
  solveCompanionMass,
} from "../../src/methods/shared.js";
import type { MethodInput } from "../../src/methods/method.js";
import { ANGLE, DIMENSIONLESS, TIME } from "../../src/units/dimension.js";
import { si } from "./sample-inputs.js";

const relErr = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** Cardano's closed form for the mass fraction u = m/(M₁+m), which solves u³ + cu − c = 0 with c = f/(s³M₁). */
function cardanoFraction(c: number): number {
  const r = Math.sqrt((c * c) / 4 + (c * c * c) / 27);
  return Math.cbrt(c / 2 + r) + Math.cbrt(c / 2 - r);
}

describe("solveCompanionMass: exact root of (m sin i)³ = f (M₁ + m)²", () => {
  it("satisfies the cubic to 1e-12 over thirty decades of f/M₁ and any inclination", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -15, max: 15, noNaN: true }),
        fc.double({ min: 10, max: 22, noNaN: true }),
        fc.double({ min: 1e-3, max: 1, noNaN: true }),
        (logRatio, logM1, s) => {
          const m1 = 10 ** logM1;
          const f = m1 * 10 ** logRatio;
          const m = solveCompanionMass(f, m1, s);
          const lhs = (m * s) ** 3;
          const rhs = f * (m1 + m) ** 2;
          return m > 0 && relErr(lhs, rhs) < 1e-12;
        },
      ),
      { numRuns: 2000, seed: 20240611 },
    );
  });

  it("gives the exact roots m = M₁ for f = s³M₁/4 and m = 2M₁ for f = 8s³M₁/9", () => {
    const m1 = si(1.4, "Msun");
    const s = Math.sin(si(63, "deg"));
    expect(relErr(solveCompanionMass((s ** 3 * m1) / 4, m1, s), m1)).toBeLessThan(1e-14);
    expect(relErr(solveCompanionMass((8 * s ** 3 * m1) / 9, m1, s), 2 * m1)).toBeLessThan(1e-14);
  });

  it("agrees with Cardano's closed form where that form is well conditioned", () => {
    for (const c of [1e-3, 0.02, 0.25, 1, 3.7, 40, 1e3]) {
      const m1 = 1e20;
      const u = cardanoFraction(c);
      const expected = (m1 * u) / (1 - u);
      expect(relErr(solveCompanionMass(c * m1, m1, 1), expected), `c = ${c}`).toBeLessThan(1e-11);
    }
  });

  it("approaches the small-companion limit m ≈ (f M₁²)^{1/3} / sin i, off by (2/3) m/M₁", () => {
    const m1 = si(1, "Msun");
    const s = 0.8;
    let previous = Infinity;
    for (const c of [1e-6, 1e-9, 1e-12, 1e-15]) {
      const f = c * s ** 3 * m1;
      const m = solveCompanionMass(f, m1, s);
      const shortcut = Math.cbrt(f * m1 * m1) / s;
      const excess = m / shortcut - 1;
      // series v = c^{1/3} (1 + (2/3) c^{1/3} + O(c^{2/3})): the ratio tends to 2/3 with an error of order v
      const v = m / m1;
      expect(Math.abs(excess / v - 2 / 3)).toBeLessThan(v);
      expect(excess).toBeLessThan(previous);
      previous = excess;
    }
  });

  it("approaches m ≈ f/sin³i + 2M₁ for a companion much heavier than the star", () => {
    const m1 = si(0.7, "Msun");
    const f = 1e6 * m1;
    expect(relErr(solveCompanionMass(f, m1, 1), f + 2 * m1)).toBeLessThan(1e-11);
  });

  it("handles the edges f = 0 and M₁ = 0", () => {
    expect(solveCompanionMass(0, 1e20, 0.5)).toBe(0);
    expect(solveCompanionMass(1e20, 0, 0.5)).toBe(8e20);
  });

  it("refuses impossible arguments (a programmer mistake, not a data problem)", () => {
    expect(() => solveCompanionMass(-1, 1, 1)).toThrow();
    expect(() => solveCompanionMass(1, 1, 0)).toThrow();
    expect(() => solveCompanionMass(Number.NaN, 1, 1)).toThrow();
  });
});

describe("companionMassPartials", () => {
  it("match central differences of the solve", () => {
    const m1 = si(1.1, "Msun");
    const f = si(0.004, "Msun");
    const s = 0.93;
    const m = solveCompanionMass(f, m1, s);
    const d = companionMassPartials(m, m1, s);
    const h = 1e-6;
    const numeric = (g: (x: number) => number, x: number) => (g(x * (1 + h)) - g(x * (1 - h))) / (2 * h * x);
    expect(relErr(d.dF, numeric((x) => solveCompanionMass(x, m1, s), f))).toBeLessThan(1e-7);
    expect(relErr(d.dM1, numeric((x) => solveCompanionMass(f, x, s), m1))).toBeLessThan(1e-7);
    expect(relErr(d.dSin, numeric((x) => solveCompanionMass(f, m1, x), s))).toBeLessThan(1e-7);
  });

  it("reduce to the small-companion scalings m ∝ f^{1/3} M₁^{2/3} / sin i", () => {
    const m1 = si(1, "Msun");
    const f = 1e-15 * m1;
    const m = solveCompanionMass(f, m1, 1);
    const d = companionMassPartials(m, m1, 1);
    expect((d.dF * f) / m).toBeCloseTo(1 / 3, 4);
    expect((d.dM1 * m1) / m).toBeCloseTo(2 / 3, 4);
    expect(d.dSin / m).toBeCloseTo(-1, 4);
  });
});

describe("distance and angle-to-length conversion", () => {
  it("puts a star of parallax 1″ at 1 pc (IAU 2015 B2: 1 pc = 648000/π au)", () => {
    const d = distanceOf({ parallax: si(1, "arcsec") })!;
    // both sides are 648000/π au computed in a different order: a few ulp
    expect(relErr(d.value, DEFAULT_SET.pc.value)).toBeLessThan(4e-16);
    expect(relErr(d.partials.parallax, -DEFAULT_SET.pc.value / si(1, "arcsec"))).toBeLessThan(4e-16);
  });

  it("uses 1 au = 149 597 870 700 m exactly (IAU 2012 B2)", () => {
    expect(AU).toBe(149597870700);
  });

  it("turns 1″ at 10 pc into 10 au", () => {
    const a = lengthOf({ angular_semimajor_axis: si(1, "arcsec"), distance: si(10, "pc") }, "semimajor_axis", "angular_semimajor_axis")!;
    expect(relErr(a.value, 10 * AU)).toBeLessThan(4e-16);
    expect(a.partials.distance).toBe(si(1, "arcsec"));
  });

  it("prefers a linear length and gives nothing without a distance", () => {
    expect(lengthOf({ semimajor_axis: 5, parallax: 1 }, "semimajor_axis", "angular_semimajor_axis")).toEqual({ value: 5, partials: { semimajor_axis: 1 } });
    expect(lengthOf({ angular_semimajor_axis: 1e-6 }, "semimajor_axis", "angular_semimajor_axis")).toBeUndefined();
  });
});

describe("checkRanges", () => {
  const inputs: MethodInput[] = [
    { slot: "period", field: "period", dimension: TIME, symbol: "P", description: "The period", optional: false },
    { slot: "eccentricity", field: "eccentricity", dimension: DIMENSIONLESS, symbol: "e", description: "The eccentricity", optional: true },
    { slot: "inclination", field: "inclination", dimension: ANGLE, symbol: "i", description: "The inclination", optional: true },
  ];
  const rules = { period: "positive", eccentricity: "eccentricity", inclination: "inclination" } as const;
  const codes = (x: Record<string, number>) => checkRanges(x, inputs, rules).map((i) => `${i.code}@${i.path}`);

  it("accepts e = 0 and an inclination just inside the open range", () => {
    expect(codes({ period: 1, eccentricity: 0, inclination: 0.01 })).toEqual([]);
  });

  it("collects every problem at once", () => {
    expect(codes({ period: -1, eccentricity: 1, inclination: Math.PI, extra: 2 })).toEqual([
      "unknown-input@extra",
      "out-of-range@period",
      "eccentricity-out-of-range@eccentricity",
      "inclination-out-of-range@inclination",
    ]);
  });

  it("rejects non-finite values and a nearly face-on orbit", () => {
    expect(codes({ period: Number.POSITIVE_INFINITY })).toEqual(["out-of-range@period"]);
    expect(codes({ period: 1, inclination: 1e-8 })).toEqual(["inclination-out-of-range@inclination"]);
    expect(codes({ period: 1, eccentricity: Number.NaN })).toEqual(["out-of-range@eccentricity"]);
  });

  it("gives every issue a message and a hint", () => {
    for (const i of checkRanges({ period: 0, eccentricity: -0.1 }, inputs, rules)) {
      expect(i.message.length).toBeGreaterThan(10);
      expect(i.hint?.length ?? 0).toBeGreaterThan(10);
    }
  });
});

describe("alignEquations", () => {
  const general = [{ results: ["a"], latex: "A" }, { results: ["b", "c"], latex: "B" }, { results: ["d"], latex: "D" }];

  it("keeps the general order and leaves non-applying equations empty", () => {
    expect(alignEquations(general, [{ results: ["d"], latex: "d=1" }, { results: ["a"], latex: "a=2" }])).toEqual([
      { results: ["a"], latex: "a=2" },
      { results: ["b", "c"], latex: "" },
      { results: ["d"], latex: "d=1" },
    ]);
  });

  it("refuses an equation with no general form", () => {
    expect(() => alignEquations(general, [{ results: ["c"], latex: "c=1" }])).toThrow();
  });
});
