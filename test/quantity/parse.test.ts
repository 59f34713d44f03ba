import { describe, expect, it } from "vitest";
import { parseQuantity, type ParseQuantityOptions } from "../../src/quantity/parse.js";
import type { Quantity } from "../../src/quantity/quantity.js";
import type { Issue } from "../../src/problem.js";

function q(raw: unknown, options?: ParseQuantityOptions): Quantity {
  const r = parseQuantity(raw, options);
  if (!r.ok) throw new Error(`${JSON.stringify(raw)}: ${r.issues.map((i) => `${i.code}: ${i.message}`).join("; ")}`);
  return r.value;
}

function issues(raw: unknown, options?: ParseQuantityOptions): readonly Issue[] {
  const r = parseQuantity(raw, options);
  if (r.ok) throw new Error(`${JSON.stringify(raw)} parsed as ${r.value.text}`);
  return r.issues;
}

const LIMITS = { allowLimits: true };

/** kind, value, plus, minus, unit id */
function summary(x: Quantity): [string, number, number, number, string] {
  return [x.kind, x.value, x.plus, x.minus, x.unit.id];
}

describe("strings with a symmetric uncertainty", () => {
  it.each([
    "50.1 ± 0.2 yr",
    "50.1 +/- 0.2 yr",
    "50.1+-0.2 yr",
    "50.1 +- 0.2 yr",
    "50.1±0.2yr",
    "  50.1 ± 0.2 yr  ",
    "50.1 ± 0.2 years",
  ])("%j is 50.1 ± 0.2 yr", (text) => {
    expect(summary(q(text))).toEqual(["measured", 50.1, 0.2, 0.2, "yr"]);
  });

  it("keeps the text as typed (trimmed), the unit text, and the decimals of the value", () => {
    const x = q("  50.10 ± 0.25 years ");
    expect(x.text).toBe("50.10 ± 0.25 years");
    expect(x.unitText).toBe("years");
    expect(x.decimals).toBe(2);
  });

  it("reads the Unicode minus", () => {
    expect(summary(q("−12.5 ± 0.3 km/s"))).toEqual(["measured", -12.5, 0.3, 0.3, "km/s"]);
    expect(summary(q("1.2e−3 ± 1e−4"))).toEqual(["measured", 0.0012, 0.0001, 0.0001, "1"]);
  });

  it("allows a zero uncertainty, which stays a measurement", () => {
    expect(summary(q("5 ± 0 d"))).toEqual(["measured", 5, 0, 0, "d"]);
  });
});

describe("strings with an asymmetric uncertainty", () => {
  it.each(["50.1 +0.3 -0.2 yr", "50.1 +0.3/-0.2 yr", "50.1 +0.3 / -0.2 yr", "50.1 +0.3 −0.2 yr", "50.1+0.3-0.2 yr"])(
    "%j is 50.1 +0.3 -0.2 yr",
    (text) => {
      expect(summary(q(text))).toEqual(["measured", 50.1, 0.3, 0.2, "yr"]);
    },
  );

  it("reads powers of ten on each side", () => {
    expect(summary(q("1.5e3 +2e2 -1e2 km"))).toEqual(["measured", 1500, 200, 100, "km"]);
  });
});

describe("concise (bracketed) uncertainties", () => {
  it.each([
    ["50.123(12) yr", 50.123, 0.012, "yr"],
    ["1234(5)", 1234, 5, "1"],
    ["1.5(12)", 1.5, 1.2, "1"],
    ["1.5(1.2)", 1.5, 1.2, "1"],
    ["0.00213(7) arcsec", 0.00213, 0.00007, "arcsec"],
    ["50.123 (12) yr", 50.123, 0.012, "yr"],
  ])("%j is %d ± %d %s", (text, value, sigma, unit) => {
    expect(summary(q(text))).toEqual(["measured", value, sigma, sigma, unit]);
  });

  // CODATA 2018 G written in its own concise form (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010).
  it("reads a power of ten after the bracket or before it", () => {
    for (const text of ["6.67430(15)e-11", "6.67430e-11(15)", "6.67430(15)×10^-11"]) {
      expect(summary(q(text)), text).toEqual(["measured", 6.6743e-11, 1.5e-15, 1.5e-15, "1"]);
    }
  });

  it("equals the ± form exactly", () => {
    expect(summary(q("50.123(12) yr"))).toEqual(summary(q("50.123 ± 0.012 yr")));
    expect(summary(q("0.0712(35)"))).toEqual(summary(q("0.0712 ± 0.0035")));
  });
});

