import { describe, expect, it } from "vitest";
import { METHODS, getMethod } from "../../src/methods/index.js";
import type { MethodDefinition, SIInputs } from "../../src/methods/method.js";
import { propagateFirstOrder } from "../../src/uncertainty/first-order.js";
import { MAX_ATTEMPTS_PER_DRAW, runMonteCarlo, type DrawInput, type MonteCarloRun } from "../../src/uncertainty/monte-carlo.js";
import { SAMPLES } from "../methods/sample-inputs.js";

/** Inputs with a relative 1σ on every slot (both sides, or `minus` apart). */
function withSigma(si: SIInputs, rel: number, minusRel = rel): DrawInput[] {
  return Object.keys(si)
    .sort()
    .map((slot) => ({ slot, value: si[slot], plus: rel * Math.abs(si[slot]), minus: minusRel * Math.abs(si[slot]) }));
}

function relDiff(a: number, b: number): number {
  return a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

function worstDifference(a: MonteCarloRun, b: MonteCarloRun): number {
  let worst = 0;
  for (const [name, s] of Object.entries(a.summaries)) {
    const t = b.summaries[name];
    worst = Math.max(worst, relDiff(s.median, t.median), relDiff(s.p16, t.p16), relDiff(s.p84, t.p84), relDiff(s.mean, t.mean));
    // the sd is a difference of nearby numbers: compare it on the scale of the mean too
    worst = Math.max(worst, Math.abs(s.sd - t.sd) / Math.max(s.sd, 1e-300 + Math.abs(s.mean) * 1e-6));
  }
  return worst;
}

const singleLined = getMethod("single-lined")!;
const relativeOrbit = getMethod("relative-orbit")!;
const PLANET = SAMPLES["single-lined"][3].inputs;

describe("runMonteCarlo", () => {
  it("repeats for a seed and changes with it", () => {
    const inputs = withSigma(PLANET, 0.02, 0.03);
    const a = runMonteCarlo(singleLined, inputs, 5000, 99);
    expect(runMonteCarlo(singleLined, inputs, 5000, 99)).toEqual(a);
    const b = runMonteCarlo(singleLined, inputs, 5000, 100);
    expect(b.summaries.mass_function.median).not.toBe(a.summaries.mass_function.median);
    expect(a.draws).toBe(5000);
  });

  it("does not depend on the block size, on either path", () => {
    // eccentricity 0.05 ± 40 %: a few draws fall below zero and are redrawn
    const inputs = withSigma(PLANET, 0.02).map((i) => (i.slot === "eccentricity" ? { ...i, plus: 0.02, minus: 0.02 } : i));
    for (const path of ["auto", "per-draw"] as const) {
      const runs = [4096, 1000, 333, 1].map((blockSize) => runMonteCarlo(singleLined, inputs, 3000, 5, { blockSize, path }));
      expect(runs[0].rejected).toBeGreaterThan(0);
      for (const r of runs.slice(1)) expect(r).toEqual(runs[0]);
    }
  });

  for (const method of METHODS) {
    it(`${method.id}: the kernel makes the same draws and refusals as validate() and compute(), summaries to 1e-12`, () => {
      SAMPLES[method.id].forEach((sample, k) => {
        // wide enough that some draws leave the domain (a negative eccentricity, a component above the total)
        const inputs = withSigma(sample.inputs, 0.03, 0.05).map((i) =>
          i.slot === "eccentricity" ? { ...i, plus: 0.03, minus: 0.03 } : i.slot === "inclination" ? { ...i, plus: 0.05, minus: 0.08 } : i,
        );
        const kernel = runMonteCarlo(method, inputs, 2000, 700 + k);
        const perDraw = runMonteCarlo(method, inputs, 2000, 700 + k, { path: "per-draw" });
        expect([kernel.draws, kernel.rejected], sample.label).toEqual([perDraw.draws, perDraw.rejected]);
        expect(Object.keys(kernel.summaries)).toEqual(Object.keys(perDraw.summaries));
        expect(worstDifference(kernel, perDraw), sample.label).toBeLessThan(1e-12);
      });
    });
  }

  it("agrees with first-order propagation where the uncertainties are small (0.1 %)", () => {
    // With 20 000 draws the 16th and 84th percentiles scatter by about 0.012 σ and the
    // median by 0.009 σ (√(p(1−p)/n)/φ); at 0.1 % input uncertainties the curvature of
    // every method is far below that. So: median within 0.05 σ, half-width within 3 %.
    for (const method of METHODS) {
      for (const sample of SAMPLES[method.id]) {
        const inputs = withSigma(sample.inputs, 1e-3).map((i) => (i.value === 0 ? { ...i, plus: 1e-4, minus: 1e-4 } : i));
        if (sample.inputs.eccentricity === 0) continue; // a boundary value: the draws are one-sided there
        const nominal = method.compute(sample.inputs);
        const partials = method.partials(sample.inputs);
        const sides = Object.fromEntries(inputs.map((i) => [i.slot, { plus: i.plus, minus: i.minus }]));
        const run = runMonteCarlo(method, inputs, 20_000, 1);
        for (const [name, value] of Object.entries(nominal)) {
          const fo = propagateFirstOrder(partials[name], sides);
          const s = run.summaries[name];
          const label = `${method.id} / ${sample.label} / ${name}`;
          expect(Math.abs(s.median - value) / fo.sigma, label).toBeLessThan(0.05);
          expect(Math.abs((s.p84 - s.p16) / 2 / fo.sigma - 1), label).toBeLessThan(0.03);
          expect(Math.abs(s.sd / fo.sigma - 1), label).toBeLessThan(0.03);
        }
      }
    }
  });

  it("stops after five attempts per draw when the domain refuses nearly everything", () => {
    // e = 0.5 ± 5: about 8 % of draws fall in [0, 1)
    const inputs = withSigma(PLANET, 0.01).map((i) => (i.slot === "eccentricity" ? { ...i, value: 0.5, plus: 5, minus: 5 } : i));
    for (const path of ["auto", "per-draw"] as const) {
      const run = runMonteCarlo(singleLined, inputs, 1000, 3, { path });
      expect(run.draws).toBeLessThan(1000);
      expect(run.draws).toBeGreaterThan(200);
      expect(run.draws + run.rejected).toBe(1000 * MAX_ATTEMPTS_PER_DRAW);
    }
  });

  it("refuses draws whose results overflow, on both paths alike", () => {
    // a³ overflows for about half of these draws
    const inputs: DrawInput[] = [
      { slot: "period", value: 1e9, plus: 1e6, minus: 1e6 },
      { slot: "semimajor_axis", value: 1.655e102, plus: 0.03e102, minus: 0.03e102 },
    ];
    const kernel = runMonteCarlo(relativeOrbit, inputs, 2000, 8);
    const perDraw = runMonteCarlo(relativeOrbit, inputs, 2000, 8, { path: "per-draw" });
    expect(kernel.rejected).toBeGreaterThan(100);
    expect(kernel.draws).toBe(2000);
    expect([kernel.draws, kernel.rejected]).toEqual([perDraw.draws, perDraw.rejected]);
    expect(Number.isFinite(kernel.summaries.total_mass.p84)).toBe(true);
  });

  it("never calls the kernel for a combination of inputs that validation refuses", () => {
    let calls = 0;
    const counting: MethodDefinition = {
      ...relativeOrbit,
      batch(columns, n, out, valid) {
        calls++;
        relativeOrbit.batch!(columns, n, out, valid);
      },
    };
    const good = withSigma(SAMPLES["relative-orbit"][0].inputs, 0.01);
    runMonteCarlo(counting, good, 100, 1);
    expect(calls).toBeGreaterThan(0);
    calls = 0;
    // both a parallax and a distance: ambiguous whatever the values
    const ambiguous = withSigma({ ...SAMPLES["relative-orbit"][3].inputs, distance: 8e17 }, 0.01);
    const run = runMonteCarlo(counting, ambiguous, 100, 1);
    expect(calls).toBe(0);
    expect(run.draws).toBe(0);
    expect(run.rejected).toBe(100 * MAX_ATTEMPTS_PER_DRAW);
  });

  it("keeps exact inputs fixed and refuses a count of draws that is not a whole number", () => {
    const inputs = withSigma(PLANET, 0).map((i) => (i.slot === "k1" ? { ...i, plus: 1, minus: 1 } : i));
    const run = runMonteCarlo(singleLined, inputs, 500, 2);
    // only K varies: a₁ sin i ∝ K, so its percentiles are the nominal value scaled by K's
    const k = PLANET.k1;
    const a1 = singleLined.compute(PLANET).a1_sin_i;
    expect(run.summaries.a1_sin_i.median / a1).toBeCloseTo(1, 2);
    expect((run.summaries.a1_sin_i.p84 - run.summaries.a1_sin_i.p16) / 2 / a1).toBeCloseTo(1 / k, 2);
    expect(() => runMonteCarlo(singleLined, inputs, 2.5, 1)).toThrow(/whole number/);
    expect(runMonteCarlo(singleLined, inputs, 0, 1).draws).toBe(0);
  });
});
