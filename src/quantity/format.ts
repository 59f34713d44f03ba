import type { Quantity } from "./quantity.js";

/*
 * Display forms of numbers and quantities.
 *
 * - formatQuantity: a text that parseQuantity reads back to the same kind,
 *   value, uncertainties and unit (every number written in full precision).
 * - formatNumber / latexNumber: a number rounded to significant digits, plain
 *   between 10⁻³ and 10⁴, otherwise as mantissa × power of ten.
 * - formatMeasured: a value with its uncertainty, both rounded to the
 *   uncertainty's precision.
 */

const MINUS = "−";
const TO_SUPERSCRIPT: Readonly<Record<string, string>> = {
  "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹",
};

/** Smallest and largest powers of ten written without a power of ten: 0.001 ≤ |x| < 10 000. */
const PLAIN_MIN_EXPONENT = -3;
const PLAIN_MAX_EXPONENT = 3;

/** Shortest text that reads back as exactly `x` ("-0" for negative zero). */
function fullPrecision(x: number): string {
  return Object.is(x, -0) ? "-0" : String(x);
}

/**
 * A text form of `q` that parseQuantity reads back to an equal quantity:
 * "50.1 ± 0.2 yr", "50.1 +0.3 -0.2 yr", "90 deg", "< 3.2 Msun".
 */
export function formatQuantity(q: Quantity): string {
  const unit = q.unit.id === "1" ? "" : ` ${q.unit.id}`;
  const v = fullPrecision(q.value);
  switch (q.kind) {
    case "exact":
      return `${v}${unit}`;
    case "upper-limit":
      return `< ${v}${unit}`;
    case "lower-limit":
      return `> ${v}${unit}`;
    case "measured": {
      const plus = fullPrecision(Math.abs(q.plus));
      const minus = fullPrecision(Math.abs(q.minus));
      return q.plus === q.minus ? `${v} ± ${plus}${unit}` : `${v} +${plus} -${minus}${unit}`;
    }
  }
}

function checkSignificant(significant: number): void {
  if (!Number.isInteger(significant) || significant < 1 || significant > 21) {
    throw new Error(`significant digits must be a whole number from 1 to 21, not ${significant}`);
  }
}

/** |x| rounded to `significant` digits: the digits (no point) and the power of ten of the first one. */
function roundedDigits(x: number, significant: number): { digits: string; exponent: number } {
  // "d.ddde+N", or "de+N" for one digit
  const text = Math.abs(x).toExponential(significant - 1);
  const e = text.indexOf("e");
  return { digits: e === 1 ? text[0] : text[0] + text.slice(2, e), exponent: Number(text.slice(e + 1)) };
}

/** Places the decimal point in `digits` whose first digit has power of ten `exponent`. */
function positional(digits: string, exponent: number): string {
  if (exponent < 0) return `0.${"0".repeat(-exponent - 1)}${digits}`;
  const intLength = exponent + 1;
  if (digits.length <= intLength) return digits + "0".repeat(intLength - digits.length);
  return `${digits.slice(0, intLength)}.${digits.slice(intLength)}`;
}

function mantissaOf(digits: string): string {
  return digits.length > 1 ? `${digits[0]}.${digits.slice(1)}` : digits;
}

function superscript(n: number): string {
  let out = "";
  for (const c of String(n)) out += TO_SUPERSCRIPT[c] ?? c;
  return out;
}

function isPlain(exponent: number): boolean {
  return exponent >= PLAIN_MIN_EXPONENT && exponent <= PLAIN_MAX_EXPONENT;
}

/**
 * A number for reading: "12.34", "0.001234", "1.234 × 10²⁰", "−5.000 × 10⁻⁷".
 * Trailing zeros are kept: they are significant digits.
 */
export function formatNumber(x: number, significant = 4): string {
  checkSignificant(significant);
  if (Number.isNaN(x)) return "NaN";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : `${MINUS}∞`;
  if (x === 0) return "0";
  const { digits, exponent } = roundedDigits(x, significant);
  const sign = x < 0 ? MINUS : "";
  if (isPlain(exponent)) return sign + positional(digits, exponent);
  return `${sign}${mantissaOf(digits)} × 10${superscript(exponent)}`;
}