describe("exact values", () => {
  it.each([
    ["0.13", 0.13, "1", 2],
    ["90 deg", 90, "deg", 0],
    ["90°", 90, "deg", 0],
    ["1.2e-3", 0.0012, "1", 4],
    ["6.02E23", 6.02e23, "1", 0],
    ["1.2×10^5", 120000, "1", 0],
    ["1.2x10^5", 120000, "1", 0],
    ["1.2 × 10^5 km", 120000, "km", 0],
    ["1.2×10⁵", 120000, "1", 0],
    ["4.5 × 10⁻³ au", 0.0045, "au", 4],
    ["+3 km/s", 3, "km/s", 0],
    [".5", 0.5, "1", 1],
    ["12.", 12, "1", 0],
    ["3.250 mas", 3.25, "mas", 3],
  ])("%j is exactly %d %s with %d decimals", (text, value, unit, decimals) => {
    const x = q(text);
    expect(summary(x)).toEqual(["exact", value, 0, 0, unit]);
    expect(x.decimals).toBe(decimals);
  });

  it("scales the typed decimal exactly (no binary rounding from multiplying by a power of ten)", () => {
    expect(q("1.1×10^-1").value).toBe(0.11);
    expect(q("(1.1 ± 0.3)×10^-1").plus).toBe(0.03);
  });

  it("reads a shared power of ten after a bracketed value and uncertainty", () => {
    expect(summary(q("(1.2 ± 0.3) × 10^5 km"))).toEqual(["measured", 120000, 30000, 30000, "km"]);
    expect(summary(q("(1.2 +0.3 -0.1)e5 km"))).toEqual(["measured", 120000, 30000, 10000, "km"]);
  });

  it("applies a value's own power of ten to the value only", () => {
    expect(summary(q("1.2×10^5 ± 3000 km"))).toEqual(["measured", 120000, 3000, 3000, "km"]);
  });
});

describe("limits", () => {
  it.each([
    ["< 3.2 Msun", "upper-limit", 3.2],
    ["<3.2 Msun", "upper-limit", 3.2],
    ["≤ 3.2 Msun", "upper-limit", 3.2],
    ["<= 3.2 Msun", "upper-limit", 3.2],
    ["> 5 Msun", "lower-limit", 5],
    ["≥5 Msun", "lower-limit", 5],
    [">= 5 Msun", "lower-limit", 5],
  ])("%j is a %s at %d", (text, kind, value) => {
    expect(summary(q(text, LIMITS))).toEqual([kind, value, 0, 0, "Msun"]);
  });

  it("is refused where limits are not allowed, with a hint that they belong in published", () => {
    for (const text of ["< 3", "> 5 Msun", "≤ 2 Mjup"]) {
      const [i] = issues(text);
      expect(i.code, text).toBe("limit-not-allowed");
      expect(i.hint).toContain("`published`");
    }
  });

  it("reports a bad unit together with a refused limit", () => {
    expect(issues("< 3 Msum").map((i) => i.code)).toEqual(["limit-not-allowed", "unknown-unit"]);
  });

  it("takes no uncertainty", () => {
    expect(issues("< 3.2 ± 0.1 Msun", LIMITS)[0].code).toBe("bad-quantity");
  });
});

