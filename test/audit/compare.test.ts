import { describe, expect, it } from "vitest";
import { compare, statusOf, worstStatus } from "../../src/audit/compare.js";

const ours = (value: number, s = 0.1) => ({ value, plus: s, minus: s });

describe("status thresholds", () => {
  it("puts |z| = 1 in consistent and |z| = 3 in tension", () => {
    expect(statusOf(0)).toBe("consistent");
    expect(statusOf(-1)).toBe("consistent");
    expect(statusOf(1.0001)).toBe("tension");
    expect(statusOf(3)).toBe("tension");
    expect(statusOf(-3.0001)).toBe("discrepant");
    expect(statusOf(2, { tension: 2.5, discrepant: 5 })).toBe("consistent");
  });

  it("takes the worst status", () => {
    expect(worstStatus([])).toBe("not-compared");
    expect(worstStatus(["consistent", "discrepant", "tension"])).toBe("discrepant");
    expect(worstStatus(["not-compared", "consistent"])).toBe("consistent");
  });
});

describe("comparison", () => {
  it("divides by the published sigma on the side of the difference", () => {
    // recomputed above published: measured with the published upper sigma
    const up = compare(ours(10.5), { kind: "measured", value: 10, plus: 0.25, minus: 1 });
    expect(up.z).toBeCloseTo(2, 14);
    expect(up.status).toBe("tension");
    expect(up.sigmaFrom).toBe("published");
    const down = compare(ours(9.5), { kind: "measured", value: 10, plus: 0.25, minus: 1 });
    expect(down.z).toBeCloseTo(-0.5, 14);
    expect(down.status).toBe("consistent");
    expect(down.ratio).toBeCloseTo(0.95, 14);
  });

  it("falls back to our own sigma when none was published", () => {
    const c = compare({ value: 12, plus: 0.5, minus: 0.4 }, { kind: "exact", value: 10, plus: 0, minus: 0 });
    // ours above the published value: our lower side faces it
    expect(c.sigmaFrom).toBe("recomputed");
    expect(c.z).toBeCloseTo(5, 14);
    expect(c.status).toBe("discrepant");
  });

  it("meets a limit on its allowed side and measures a violation with our sigma", () => {
    expect(compare(ours(3), { kind: "upper-limit", value: 3.2, plus: 0, minus: 0 }).status).toBe("consistent");
    const v = compare(ours(3.5), { kind: "upper-limit", value: 3.2, plus: 0, minus: 0 });
    expect(v.z).toBeCloseTo(3, 12);
    expect(v.status).toBe("tension");
    expect(compare(ours(4.0), { kind: "lower-limit", value: 5, plus: 0, minus: 0 }).status).toBe("discrepant");
  });
});
