import { describe, expect, it } from "vitest";
import katex from "katex";
import { formatMeasured, formatNumber, formatQuantity, latexNumber } from "../../src/quantity/format.js";
import { parseQuantity } from "../../src/quantity/parse.js";
import { unitById } from "../../src/units/catalog.js";
import type { Quantity } from "../../src/quantity/quantity.js";

function quantity(kind: Quantity["kind"], value: number, plus: number, minus: number, unit: string): Quantity {
  return { kind, value, plus, minus, unit: unitById(unit), unitText: unit, text: "" };
}

describe("formatNumber", () => {
  it.each([
    [0, "0"],
    [-0, "0"],
    [12.3456, "12.35"],
    [0.001234, "0.001234"],
    [1234.5, "1235"],
    [2, "2.000"],
    [-3.14159, "−3.142"],
    [1.23456e20, "1.235 × 10²⁰"],
    [-1.23456e20, "−1.235 × 10²⁰"],
    [5e-7, "5.000 × 10⁻⁷"],
    [9999.7, "1.000 × 10⁴"],
    [0.00099996, "0.001000"],
    [1e4, "1.000 × 10⁴"],
    [1.989e30, "1.989 × 10³⁰"],
  ])("%d → %s", (x, text) => {
    expect(formatNumber(x)).toBe(text);
  });

  it("takes the number of significant digits", () => {
    expect(formatNumber(1.98840987e30, 6)).toBe("1.98841 × 10³⁰");
    expect(formatNumber(1234.5, 2)).toBe("1200");
    expect(formatNumber(0.5, 1)).toBe("0.5");
  });

  it("writes non-finite numbers plainly and refuses a bad digit count", () => {
    expect(formatNumber(Number.NaN)).toBe("NaN");
    expect(formatNumber(Number.POSITIVE_INFINITY)).toBe("∞");
    expect(formatNumber(Number.NEGATIVE_INFINITY)).toBe("−∞");
    expect(() => formatNumber(1, 0)).toThrow();
    expect(() => formatNumber(1, 2.5)).toThrow();
  });
});

describe("latexNumber", () => {
  it.each([
    [0, "0"],
    [12.3456, "12.35"],
    [-12.3456, "-12.35"],
    [0.001, "0.001000"],
    [9.99e-4, "9.990\\times10^{-4}"],
    [1.23456e20, "1.235\\times10^{20}"],
    [-1.23456e20, "-1.235\\times10^{20}"],
    [1e4, "1.000\\times10^{4}"],
  ])("%d → %s", (x, tex) => {
    expect(latexNumber(x)).toBe(tex);
  });

  it("renders with KaTeX in strict mode", () => {
    for (const x of [0, 1.23456e20, -5e-7, 42, Number.POSITIVE_INFINITY, Number.NaN]) {
      expect(katex.renderToString(latexNumber(x), { throwOnError: true, strict: "error" })).toContain("katex");
    }
  });
});

describe("formatMeasured", () => {
  it.each([
    [3.08123, 0.0249, 0.0249, 2, "3.081 ± 0.025"],
    [3.08123, 0.034, 0.021, 2, "3.081 +0.034 −0.021"],
    [3.08123, 0.03, 0.02, 1, "3.08 +0.03 −0.02"],
    [1.2345e20, 3.4e18, 3.4e18, 2, "(1.234 ± 0.034) × 10²⁰"],
    [5432, 230, 230, 2, "5430 ± 230"],
    [123456, 1234, 1234, 2, "(1.235 ± 0.012) × 10⁵"],
    [-0.001, 0.1, 0.1, 2, "0.00 ± 0.10"],
    [-12.345, 0.5, 0.5, 2, "−12.35 ± 0.50"],
    [50.1, 0.0999, 0.0999, 2, "50.10 ± 0.10"],
    [2.5e-6, 1.2e-7, 1.2e-7, 2, "(2.50 ± 0.12) × 10⁻⁶"],
    [1.5, 0.3, 0, 2, "1.50 +0.30 −0.00"],
  ])("%d +%d −%d (%d digits) → %s", (value, plus, minus, digits, text) => {
    expect(formatMeasured(value, plus, minus, digits)).toBe(text);
  });

  it("writes a zero uncertainty as ± 0", () => {
    expect(formatMeasured(3.08123, 0, 0)).toBe("3.081 ± 0");
  });

  it("rounds separately when the uncertainty is below the value's precision", () => {
    expect(formatMeasured(1, 1e-30, 1e-30)).toBe("1.0000000000000000 ± 1.0 × 10⁻³⁰");
  });

  it("refuses negative uncertainties", () => {
    expect(() => formatMeasured(1, -0.1, 0.1)).toThrow();
  });

  it("gives text that parseQuantity reads back to the rounded numbers", () => {
    const r = parseQuantity(formatMeasured(1.2345e20, 3.4e18, 2.1e18));
    expect(r.ok && [r.value.value, r.value.plus, r.value.minus]).toEqual([1.234e20, 3.4e18, 2.1e18]);
  });
});

describe("formatQuantity", () => {
  it.each([
    [quantity("measured", 50.1, 0.2, 0.2, "yr"), "50.1 ± 0.2 yr"],
    [quantity("measured", 50.1, 0.3, 0.2, "yr"), "50.1 +0.3 -0.2 yr"],
    [quantity("exact", 90, 0, 0, "deg"), "90 deg"],
    [quantity("exact", 0.13, 0, 0, "1"), "0.13"],
    [quantity("upper-limit", 3.2, 0, 0, "Msun"), "< 3.2 Msun"],
    [quantity("lower-limit", 5, 0, 0, "Msun"), "> 5 Msun"],
    [quantity("measured", -0, 0, 0, "km/s"), "-0 ± 0 km/s"],
    [quantity("exact", 1e21, 0, 0, "m"), "1e+21 m"],
  ])("%# → %s", (q, text) => {
    expect(formatQuantity(q)).toBe(text);
  });

  it("writes every digit needed to read the same double back", () => {
    const q = quantity("measured", 0.1 + 0.2, 1 / 3, 1 / 3, "au");
    expect(formatQuantity(q)).toBe("0.30000000000000004 ± 0.3333333333333333 au");
  });
});