describe("bad strings", () => {
  it.each([
    ["", "bad-quantity"],
    ["   ", "bad-quantity"],
    ["abc", "bad-quantity"],
    ["yr 50", "bad-quantity"],
    ["1 ±", "incomplete-uncertainty"],
    ["1 ± yr", "incomplete-uncertainty"],
    ["1 ± -2 yr", "negative-uncertainty"],
    ["1 ± −2 yr", "negative-uncertainty"],
    ["NaN yr", "non-finite-number"],
    ["nan", "non-finite-number"],
    ["Infinity", "non-finite-number"],
    ["-inf km", "non-finite-number"],
    [".inf", "non-finite-number"],
    ["∞", "non-finite-number"],
    ["1 ± NaN", "non-finite-number"],
    ["1e999 yr", "non-finite-number"],
    ["1e-999 yr", "non-finite-number"],
    ["1 ± 1e400 yr", "non-finite-number"],
    ["1 +0.1 yr", "incomplete-uncertainty"],
    ["1 +0.1 / yr", "incomplete-uncertainty"],
    ["1 -0.1 +0.2 yr", "incomplete-uncertainty"],
    ["1.5(12", "bad-quantity"],
    ["1.5() yr", "bad-quantity"],
    ["(1.2 ± 0.3 km", "bad-quantity"],
    ["1,5 yr", "bad-quantity"],
    ["1 ± 0.1 ± 0.2 yr", "bad-quantity"],
    ["1.5(2) ± 0.1", "bad-quantity"],
    ["1.2e3×10^2", "bad-quantity"],
    ["1.2×10^ km", "bad-quantity"],
    ["1 yr ± 0.1", "bad-quantity"],
    ["50.1 ± 0.2 Yr", "unknown-unit"],
    ["50.1 ± 0.2 km s-1 yr/", "bad-unit"],
  ])("%j → %s", (text, code) => {
    const found = issues(text);
    expect(found[0].code).toBe(code);
    expect(found[0].hint?.length ?? 0).toBeGreaterThan(0);
  });

  it("names the field in its messages", () => {
    const [i] = issues("abc", { field: "period" });
    expect(i.message).toBe('period does not start with a number: "abc"');
    expect(i.hint).toContain('"50.1 ± 0.2 yr"');
  });

  it("refuses very long text", () => {
    expect(issues("1".repeat(10_000))[0].code).toBe("bad-quantity");
  });
});

describe("numbers", () => {
  it("a YAML number is an exact dimensionless value", () => {
    const x = q(0.13);
    expect(summary(x)).toEqual(["exact", 0.13, 0, 0, "1"]);
    expect(x.text).toBe("0.13");
    expect(x.unitText).toBe("");
    expect(x.decimals).toBe(2);
    expect(q(3).decimals).toBe(0);
    expect(q(1.5e-7).decimals).toBe(8);
  });

  it.each([Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY])("%d is refused", (x) => {
    expect(issues(x)[0].code).toBe("non-finite-number");
  });
});

