import { erf } from "mathjs";
import { describe, expect, it } from "vitest";
import { DrawStream, zigguratEdges } from "../../src/uncertainty/draw-stream.js";
import { meanAndSd, quantileSorted } from "../../src/uncertainty/statistics.js";

/**
 * The ziggurat's tables and the deviates it gives, against the normal
 * distribution as mathjs computes it (erf, npm registry).
 *
 * The layer constants R = 3.6541528853610088 and V = 0.00492867323399 are
 * those Marsaglia & Tsang (2000, Journal of Statistical Software 5(8)) give for
 * 256 layers (from memory). They are checked, not trusted: every layer must
 * have area V, and the base strip, the rectangle under f(R) plus the tail
 * beyond R, must too.
 */

const R = 3.6541528853610088;
const V = 0.00492867323399;

const f = (x: number) => Math.exp(-0.5 * x * x);
/** Standard normal CDF from mathjs's erf. */
const Phi = (x: number) => 0.5 * (1 + (erf(x / Math.SQRT2) as number));

function draws(seed: number, name: string, n: number, value = 0, plus = 1, minus = 1): Float64Array {
  const out = new Float64Array(n);
  new DrawStream(seed, name).fill(out, n, value, plus, minus);
  return out;
}

describe("ziggurat tables", () => {
  const X = zigguratEdges();

  it("has 256 layers from the base strip to the top, edges falling to zero", () => {
    expect(X.length).toBe(257);
    expect(X[1]).toBe(R);
    expect(X[256]).toBe(0);
    for (let i = 1; i < 256; i++) expect(X[i + 1]).toBeLessThan(X[i]);
  });

  it("gives every layer the area V, to 1e-8 (the published constants carry about ten digits)", () => {
    let worst = 0;
    for (let i = 1; i < 256; i++) {
      const area = X[i] * (f(X[i + 1]) - f(X[i]));
      worst = Math.max(worst, Math.abs(area / V - 1));
    }
    expect(worst).toBeLessThan(1e-8);
  });

  it("gives the base strip the area V: R f(R) plus the tail √(π/2) erfc(R/√2), to 1e-9", () => {
    const tail = Math.sqrt(Math.PI / 2) * (1 - (erf(R / Math.SQRT2) as number));
    expect(Math.abs((R * f(R) + tail) / V - 1)).toBeLessThan(1e-9);
    expect(X[0] * f(R)).toBeCloseTo(V, 15);
  });
});

describe("DrawStream", () => {
  it("repeats for the same seed and name, and differs for another seed or another name", () => {
    const a = draws(42, "period", 1000);
    expect(draws(42, "period", 1000)).toEqual(a);
    expect(draws(43, "period", 1000)).not.toEqual(a);
    expect(draws(42, "k1", 1000)).not.toEqual(a);
  });

  it("gives the same draws however the calls split them", () => {
    const n = 5000;
    for (const [plus, minus] of [
      [2, 2],
      [3, 1],
    ]) {
      const whole = draws(7, "x", n, 10, plus, minus);
      const stream = new DrawStream(7, "x");
      const pieces = new Float64Array(n);
      const sizes = [1, 511, 512, 513, 1024, 3, 700, 4096];
      let at = 0;
      for (let k = 0; at < n; k++) {
        const take = Math.min(sizes[k % sizes.length], n - at);
        const part = new Float64Array(take);
        stream.fill(part, take, 10, plus, minus);
        pieces.set(part, at);
        at += take;
      }
      expect(pieces).toEqual(whole);
    }
  });

  it("gives one deviate at a time the same sequence as fill", () => {
    const stream = new DrawStream(3, "e");
    const one = Float64Array.from({ length: 1500 }, () => stream.normal());
    expect(one).toEqual(draws(3, "e", 1500));
  });

  it("refuses to write more draws than the array holds", () => {
    expect(() => new DrawStream(1, "a").fill(new Float64Array(3), 4, 0, 1, 1)).toThrow(/do not fit/);
  });

  it("gives standard normal deviates: Kolmogorov–Smirnov distance to Φ below the 1 % critical value", () => {
    const n = 200_000;
    const xs = draws(11, "normal", n).sort();
    let d = 0;
    for (let i = 0; i < n; i += 7) {
      const F = Phi(xs[i]);
      d = Math.max(d, Math.abs(F - i / n), Math.abs(F - (i + 1) / n));
    }
    // critical value 1.63/√n at the 1 % level (Kolmogorov distribution, common practice)
    expect(d).toBeLessThan(1.63 / Math.sqrt(n));
    const { mean, sd } = meanAndSd(xs);
    // standard errors 1/√n = 0.0022 and 1/√(2n) = 0.0016: five of each
    expect(Math.abs(mean)).toBeLessThan(0.011);
    expect(Math.abs(sd - 1)).toBeLessThan(0.008);
    expect(quantileSorted(xs, Phi(-1))).toBeCloseTo(-1, 1);
    expect(quantileSorted(xs, Phi(2))).toBeCloseTo(2, 1);
  });

  it("fills the tails as the normal distribution does, beyond R and beyond 4σ", () => {
    const n = 2_000_000;
    const xs = draws(5, "tail", n);
    let beyondR = 0;
    let beyond4 = 0;
    for (const x of xs) {
      if (Math.abs(x) > R) beyondR++;
      if (Math.abs(x) > 4) beyond4++;
    }
    // Poisson counts: expected 2(1 − Φ(x)) n, allow five standard deviations
    for (const [count, x] of [
      [beyondR, R],
      [beyond4, 4],
    ]) {
      const expected = 2 * (1 - Phi(x)) * n;
      expect(Math.abs(count - expected)).toBeLessThan(5 * Math.sqrt(expected));
    }
    expect(beyond4).toBeGreaterThan(0);
  });

  it("draws a split normal whose mode stays put and whose sides have their widths", () => {
    const n = 200_000;
    const xs = draws(9, "split", n, 10, 3, 1);
    // P(x < μ) = σ₋ / (σ₋ + σ₊) = 0.25, standard error √(p(1−p)/n) ≈ 0.001
    const below = xs.filter((x) => x < 10).length / n;
    expect(Math.abs(below - 0.25)).toBeLessThan(0.005);
    // mean of a two-piece normal: μ + √(2/π)(σ₊ − σ₋), standard error about 0.005
    expect(meanAndSd(xs).mean).toBeCloseTo(10 + Math.sqrt(2 / Math.PI) * 2, 1);
    // each side is a half-normal of its own width: the lower side's median is μ − Φ⁻¹(3/4) σ₋,
    // Φ⁻¹(3/4) = 0.6744897501960817 (from memory, checked against mathjs here)
    const q3 = 0.6744897501960817;
    expect(Phi(q3)).toBeCloseTo(0.75, 12);
    const lower = Float64Array.from(xs.filter((x) => x < 10)).sort();
    expect(quantileSorted(lower, 0.5)).toBeCloseTo(10 - q3, 1);
  });

  it("gives a side of zero width no draws, and an exact input its value", () => {
    expect(draws(1, "a", 1000, 5, 2, 0).every((x) => x >= 5)).toBe(true);
    expect(draws(1, "a", 1000, 5, 0, 2).every((x) => x <= 5)).toBe(true);
    expect(draws(1, "a", 10, 5, 0, 0).every((x) => x === 5)).toBe(true);
  });
});
