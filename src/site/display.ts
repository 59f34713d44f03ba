import { formatMeasured, formatNumber } from "../quantity/format.js";

/**
 * Numbers as the pages print them: plain Unicode text (true minus sign,
 * superscript exponents), so that templates never need to mark them safe.
 * Rounding is the quantity formatter's; this adds what pages need on top
 * (a dash for "no number", exact values in full, percentages). Downloads carry
 * the full-precision numbers instead.
 */

const MINUS = "\u2212";
const SUPERSCRIPT_DIGITS: Readonly<Record<string, string>> = {
  "-": "\u207b",
  "0": "\u2070",
  "1": "\u00b9",
  "2": "\u00b2",
  "3": "\u00b3",
  "4": "\u2074",
  "5": "\u2075",
  "6": "\u2076",
  "7": "\u2077",
  "8": "\u2078",
  "9": "\u2079",
};

export function superscript(n: number): string {
  return String(n).replace(/./g, (c) => SUPERSCRIPT_DIGITS[c] ?? c);
}

const NO_NUMBER = "\u2014";

/** A bare number with `significant` digits: "3.142", "1.581 × 10⁹", "−0.01230"; a dash for NaN. */
export function formatPlain(x: number, significant = 4): string {
  if (Number.isNaN(x)) return NO_NUMBER;
  return formatNumber(x, Math.min(Math.max(Math.round(significant), 1), 21));
}

/**
 * A value with its 1σ: "3.07 ± 0.05", "3.07 +0.06 −0.05", "(1.581 ± 0.006) × 10⁹".
 * Without a positive uncertainty the value is shown alone (see formatCompact).
 */
export function formatWithSigma(value: number, plus: number, minus: number = plus): string {
  if (Number.isNaN(value)) return NO_NUMBER;
  const usable = (s: number): boolean => Number.isFinite(s) && s > 0;
  if (!usable(plus) && !usable(minus)) return formatCompact(value);
  return formatMeasured(value, usable(plus) ? plus : 0, usable(minus) ? minus : 0);
}

/** z to two decimals; ±∞ when the difference met a zero uncertainty; a dash when there is none. */
export function formatZ(z: number): string {
  if (Number.isNaN(z)) return NO_NUMBER;
  if (!Number.isFinite(z)) return z > 0 ? "\u221e" : `${MINUS}\u221e`;
  const text = z.toFixed(2);
  if (/^-0\.00$/.test(text)) return "0.00";
  return text.replace(/^-/, MINUS);
}

/** A ratio such as recomputed / published, to five significant digits. */
export function formatRatio(r: number): string {
  return formatPlain(r, 5);
}

/** A fraction 0..1 as a percentage with one decimal: "42.0 %". */
export function formatShare(share: number): string {
  if (!Number.isFinite(share)) return NO_NUMBER;
  return `${(share * 100).toFixed(1)}\u00a0%`;
}

/** Text for a value followed by its unit symbol, with a non-breaking space when there is a unit. */
export function withUnit(text: string, unitSymbol: string): string {
  return unitSymbol === "" ? text : `${text}\u00a0${unitSymbol}`;
}

/**
 * A number without an uncertainty to size its digits (exact values, limits):
 * six significant digits at most, trailing zeros dropped: "90", "0.13", "3.2 × 10⁵".
 */
export function formatCompact(x: number): string {
  return formatPlain(x, 6).replace(/(\.\d*?)0+(?=$| )/, "$1").replace(/\.(?=$| )/, "");
}

/** A value as its kind requires: "< 3.2" and "> 5" for limits, the bare value when exact, else with its 1σ. */
export function formatByKind(kind: string, value: number, plus: number, minus: number): string {
  if (kind === "upper-limit") return `< ${formatCompact(value)}`;
  if (kind === "lower-limit") return `> ${formatCompact(value)}`;
  if (kind === "exact") return formatCompact(value);
  return formatWithSigma(value, plus, minus);
}