describe("mappings", () => {
  it("{ value, sigma, unit }", () => {
    const x = q({ value: 50.1, sigma: 0.2, unit: "yr" });
    expect(summary(x)).toEqual(["measured", 50.1, 0.2, 0.2, "yr"]);
    expect(x.text).toBe("50.1 ± 0.2 yr");
    expect(x.unitText).toBe("yr");
  });

  it("{ value, plus, minus, unit }", () => {
    expect(summary(q({ value: 50.1, plus: 0.3, minus: 0.2, unit: "yr" }))).toEqual(["measured", 50.1, 0.3, 0.2, "yr"]);
  });

  it("reads a signed minus as its size, since the field already says downward", () => {
    expect(summary(q({ value: 50.1, plus: 0.3, minus: -0.2, unit: "yr" }))).toEqual(["measured", 50.1, 0.3, 0.2, "yr"]);
    expect(summary(q({ value: 50.1, plus: 0.3, minus: "−0.2", unit: "yr" }))).toEqual(["measured", 50.1, 0.3, 0.2, "yr"]);
  });

  it("{ value, unit } is exact; a missing unit is dimensionless", () => {
    expect(summary(q({ value: 90, unit: "deg" }))).toEqual(["exact", 90, 0, 0, "deg"]);
    expect(summary(q({ value: 0.13 }))).toEqual(["exact", 0.13, 0, 0, "1"]);
  });

  it("takes a value typed as text, keeping its decimals", () => {
    const x = q({ value: "1.50", sigma: "0.05", unit: "Msun" });
    expect(summary(x)).toEqual(["measured", 1.5, 0.05, 0.05, "Msun"]);
    expect(x.decimals).toBe(2);
  });

  it("takes limit: upper | lower where limits are allowed", () => {
    expect(summary(q({ value: 3.2, unit: "Msun", limit: "upper" }, LIMITS))).toEqual(["upper-limit", 3.2, 0, 0, "Msun"]);
    expect(summary(q({ value: 5, unit: "Msun", limit: "lower" }, LIMITS))).toEqual(["lower-limit", 5, 0, 0, "Msun"]);
    const [i] = issues({ value: 5, unit: "Msun", limit: "lower" });
    expect(i.code).toBe("limit-not-allowed");
    expect(i.path).toBe("limit");
  });

  it.each([
    [{ sigma: 0.2, unit: "yr" }, "bad-quantity-field", "value"],
    [{ value: "50.1 yr" }, "bad-quantity-field", "value"],
    [{ value: true }, "bad-quantity-field", "value"],
    [{ value: Number.NaN }, "non-finite-number", "value"],
    [{ value: "Infinity" }, "non-finite-number", "value"],
    [{ value: 1, sigma: -0.2 }, "negative-uncertainty", "sigma"],
    [{ value: 1, plus: -0.2, minus: 0.1 }, "negative-uncertainty", "plus"],
    [{ value: 1, plus: 0.2 }, "bad-quantity-field", "minus"],
    [{ value: 1, minus: 0.2 }, "bad-quantity-field", "plus"],
    [{ value: 1, sigma: 0.1, plus: 0.2, minus: 0.1 }, "bad-quantity-field", "sigma"],
    [{ value: 1, unit: 5 }, "bad-quantity-field", "unit"],
    [{ value: 1, unit: "Au" }, "unknown-unit", "unit"],
    [{ value: 1, error: 0.1 }, "bad-quantity-field", "error"],
    [{ value: 1, limit: "sideways" }, "bad-quantity-field", "limit"],
  ])("%j → %s at %s", (raw, code, path) => {
    const found = issues(raw, LIMITS);
    expect(found.map((i) => [i.code, i.path])).toContainEqual([code, path]);
  });

  it("collects every problem in a mapping", () => {
    const found = issues({ value: "x", sigma: -1, unit: "Au", colour: "red" });
    expect(found.map((i) => i.code).sort()).toEqual(["bad-quantity-field", "bad-quantity-field", "negative-uncertainty", "unknown-unit"]);
  });

  it("a limit with an uncertainty is refused", () => {
    expect(issues({ value: 3, sigma: 0.1, limit: "upper" }, LIMITS)[0].code).toBe("bad-quantity-field");
  });
});

describe("other values", () => {
  it.each([[null], [undefined], [true], [[1, 2]], [new Date(0)], [new Map()], [Symbol("s")], [10n], [() => 1]])("%s is a bad quantity", (raw) => {
    expect(issues(raw)[0].code).toBe("bad-quantity");
  });

  it("an object without a prototype is read as a mapping", () => {
    const raw = Object.create(null) as Record<string, unknown>;
    raw.value = 2;
    raw.unit = "d";
    expect(summary(q(raw))).toEqual(["exact", 2, 0, 0, "d"]);
  });
});
