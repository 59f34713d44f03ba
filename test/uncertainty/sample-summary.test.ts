import fc from "fast-check";
import { erf } from "mathjs";
import { describe, expect, it } from "vitest";
import { P16, P84, SampleAccumulator, summarizeSample } from "../../src/uncertainty/sample-summary.js";
import { summarizeSorted } from "../../src/uncertainty/monte-carlo.js";
import { Random } from "../../src/uncertainty/random.js";

/**
 * The bucket selection against sorting: the percentiles must be the very
 * numbers the sorted sample gives (type-7 interpolation between the same
 * order statistics), whatever the shape of the sample; the mean and the
 * standard deviation agree with Welford's running sums on the sorted sample
 * to rounding, 1e-12 relative (1e-12 of the mean's size for the mean).
 */

function reference(values: Float64Array) {
  return summarizeSorted(values.slice().sort());
}

function expectSameSummary(values: Float64Array): void {
  const got = summarizeSample(values);
  const want = reference(values);
  expect(got.median).toBe(want.median);
  expect(got.p16).toBe(want.p16);
  expect(got.p84).toBe(want.p84);
  const size = Math.max(Math.abs(want.mean), want.sd, Number.MIN_VALUE);
  expect(Math.abs(got.mean - want.mean)).toBeLessThanOrEqual(1e-12 * size);
  expect(Math.abs(got.sd - want.sd)).toBeLessThanOrEqual(1e-12 * Math.max(want.sd, 1e-300) + 1e-15 * size);
}

function sample(n: number, seed: number, draw: (r: Random) => number): Float64Array {
  const r = new Random(seed);
  return Float64Array.from({ length: n }, () => draw(r));
}

describe("summarizeSample: percentiles without sorting", () => {
  it("uses the 1σ probabilities of the normal distribution, Φ(±1) = (1 ± erf(1/√2))/2 (erf from mathjs)", () => {
    expect(P16 + P84).toBe(1);
    expect(P84 - P16).toBeCloseTo(erf(Math.SQRT1_2) as number, 15);
  });

  it("matches sorting on normal, skewed, heavy-tailed and two-humped samples", () => {
    expectSameSummary(sample(20_000, 1, (r) => 1e20 * (1 + 0.01 * r.normal())));
    expectSameSummary(sample(20_000, 2, (r) => Math.exp(2 * r.normal())));
    // a ratio of normals: Cauchy-like tails that a mean ± 3σ grid handles badly
    expectSameSummary(sample(20_000, 3, (r) => r.normal() / r.normal()));
    expectSameSummary(sample(20_000, 4, (r) => (r.uniform() < 0.5 ? -5 : 5) + 0.1 * r.normal()));
    expectSameSummary(sample(20_000, 5, (r) => -3e-12 * Math.abs(r.normal())));
  });

  it("matches sorting when the first values are unrepresentative", () => {
    const values = sample(10_000, 6, (r) => r.normal());
    values.sort();
    expectSameSummary(values);
    expectSameSummary(values.slice().reverse());
    const outlierFirst = sample(10_000, 7, (r) => r.normal());
    outlierFirst[0] = 1e30;
    expectSameSummary(outlierFirst);
  });

  it("matches sorting with ties, constant samples and tiny samples", () => {
    expectSameSummary(sample(5000, 8, (r) => Math.round(3 * r.normal())));
    expectSameSummary(new Float64Array(1000).fill(2.5));
    expectSameSummary(Float64Array.from([7]));
    expectSameSummary(Float64Array.from([7, 3]));
    expectSameSummary(Float64Array.from([1, 9, 4]));
    expectSameSummary(Float64Array.from([0, -0, 0]));
  });

  it("matches sorting on arbitrary finite samples (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e150, max: 1e150 }), { minLength: 1, maxLength: 300 }), (list) => {
        const values = Float64Array.from(list);
        const got = summarizeSample(values);
        const want = reference(values);
        return Object.is(got.median, want.median) && Object.is(got.p16, want.p16) && Object.is(got.p84, want.p84);
      }),
      { numRuns: 500, seed: 4242 },
    );
  });

  it("gives NaN for an empty sample", () => {
    const s = summarizeSample(new Float64Array(0));
    expect([s.median, s.p16, s.p84, s.mean, s.sd].every(Number.isNaN)).toBe(true);
  });
});

describe("SampleAccumulator: a sample that arrives in pieces", () => {
  it("gives the summary of the whole, whatever the pieces", () => {
    const values = sample(12_345, 9, (r) => 4 + r.normal() ** 3);
    const acc = new SampleAccumulator(new Int32Array(values.length));
    let at = 0;
    for (const size of [1, 4096, 0, 3000, 17]) {
      acc.add(values, at, at + size);
      at += size;
    }
    acc.add(values, at, values.length);
    const got = acc.summary(values);
    const want = reference(values);
    expect(got.median).toBe(want.median);
    expect(got.p16).toBe(want.p16);
    expect(got.p84).toBe(want.p84);
    expect(got.mean).toBeCloseTo(want.mean, 12);
    expect(got.sd / want.sd).toBeCloseTo(1, 12);
  });

  it("gives the same numbers, bit for bit, in pieces of one to three values as in one piece", () => {
    // pieces shorter than four go value by value; a whole piece goes four values at a time
    const values = sample(9_001, 10, (r) => (r.uniform() < 0.3 ? 2 : 2 + 1e-3 * r.normal()));
    const whole = new SampleAccumulator(new Int32Array(values.length));
    whole.add(values, 0, values.length);
    const pieces = new SampleAccumulator(new Int32Array(values.length));
    for (let at = 0, k = 0; at < values.length; k++) {
      const to = Math.min(values.length, at + 1 + (k % 3));
      pieces.add(values, at, to);
      at = to;
    }
    const a = whole.summary(values);
    const b = pieces.summary(values);
    for (const field of ["median", "p16", "p84", "mean", "sd"] as const) expect(Object.is(a[field], b[field])).toBe(true);
  });

  it("refuses pieces out of order or beyond its room", () => {
    const values = new Float64Array(10);
    const acc = new SampleAccumulator(new Int32Array(10));
    acc.add(values, 0, 4);
    expect(() => acc.add(values, 5, 6)).toThrow(/after 4/);
    expect(() => acc.add(values, 4, 11)).toThrow();
  });
});
