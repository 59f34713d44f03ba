import { describe, expect, it } from "vitest";
import { propagateFirstOrder, varianceShares } from "../../src/uncertainty/first-order.js";

describe("first-order propagation", () => {
  it("adds independent contributions in quadrature", () => {
    // f = x·y at x = 3, y = 4: ∂f/∂x = 4, ∂f/∂y = 3; σx = 0.1, σy = 0.2 → σf = √(0.4² + 0.6²)
    const r = propagateFirstOrder({ x: 4, y: 3 }, { x: { plus: 0.1, minus: 0.1 }, y: { plus: 0.2, minus: 0.2 } });
    expect(r.sigma).toBeCloseTo(Math.sqrt(0.16 + 0.36), 14);
    expect(r.plus).toBe(r.minus);
    expect(r.variances.x).toBeCloseTo(0.16, 14);
    expect(r.variances.y).toBeCloseTo(0.36, 14);
  });

  it("sends an input's upper side to the result's lower side when the partial is negative", () => {
    // f = 1/x: ∂f/∂x < 0; x = 2 +0.3 −0.1 → f's upper side comes from x's lower side
    const r = propagateFirstOrder({ x: -0.25 }, { x: { plus: 0.3, minus: 0.1 } });
    expect(r.plus).toBeCloseTo(0.025, 15);
    expect(r.minus).toBeCloseTo(0.075, 15);
    expect(r.sigma).toBeCloseTo(0.05, 15);
  });

  it("ignores exact inputs and gives zero for an exact result", () => {
    const r = propagateFirstOrder({ x: 5 }, { x: { plus: 0, minus: 0 } });
    expect(r.sigma).toBe(0);
    expect(varianceShares(r.variances)).toEqual([]);
  });

  it("gives variance shares that sum to one, largest first", () => {
    const shares = varianceShares({ a: 1, b: 3, c: 0 });
    expect(shares.map((s) => s.source)).toEqual(["b", "a", "c"]);
    expect(shares[0].share).toBeCloseTo(0.75, 15);
    expect(shares.reduce((s, e) => s + e.share, 0)).toBeCloseTo(1, 15);
  });
});