/** The same number as LaTeX: "12.34", "1.234\\times10^{20}", "-5.000\\times10^{-7}". */
export function latexNumber(x: number, significant = 4): string {
  checkSignificant(significant);
  if (Number.isNaN(x)) return "\\mathrm{NaN}";
  if (!Number.isFinite(x)) return x > 0 ? "\\infty" : "-\\infty";
  if (x === 0) return "0";
  const { digits, exponent } = roundedDigits(x, significant);
  const sign = x < 0 ? "-" : "";
  if (isPlain(exponent)) return sign + positional(digits, exponent);
  return `${sign}${mantissaOf(digits)}\\times10^{${exponent}}`;
}

const NONZERO_DIGIT = /[1-9]/;
/** A double carries at most 17 significant decimal digits. */
const MAX_DIGITS = 17;

/** `x` rounded to a multiple of 10^place and written with the decimals that place needs, in units of 10^scale. */
function atPlace(x: number, place: number, scale: number): string {
  // Shift by the power of ten through the decimal text, so that the shift itself adds no rounding;
  // with no shift that text (17 significant digits) reads back as |x| itself.
  let shifted = Math.abs(x);
  if (scale !== 0) {
    const [m, e] = shifted.toExponential(16).split("e");
    shifted = Number(`${m}e${Number(e) - scale}`);
  }
  let text: string;
  if (place > scale) {
    const step = Math.pow(10, place - scale);
    text = (Math.round(shifted / step) * step).toFixed(0);
  } else {
    text = shifted.toFixed(scale - place);
  }
  return x < 0 && NONZERO_DIGIT.test(text) ? MINUS + text : text;
}

/**
 * A value with its 1σ uncertainty, both rounded to the place of the
 * uncertainty's `significant`-th digit (two significant digits of the
 * uncertainty is common practice): "3.081 ± 0.025", "3.08 +0.03 −0.02",
 * "(1.234 ± 0.034) × 10²⁰". With unequal sides the smaller one sets the place.
 */
export function formatMeasured(value: number, plus: number, minus: number, significant = 2): string {
  checkSignificant(significant);
  if (!Number.isFinite(value) || !Number.isFinite(plus) || !Number.isFinite(minus)) {
    return plus === minus || (Number.isNaN(plus) && Number.isNaN(minus))
      ? `${formatNumber(value)} ± ${formatNumber(plus)}`
      : `${formatNumber(value)} +${formatNumber(plus)} ${MINUS}${formatNumber(minus)}`;
  }
  if (plus < 0 || minus < 0) throw new Error(`uncertainties are sizes and cannot be negative: +${plus} −${minus}`);
  const symmetric = plus === minus;
  const nonzero = [plus, minus].filter((u) => u > 0);
  if (nonzero.length === 0) return `${formatNumber(value)} ± 0`;

  const smallest = Math.min(...nonzero);
  const rounded = roundedDigits(smallest, significant);
  const place = rounded.exponent - (significant - 1);
  const largest = Math.max(Math.abs(value), plus, minus);
  const top = roundedDigits(largest, 17).exponent;
  const scale = isPlain(top) ? 0 : top;

  if (top - place + 1 > MAX_DIGITS) {
    // The uncertainty lies below the precision of the value itself: round each on its own.
    return symmetric
      ? `${formatNumber(value, 17)} ± ${formatNumber(plus, significant)}`
      : `${formatNumber(value, 17)} +${formatNumber(plus, significant)} ${MINUS}${formatNumber(minus, significant)}`;
  }
  const v = atPlace(value, place, scale);
  const body = symmetric
    ? `${v} ± ${atPlace(plus, place, scale)}`
    : `${v} +${atPlace(plus, place, scale)} ${MINUS}${atPlace(minus, place, scale)}`;
  return scale === 0 ? body : `(${body}) × 10${superscript(scale)}`;
}
