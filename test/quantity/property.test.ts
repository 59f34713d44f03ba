import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { parseQuantity } from "../../src/quantity/parse.js";
import { formatMeasured, formatNumber, formatQuantity, latexNumber } from "../../src/quantity/format.js";
import { parseUnit } from "../../src/units/parse.js";
import { UNITS } from "../../src/units/catalog.js";
import type { Quantity } from "../../src/quantity/quantity.js";
import type { Issue, Result } from "../../src/problem.js";

const RUNS = { numRuns: 2000 };

/** A result is either a value or at least one issue, each with a code, a message and a hint. */
function wellFormed<T>(r: Result<T>): boolean {
  if (r.ok) return r.value !== undefined;
  return r.issues.length > 0 && r.issues.every((i: Issue) => typeof i.code === "string" && i.code.length > 0 && typeof i.message === "string" && typeof i.hint === "string");
}

function quantityIsSound(r: Result<Quantity>): boolean {
  if (!r.ok) return true;
  const q = r.value;
  return Number.isFinite(q.value) && q.plus >= 0 && q.minus >= 0 && Number.isFinite(q.plus) && Number.isFinite(q.minus) && q.unit.scale > 0;
}

/** Characters the parsers treat specially, to reach deep into their grammar. */
const GRAMMAR = fc.constantFrom(
  "0", "1", "2", "5", "9", ".", "e", "E", "-", "+", "−", "±", "+/-", "(", ")", " ", "/", "^", "*", "**", "·", "×", "x", "10",
  "⁻", "¹", "²", "<", ">", "≤", ",", "km", "s", "yr", "Msun", "mas", "au", "Au", "nan", "inf", "{", "}",
);
const grammarText = fc.array(GRAMMAR, { maxLength: 14 }).map((parts) => parts.join(""));

describe("parsers never throw", () => {
  it("parseUnit on any string", () => {
    fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 60 }), (s) => wellFormed(parseUnit(s))), RUNS);
    fc.assert(fc.property(grammarText, (s) => wellFormed(parseUnit(s))), RUNS);
  });

  it("parseQuantity on any string, with and without limits", () => {
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 60 }), fc.boolean(), (s, allowLimits) => {
        const r = parseQuantity(s, { allowLimits });
        return wellFormed(r) && quantityIsSound(r);
      }),
      RUNS,
    );
    fc.assert(
      fc.property(grammarText, fc.boolean(), (s, allowLimits) => {
        const r = parseQuantity(s, { allowLimits });
        return wellFormed(r) && quantityIsSound(r);
      }),
      RUNS,
    );
  });

  it("parseQuantity on any JSON value and any JavaScript value", () => {
    fc.assert(fc.property(fc.jsonValue(), (v) => wellFormed(parseQuantity(v)) && quantityIsSound(parseQuantity(v))), RUNS);
    fc.assert(fc.property(fc.anything({ withBigInt: true, withDate: true, withMap: true, withSet: true, withNullPrototype: true }), (v) => wellFormed(parseQuantity(v))), RUNS);
  });

  it("parseQuantity on mappings with the right keys and wrong values", () => {
    const field = fc.oneof(fc.jsonValue(), fc.double(), grammarText);
    const mapping = fc.record(
      { value: field, sigma: field, plus: field, minus: field, unit: fc.oneof(field, fc.constantFrom(...UNITS.map((u) => u.id))), limit: fc.oneof(field, fc.constantFrom("upper", "lower")) },
      { requiredKeys: [] },
    );
    fc.assert(fc.property(mapping, fc.boolean(), (m, allowLimits) => {
      const r = parseQuantity(m, { allowLimits });
      return wellFormed(r) && quantityIsSound(r);
    }), RUNS);
  });
});

const finite = fc.double({ noNaN: true, noDefaultInfinity: true });
const size = fc.double({ min: 0, noNaN: true, noDefaultInfinity: true });
const compoundUnit = fc.constantFrom("Msun pc-3", "km s-1 Mpc-1", "d-1", "m3 kg-1 s-2", "deg yr-1", "cm3 s-2");
const unitText = fc.oneof(fc.constantFrom(...UNITS.map((u) => u.id)), compoundUnit);

/** A valid quantity, built directly rather than through the parser. */
const quantity: fc.Arbitrary<Quantity> = fc
  .tuple(fc.constantFrom("measured", "exact", "upper-limit", "lower-limit" as const), finite, size, size, fc.boolean(), unitText)
  .map(([kind, value, plus, minus, symmetric, u]) => {
    const parsed = parseUnit(u);
    if (!parsed.ok) throw new Error(`test unit ${u} does not parse`);
    const measured = kind === "measured";
    return {
      kind: kind as Quantity["kind"],
      value,
      plus: measured ? plus : 0,
      minus: measured ? (symmetric ? plus : minus) : 0,
      unit: parsed.value,
      unitText: u,
      text: "",
    };
  });

