import { describe, expect, it } from "vitest";
import {
  formatByKind,
  formatCompact,
  formatPlain,
  formatRatio,
  formatShare,
  formatWithSigma,
  formatZ,
  superscript,
  withUnit,
} from "../../src/site/display.js";

const NBSP = "\u00a0";

describe("numbers on the pages", () => {
  it("prints z to two decimals with a true minus sign, and infinities and missing values as symbols", () => {
    expect(formatZ(1.2345)).toBe("1.23");
    expect(formatZ(-2.5)).toBe("\u22122.50");
    expect(formatZ(-0.001)).toBe("0.00");
    expect(formatZ(Infinity)).toBe("\u221e");
    expect(formatZ(-Infinity)).toBe("\u2212\u221e");
    expect(formatZ(NaN)).toBe("\u2014");
  });

  it("rounds a value to two significant digits of its uncertainty (common practice)", () => {
    expect(formatWithSigma(3.07123, 0.0513)).toBe("3.071 ± 0.051");
    expect(formatWithSigma(3.07123, 0.06, 0.05)).toBe("3.071 +0.060 \u22120.050");
    expect(formatWithSigma(1.58104e9, 6.31e6)).toBe("(1.5810 ± 0.0063) × 10\u2079");
  });

  it("shows a value without a usable uncertainty alone, trailing zeros dropped", () => {
    expect(formatWithSigma(86.1, 0)).toBe("86.1");
    expect(formatWithSigma(2.5, NaN, -1)).toBe("2.5");
    expect(formatCompact(90)).toBe("90");
    expect(formatCompact(0.13)).toBe("0.13");
    expect(formatCompact(320000)).toBe("3.2 × 10\u2075");
    expect(formatCompact(123456.7)).toBe("1.23457 × 10\u2075");
  });

  it("writes limits and exact values by their kind", () => {
    expect(formatByKind("upper-limit", 3.2, 0, 0)).toBe("< 3.2");
    expect(formatByKind("lower-limit", 5, 0, 0)).toBe("> 5");
    expect(formatByKind("exact", 0, 0, 0)).toBe("0");
    expect(formatByKind("measured", 1.208, 0.012, 0.012)).toBe("1.208 ± 0.012");
  });

  it("prints shares as percentages, ratios to five digits and exponents as superscripts", () => {
    expect(formatShare(0.42667)).toBe(`42.7${NBSP}%`);
    expect(formatShare(1)).toBe(`100.0${NBSP}%`);
    expect(formatRatio(0.997781)).toBe("0.99778");
    expect(formatPlain(NaN)).toBe("\u2014");
    expect(superscript(-12)).toBe("\u207b\u00b9\u00b2");
    expect(withUnit("3.1", "M☉")).toBe(`3.1${NBSP}M☉`);
    expect(withUnit("0.5", "")).toBe("0.5");
  });
});

describe("unit symbols on the pages", () => {
  it("writes SI exponents as superscripts and catalogue units by their symbol", async () => {
    const { siUnitSymbol, unitSymbol } = await import("../../src/site/unit-display.js");
    expect(siUnitSymbol("m3 s-2")).toBe("m\u00b3 s\u207b\u00b2");
    expect(siUnitSymbol("m s-1")).toBe("m s\u207b\u00b9");
    expect(siUnitSymbol("kg")).toBe("kg");
    expect(unitSymbol("Msun")).toBe("M☉");
    expect(unitSymbol("km/s")).toBe("km s\u207b\u00b9");
    expect(unitSymbol("not-a-unit")).toBe("not-a-unit");
  });
});
