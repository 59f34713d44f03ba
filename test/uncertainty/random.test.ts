import { describe, expect, it } from "vitest";
import { hashSeed, Random } from "../../src/uncertainty/random.js";
import { meanAndSd, quantileSorted } from "../../src/uncertainty/statistics.js";

describe("seeded generator", () => {
  it("repeats the same sequence for the same seed and differs for another", () => {
    const a = new Random(42);
    const b = new Random(42);
    const c = new Random(43);
    const sa = Array.from({ length: 5 }, () => a.nextUint32());
    const sb = Array.from({ length: 5 }, () => b.nextUint32());
    const sc = Array.from({ length: 5 }, () => c.nextUint32());
    expect(sa).toEqual(sb);
    expect(sa).not.toEqual(sc);
  });

  it("gives uniform deviates in [0, 1) with mean 1/2 and variance 1/12", () => {
    const r = new Random(7);
    const n = 200_000;
    const xs = new Float64Array(n);
    for (let i = 0; i < n; i++) xs[i] = r.uniform();
    const { mean, sd } = meanAndSd(xs);
    expect(xs.reduce((m, x) => Math.min(m, x), 1)).toBeGreaterThanOrEqual(0);
    expect(xs.reduce((m, x) => Math.max(m, x), 0)).toBeLessThan(1);
    // standard error of the mean: √(1/12/n) ≈ 6.5e-4; allow 5 of them
    expect(Math.abs(mean - 0.5)).toBeLessThan(3.3e-3);
    expect(sd).toBeCloseTo(Math.sqrt(1 / 12), 2);
  });

  it("gives standard normal deviates with the normal quantiles", () => {
    const r = new Random(11);
    const n = 200_000;
    const xs = new Float64Array(n);
    for (let i = 0; i < n; i++) xs[i] = r.normal();
    xs.sort();
    const { mean, sd } = meanAndSd(xs);
    // tolerances: several standard errors of each statistic at n = 2e5
    expect(Math.abs(mean)).toBeLessThan(0.012);
    expect(Math.abs(sd - 1)).toBeLessThan(0.01);
    // Φ(−1) = 0.158655 and Φ(1) = 0.841345: the ±1σ quantiles sit at ∓1
    expect(quantileSorted(xs, 0.15865525393145707)).toBeCloseTo(-1, 1);
    expect(quantileSorted(xs, 0.8413447460685429)).toBeCloseTo(1, 1);
  });

  it("draws a split normal whose mode stays put and whose sides have their widths", () => {
    const r = new Random(5);
    const n = 200_000;
    const xs = new Float64Array(n);
    for (let i = 0; i < n; i++) xs[i] = r.splitNormal(10, 3, 1);
    // mean of a two-piece normal: μ + √(2/π)(σ₊ − σ₋)
    const { mean } = meanAndSd(xs);
    expect(mean).toBeCloseTo(10 + Math.sqrt(2 / Math.PI) * 2, 1);
    // P(x < μ) = σ₋ / (σ₋ + σ₊) = 0.25
    const below = xs.filter((x) => x < 10).length / n;
    expect(Math.abs(below - 0.25)).toBeLessThan(0.005);
  });

  it("hashes strings to stable 32-bit seeds", () => {
    // FNV-1a 32-bit of "a" is 0xe40c292c (the published test vector of the algorithm)
    expect(hashSeed("a")).toBe(0xe40c292c);
    expect(hashSeed("")).toBe(0x811c9dc5);
    expect(hashSeed("obj/key")).not.toBe(hashSeed("obj/kez"));
  });
});

describe("quantiles", () => {
  it("interpolates between order statistics", () => {
    const s = Float64Array.from([1, 2, 3, 4]);
    expect(quantileSorted(s, 0.5)).toBe(2.5);
    expect(quantileSorted(s, 0)).toBe(1);
    expect(quantileSorted(s, 1)).toBe(4);
  });
});