describe("round trip through formatQuantity", () => {
  it("parseQuantity(formatQuantity(q)) has the same kind, value, uncertainties and unit", () => {
    fc.assert(
      fc.property(quantity, (q) => {
        const text = formatQuantity(q);
        const r = parseQuantity(text, { allowLimits: true });
        expect(r.ok, text).toBe(true);
        if (!r.ok) return;
        expect(r.value.kind, text).toBe(q.kind);
        expect(r.value.value, text).toBe(q.value); // toBe: Object.is, so -0 must survive too
        expect(r.value.plus, text).toBe(q.plus);
        expect(r.value.minus, text).toBe(q.minus);
        expect(r.value.unit.id, text).toBe(q.unit.id);
      }),
      RUNS,
    );
  });

  it("a mapping's canonical text reads back to the same quantity", () => {
    const mapping = fc.record({ value: finite, sigma: size, unit: unitText });
    fc.assert(
      fc.property(mapping, (m) => {
        const a = parseQuantity(m);
        expect(a.ok).toBe(true);
        if (!a.ok) return;
        const b = parseQuantity(a.value.text);
        expect(b.ok && [b.value.kind, b.value.value, b.value.plus, b.value.minus, b.value.unit.id]).toEqual([
          "measured", m.value, m.sigma, m.sigma, a.value.unit.id,
        ]);
      }),
      RUNS,
    );
  });
});

/** Moves the decimal point of a digit string `places` to the left: ("12", 3) → "0.012". */
function shiftLeft(digits: string, places: number): string {
  if (places === 0) return digits;
  const padded = digits.padStart(places + 1, "0");
  return `${padded.slice(0, padded.length - places)}.${padded.slice(padded.length - places)}`;
}

describe("concise notation", () => {
  it("x(u) equals x ± u with u counted in the last digits of x", () => {
    const parts = fc.record({
      negative: fc.boolean(),
      int: fc.nat({ max: 999999 }),
      frac: fc.string({ unit: fc.constantFrom("0", "1", "2", "3", "4", "5", "6", "7", "8", "9"), maxLength: 8 }),
      u: fc.integer({ min: 1, max: 999 }),
      unit: fc.constantFrom("yr", "d", "mas", "km/s", ""),
    });
    fc.assert(
      fc.property(parts, ({ negative, int, frac, u, unit }) => {
        const x = `${negative ? "-" : ""}${int}${frac.length > 0 ? `.${frac}` : ""}`;
        const concise = parseQuantity(`${x}(${u}) ${unit}`);
        const plain = parseQuantity(`${x} ± ${shiftLeft(String(u), frac.length)} ${unit}`);
        expect(concise.ok && plain.ok).toBe(true);
        if (!concise.ok || !plain.ok) return;
        expect([concise.value.value, concise.value.plus, concise.value.minus, concise.value.unit.id]).toEqual([
          plain.value.value, plain.value.plus, plain.value.minus, plain.value.unit.id,
        ]);
        expect(concise.value.decimals).toBe(frac.length);
      }),
      RUNS,
    );
  });
});

describe("number display", () => {
  // Below 10³⁰⁷ in size: rounding 1.5e308 to one digit gives 2e308, which no double can read back.
  const nonzero = fc.double({ min: -1e307, max: 1e307, noNaN: true }).filter((x) => x !== 0);

  it("formatNumber's text reads back within half a unit of its last digit", () => {
    fc.assert(
      fc.property(nonzero, fc.integer({ min: 1, max: 15 }), (x, sig) => {
        const text = formatNumber(x, sig);
        const r = parseQuantity(text);
        expect(r.ok, text).toBe(true);
        if (!r.ok) return;
        // Rounding to sig digits moves a number by at most half a unit in the sig-th digit: 5 × 10^-sig relative.
        expect(Math.abs(r.value.value - x) / Math.abs(x), text).toBeLessThanOrEqual(5 * 10 ** -sig * (1 + 1e-9));
      }),
      RUNS,
    );
  });

  it("latexNumber carries the same digits as formatNumber", () => {
    fc.assert(
      fc.property(finite, fc.integer({ min: 1, max: 15 }), (x, sig) => {
        const fromLatex = latexNumber(x, sig).replace("\\times10^{", "e").replace("}", "");
        const fromText = formatNumber(x, sig).replace(" × 10", "e").replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => "-0123456789"["⁻⁰¹²³⁴⁵⁶⁷⁸⁹".indexOf(c)]).replace("−", "-");
        expect(fromLatex).toBe(fromText);
      }),
      RUNS,
    );
  });

  it("formatMeasured rounds value and uncertainties to one place near the uncertainty's precision", () => {
    const case_ = fc.record({
      value: fc.double({ min: -1e12, max: 1e12, noNaN: true }),
      plus: fc.double({ min: 1e-9, max: 1e9, noNaN: true }),
      ratio: fc.double({ min: 0.2, max: 5, noNaN: true }),
      sig: fc.integer({ min: 1, max: 3 }),
    });
    fc.assert(
      fc.property(case_, ({ value, plus, ratio, sig }) => {
        const minus = plus * ratio;
        const text = formatMeasured(value, plus, minus, sig);
        const r = parseQuantity(text);
        expect(r.ok, text).toBe(true);
        if (!r.ok) return;
        // The place is that of the smaller uncertainty's sig-th digit, one higher when rounding carries:
        // every number moves by at most half of 10^(place + 1).
        const smaller = Math.min(plus, minus);
        const place = Math.floor(Math.log10(smaller)) - (sig - 1);
        const bound = 0.5 * 10 ** (place + 1) * (1 + 1e-9) + Math.abs(value) * 1e-15;
        expect(Math.abs(r.value.value - value), text).toBeLessThanOrEqual(bound);
        expect(Math.abs(r.value.plus - plus), text).toBeLessThanOrEqual(bound);
        expect(Math.abs(r.value.minus - minus), text).toBeLessThanOrEqual(bound);
      }),
      RUNS,
    );
  });
});
