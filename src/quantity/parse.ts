import { fail, issue, ok, type Issue, type Result } from "../problem.js";
import { unitById } from "../units/catalog.js";
import { parseUnit } from "../units/parse.js";
import type { Unit } from "../units/unit.js";
import { formatQuantity } from "./format.js";
import type { Quantity, QuantityKind } from "./quantity.js";

/*
 * Quantities as records write them.
 *
 * Strings:
 *   50.1 ± 0.2 yr      50.1 +/- 0.2 yr      50.1+-0.2 yr        symmetric 1σ
 *   50.1 +0.3 -0.2 yr  50.1 +0.3/-0.2 yr                        asymmetric 1σ
 *   50.123(12) yr      (uncertainty in units of the last digits: ±0.012)
 *   (1.2 ± 0.3) × 10^5 km                                       shared power of ten
 *   0.13    90 deg     1.2e-3    1.2×10^5    1.2x10^5           exact (no uncertainty)
 *   < 3.2 Msun   > 5 Msun   ≤ 3.2 Msun   ≥ 5 Msun               limits, only where allowed
 * The Unicode minus "−" is read as "-".
 *
 * Mappings:
 *   { value, sigma, unit }         { value, plus, minus, unit }
 *   { value, unit }                { value, unit, limit: upper | lower }
 * `value` may be a number or a string holding a plain number ("1.50" keeps its
 * two decimal places). `minus` is the size of the downward uncertainty; papers
 * print it with its sign ("−0.2"), so `minus: -0.2` is read as 0.2. That reading
 * is unambiguous: the field name already says "downwards", and an uncertainty
 * has no direction of its own. `plus` and `sigma` must not be negative.
 *
 * A plain YAML number is an exact dimensionless value. Every failure is an
 * issue; nothing here throws, whatever it is given.
 */

export interface ParseQuantityOptions {
  /** Accept "< 3.2" / "> 5" and `limit:` (published results only). */
  readonly allowLimits?: boolean;
  /** Field name used in messages, e.g. "period". */
  readonly field?: string;
}

const FORMS = '"50.1 ± 0.2 yr", "50.1 +0.3 -0.2 yr", "50.123(12) yr", "90 deg" or a plain number';
const HINT = `write e.g. ${FORMS}`;
const MAPPING_HINT = "use { value, sigma, unit }, { value, plus, minus, unit } or { value, unit }";
const LIMIT_HINT = 'limits such as "< 3.2 Msun" belong in `published`; measurement inputs need a value, with an uncertainty when there is one';
/** Decimal places kept for display at most (the limit of Number.prototype.toFixed). */
const MAX_DECIMALS = 100;
/** Longest quantity text read; longer strings are refused. */
const MAX_TEXT = 500;

const MAPPING_KEYS: ReadonlySet<string> = new Set(["value", "sigma", "plus", "minus", "unit", "limit"]);

// ---------------------------------------------------------------------------
// Numbers

/** A decimal number as typed: its digits and power of ten kept apart so that scaling stays exact. */
interface DecimalText {
  readonly negative: boolean;
  readonly intDigits: string;
  readonly fracDigits: string;
  /** Power of ten written with the number ("e-3"). */
  readonly exponent: number;
  /** Whether an "e" power of ten was written. */
  readonly hasExponent: boolean;
  /** Whether a decimal point was written ("12." or "1.2"). */
  readonly hasPoint: boolean;
}

function decimalValue(d: DecimalText, extraExponent = 0): number {
  const mantissa = `${d.negative ? "-" : ""}${d.intDigits || "0"}.${d.fracDigits || "0"}`;
  return Number(`${mantissa}e${d.exponent + extraExponent}`);
}

function decimalIsZero(d: DecimalText): boolean {
  for (const c of d.intDigits) if (c !== "0") return false;
  for (const c of d.fracDigits) if (c !== "0") return false;
  return true;
}

function decimalPlaces(d: DecimalText, extraExponent = 0): number {
  return Math.min(MAX_DECIMALS, Math.max(0, d.fracDigits.length - d.exponent - extraExponent));
}

function isDigit(c: string | undefined): boolean {
  return c !== undefined && c >= "0" && c <= "9";
}

const SUPERSCRIPT_DIGITS: Readonly<Record<string, string>> = {
  "⁰": "0", "¹": "1", "²": "2", "³": "3", "⁴": "4", "⁵": "5", "⁶": "6", "⁷": "7", "⁸": "8", "⁹": "9",
};

class QuantitySyntax {
  constructor(readonly issue: Issue) {}
}

/** A hand-written scanner: linear in the length of the text, no regular expressions. */
class Scanner {
  i = 0;
  constructor(readonly s: string, readonly what: string) {}

  get done(): boolean {
    return this.i >= this.s.length;
  }

  peek(offset = 0): string | undefined {
    return this.s[this.i + offset];
  }

  skipSpaces(): void {
    while (this.i < this.s.length) {
      const c = this.s[this.i];
      if (c === " " || c === "\t" || c === "\n" || c === "\r" || c === "\u00a0" || c === "\u2009" || c === "\u202f") this.i++;
      else break;
    }
  }

  fail(code: string, message: string, hint: string = HINT): never {
    throw new QuantitySyntax(issue(code, message, hint));
  }

  /** [sign] digits [. digits] [e [sign] digits]; undefined (position unchanged) when no number starts here. */
  number(allowSign: boolean): DecimalText | undefined {
    const s = this.s;
    const start = this.i;
    let j = this.i;
    let negative = false;
    if (allowSign && (s[j] === "-" || s[j] === "+")) {
      negative = s[j] === "-";
      j++;
    }
    const intStart = j;
    while (isDigit(s[j])) j++;
    const intDigits = s.slice(intStart, j);
    let fracDigits = "";
    let hasPoint = false;
    if (s[j] === "." && (intDigits.length > 0 || isDigit(s[j + 1]))) {
      hasPoint = true;
      j++;
      const fracStart = j;
      while (isDigit(s[j])) j++;
      fracDigits = s.slice(fracStart, j);
    }
    if (intDigits.length === 0 && fracDigits.length === 0) {
      this.i = start;
      return undefined;
    }
    this.i = j;
    const e = this.ePower();
    j = this.i;
    if (s[j] === "," && isDigit(s[j + 1])) {
      this.i = j;
      this.fail("bad-quantity", `${this.what} uses a comma in a number: ${quoteText(s)}`, "write numbers with a decimal point and without thousands separators, e.g. 1234.5");
    }
    this.i = j;
    return { negative, intDigits, fracDigits, exponent: e ?? 0, hasExponent: e !== undefined, hasPoint };
  }

  /** An "e-3" / "E+21" power of ten right here; undefined (position unchanged) when absent. */
  ePower(): number | undefined {
    const s = this.s;
    let j = this.i;
    if (!((s[j] === "e" || s[j] === "E") && (isDigit(s[j + 1]) || ((s[j + 1] === "-" || s[j + 1] === "+") && isDigit(s[j + 2]))))) return undefined;
    j++;
    let negative = false;
    if (s[j] === "-" || s[j] === "+") {
      negative = s[j] === "-";
      j++;
    }
    const start = j;
    while (isDigit(s[j])) j++;
    this.i = j;
    return this.exponentValue(s.slice(start, j), negative);
  }

  /** A power of ten written after a bracket: "e-11" or "× 10^5"; 0 when absent. */
  powerAfterBracket(): number {
    return this.ePower() ?? this.timesTen();
  }

  /** Digits of an exponent; absurdly long ones are capped (the value then overflows and is reported). */
  private exponentValue(digits: string, negative: boolean): number {
    const n = digits.length > 6 ? 1e6 : Number(digits);
    return negative ? -n : n;
  }

  /** An optional "× 10^n", "x10^n", "*10^n" or "×10ⁿ"; 0 (position unchanged) when absent. */
  timesTen(): number {
    const s = this.s;
    const start = this.i;
    let j = this.i;
    while (s[j] === " ") j++;
    if (s[j] !== "×" && s[j] !== "x" && s[j] !== "*") return 0;
    j++;
    while (s[j] === " ") j++;
    if (s[j] !== "1" || s[j + 1] !== "0") {
      this.i = start;
      return 0;
    }
    j += 2;
    let negative = false;
    let digits = "";
    if (s[j] === "^") {
      j++;
      const braced = s[j] === "{" || s[j] === "(";
      const close = s[j] === "{" ? "}" : ")";
      if (braced) j++;
      if (s[j] === "-" || s[j] === "+") {
        negative = s[j] === "-";
        j++;
      }
      const d0 = j;
      while (isDigit(s[j])) j++;
      digits = s.slice(d0, j);
      if (braced) {
        if (s[j] !== close) {
          this.i = j;
          this.fail("bad-quantity", `${this.what} has an unclosed bracket in its power of ten: ${quoteText(s)}`);
        }
        j++;
      }
    } else if (s[j] === "⁻" || s[j] === "⁺" || (s[j] ?? "") in SUPERSCRIPT_DIGITS) {
      if (s[j] === "⁻" || s[j] === "⁺") {
        negative = s[j] === "⁻";
        j++;
      }
      while ((s[j] ?? "") in SUPERSCRIPT_DIGITS) {
        digits += SUPERSCRIPT_DIGITS[s[j]];
        j++;
      }
    } else {
      this.i = start;
      return 0;
    }
    if (digits.length === 0) {
      this.i = j;
      this.fail("bad-quantity", `${this.what} has a power of ten without digits: ${quoteText(s)}`);
    }
    this.i = j;
    return this.exponentValue(digits, negative);
  }
}

function quoteText(s: string): string {
  return JSON.stringify(s.length > 60 ? `${s.slice(0, 60)}…` : s);
}

/** A short description of a value that is not a string, safe for any input. */
function describeValue(raw: unknown): string {
  if (raw === null) return "null";
  if (Array.isArray(raw)) return "a list";
  if (raw instanceof Date) return "a date";
  switch (typeof raw) {
    case "boolean":
      return raw ? "true" : "false";
    case "number":
      return String(raw);
    case "string":
      return quoteText(raw);
    case "object":
      return "a mapping";
    default:
      return `a value of type ${typeof raw}`;
  }
}

const NON_FINITE_WORDS = ["nan", "inf", "infinity", ".nan", ".inf", "∞"];

function startsWithNonFiniteWord(s: string, i: number): boolean {
  let j = i;
  if (s[j] === "-" || s[j] === "+") j++;
  const rest = s.slice(j, j + 9).toLowerCase();
  for (const w of NON_FINITE_WORDS) {
    if (rest.startsWith(w)) {
      const after = rest[w.length];
      if (after === undefined || !(after >= "a" && after <= "z")) return true;
    }
  }
  return false;
}

// ---------------------------------------------------------------------------
// Strings

interface Parsed {
  kind: QuantityKind;
  value: number;
  plus: number;
  minus: number;
  decimals: number;
  unitText: string;
}

function checkFinite(x: number, d: DecimalText, label: string, sc: Scanner): number {
  if (!Number.isFinite(x)) sc.fail("non-finite-number", `${sc.what}: ${label} is too large to represent: ${quoteText(sc.s)}`, "write a finite number; choose a larger unit for very large values");
  if (x === 0 && !decimalIsZero(d)) sc.fail("non-finite-number", `${sc.what}: ${label} is too small to represent: ${quoteText(sc.s)}`, "choose a smaller unit for very small values");
  return x;
}

function scanQuantityString(text: string, what: string): Parsed | Issue {
  const s = text.includes("−") ? text.split("−").join("-") : text;
  const sc = new Scanner(s, what);
  try {
    return scanQuantity(sc);
  } catch (e) {
    if (e instanceof QuantitySyntax) return e.issue;
    throw e;
  }
}

function scanQuantity(sc: Scanner): Parsed {
  const s = sc.s;
  sc.skipSpaces();
  if (sc.done) sc.fail("bad-quantity", `${sc.what} is empty`);

  let kind: QuantityKind = "measured";
  let limit: "upper-limit" | "lower-limit" | undefined;
  const c0 = sc.peek();
  if (c0 === "<" || c0 === "≤") limit = "upper-limit";
  else if (c0 === ">" || c0 === "≥") limit = "lower-limit";
  if (limit) {
    sc.i++;
    if ((c0 === "<" || c0 === ">") && sc.peek() === "=") sc.i++;
    sc.skipSpaces();
  }

  if (startsWithNonFiniteWord(s, sc.i)) {
    sc.fail("non-finite-number", `${sc.what} is not a finite number: ${quoteText(s)}`, "write a finite number; leave the field out when the value is unknown");
  }

  const grouped = sc.peek() === "(";
  if (grouped) {
    sc.i++;
    sc.skipSpaces();
  }

  const valueText = sc.number(true);
  if (!valueText) {
    sc.fail("bad-quantity", `${sc.what} does not start with a number: ${quoteText(s)}`);
  }

  // Concise form: 50.123(12) — the uncertainty in units of the last digits typed.
  let concise: DecimalText | undefined;
  {
    const save = sc.i;
    sc.skipSpaces();
    if (!grouped && sc.peek() === "(" && (isDigit(sc.peek(1)) || sc.peek(1) === ".")) {
      sc.i++;
      const u = sc.number(false);
      if (!u) sc.fail("bad-quantity", `${sc.what}: the brackets after the value hold no digits: ${quoteText(s)}`, 'write the uncertainty in the last digits, e.g. "50.123(12) yr"');
      if (u.hasExponent) sc.fail("bad-quantity", `${sc.what}: the bracketed uncertainty cannot carry its own power of ten: ${quoteText(s)}`, 'write e.g. "6.67430(15)e-11"');
      if (sc.peek() !== ")") sc.fail("bad-quantity", `${sc.what} has an unclosed bracket: ${quoteText(s)}`, 'write the uncertainty in the last digits, e.g. "50.123(12) yr"');
      sc.i++;
      concise = u;
    } else {
      sc.i = save;
    }
  }

  // Power of ten after the value, or after the concise bracket ("6.67430(15)e-11").
  let exponent = 0;
  if (!grouped) {
    exponent = concise ? sc.powerAfterBracket() : sc.timesTen();
    if (exponent !== 0 && valueText.hasExponent) sc.fail("bad-quantity", `${sc.what} has two powers of ten: ${quoteText(s)}`);
  }

  let plusText: DecimalText | undefined;
  let minusText: DecimalText | undefined;
  let plusExtra = 0;
  let minusExtra = 0;

  const afterValue = sc.i;
  sc.skipSpaces();
  const c = sc.peek();
  const pm = c === "±" ? 1 : c === "+" && sc.peek(1) === "/" && sc.peek(2) === "-" ? 3 : c === "+" && sc.peek(1) === "-" ? 2 : 0;
  if (pm > 0) {
    if (concise) sc.fail("bad-quantity", `${sc.what} gives two uncertainties: ${quoteText(s)}`, "give one uncertainty: either in brackets or after ±");
    sc.i += pm;
    sc.skipSpaces();
    if (startsWithNonFiniteWord(s, sc.i)) sc.fail("non-finite-number", `${sc.what}: the uncertainty is not a finite number: ${quoteText(s)}`);
    const u = sc.number(true);
    if (!u) sc.fail("incomplete-uncertainty", `${sc.what} has "±" but no uncertainty after it: ${quoteText(s)}`, 'write e.g. "50.1 ± 0.2 yr"');
    if (u.negative && !decimalIsZero(u)) sc.fail("negative-uncertainty", `${sc.what} has a negative uncertainty: ${quoteText(s)}`, 'an uncertainty is a size: write e.g. "50.1 ± 0.2 yr"');
    plusText = u;
    minusText = u;
    if (!grouped) plusExtra = minusExtra = sc.timesTen();
  } else if (c === "+" && (isDigit(sc.peek(1)) || sc.peek(1) === ".")) {
    if (concise) sc.fail("bad-quantity", `${sc.what} gives two uncertainties: ${quoteText(s)}`, "give one uncertainty: either in brackets or as +up -down");
    sc.i++;
    const up = sc.number(false);
    if (!up) sc.fail("bad-quantity", `${sc.what}: no number after "+": ${quoteText(s)}`);
    if (!grouped) plusExtra = sc.timesTen();
    sc.skipSpaces();
    if (sc.peek() === "/") {
      sc.i++;
      sc.skipSpaces();
    }
    if (sc.peek() !== "-" || !(isDigit(sc.peek(1)) || sc.peek(1) === ".")) {
      sc.fail("incomplete-uncertainty", `${sc.what} gives an upward uncertainty but no downward one: ${quoteText(s)}`, 'write both sides, e.g. "50.1 +0.3 -0.2 yr", or "50.1 ± 0.3 yr" when they are equal');
    }
    sc.i++;
    const down = sc.number(false);
    if (!down) sc.fail("bad-quantity", `${sc.what}: no number after "-": ${quoteText(s)}`);
    if (!grouped) minusExtra = sc.timesTen();
    plusText = up;
    minusText = down;
  } else if (c === "-" && (isDigit(sc.peek(1)) || sc.peek(1) === ".")) {
    sc.fail("incomplete-uncertainty", `${sc.what} gives a downward uncertainty without an upward one first: ${quoteText(s)}`, 'write the upward side first, e.g. "50.1 +0.3 -0.2 yr"');
  } else {
    sc.i = afterValue;
  }

  if (grouped) {
    sc.skipSpaces();
    if (sc.peek() !== ")") sc.fail("bad-quantity", `${sc.what} has an unclosed bracket: ${quoteText(s)}`, 'write e.g. "(1.2 ± 0.3) × 10^5 km"');
    sc.i++;
    exponent = sc.powerAfterBracket();
    if (exponent !== 0 && (valueText.hasExponent || plusText?.hasExponent || minusText?.hasExponent)) {
      sc.fail("bad-quantity", `${sc.what} has two powers of ten: ${quoteText(s)}`);
    }
  }

  sc.skipSpaces();
  const more = sc.peek();
  if (more === "±" || (more === "+" && sc.peek(1) === "/") || (more === "+" && sc.peek(1) === "-")) {
    sc.fail("bad-quantity", `${sc.what} gives more than one uncertainty: ${quoteText(s)}`, "give one combined 1σ uncertainty");
  }
  if (more !== undefined && "+-<>≤≥(),".includes(more)) {
    sc.fail("bad-quantity", `${sc.what} has unexpected ${JSON.stringify(more)} after the number: ${quoteText(s)}`);
  }
  const unitText = s.slice(sc.i).trim();
  if (unitText.includes("±") || unitText.includes("+/-")) {
    sc.fail("bad-quantity", `${sc.what} puts its uncertainty after the unit: ${quoteText(s)}`, 'write the unit last, e.g. "50.1 ± 0.2 yr"');
  }

  // Values, exactly scaled from their decimal text.
  const value = checkFinite(decimalValue(valueText, exponent), valueText, "the value", sc);
  let plus = 0;
  let minus = 0;
  if (concise) {
    // "1.5(12)" counts in the last digit of 1.5 (±1.2); "1.5(1.2)", with a point, is the uncertainty itself.
    const shift = exponent + valueText.exponent - (concise.hasPoint ? 0 : valueText.fracDigits.length);
    plus = minus = checkFinite(decimalValue(concise, shift), concise, "the uncertainty", sc);
  } else if (plusText && minusText) {
    // A shared power of ten applies to the uncertainties only in the bracketed form "(1.2 ± 0.3) × 10^5".
    const shared = grouped ? exponent : 0;
    plus = checkFinite(Math.abs(decimalValue(plusText, shared + plusExtra)), plusText, "the uncertainty", sc);
    minus = checkFinite(Math.abs(decimalValue(minusText, shared + minusExtra)), minusText, "the uncertainty", sc);
  }
  const hasUncertainty = concise !== undefined || plusText !== undefined;
  if (limit) {
    if (hasUncertainty) sc.fail("bad-quantity", `${sc.what}: a limit takes no uncertainty: ${quoteText(s)}`, 'write e.g. "< 3.2 Msun"');
    kind = limit;
  } else {
    kind = hasUncertainty ? "measured" : "exact";
  }
  return { kind, value, plus, minus, decimals: decimalPlaces(valueText, exponent), unitText };
}

// ---------------------------------------------------------------------------
// Entry point

/**
 * Reads a quantity from a record value: a string, a mapping or a number.
 * Never throws.
 */
export function parseQuantity(raw: unknown, options: ParseQuantityOptions = {}): Result<Quantity> {
  const what = typeof options.field === "string" && options.field.length > 0 ? options.field : "the quantity";
  const allowLimits = options.allowLimits === true;
  if (typeof raw === "string") return fromString(raw, what, allowLimits);
  if (typeof raw === "number") return fromNumber(raw, what);
  if (isPlainMapping(raw)) return fromMapping(raw, what, allowLimits);
  return fail(issue("bad-quantity", `${what} must be a number, a text such as "50.1 ± 0.2 yr" or a mapping; got ${describeValue(raw)}`, HINT));
}

function isPlainMapping(raw: unknown): raw is Record<string, unknown> {
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) return false;
  const proto = Object.getPrototypeOf(raw);
  return proto === Object.prototype || proto === null;
}

function build(p: Parsed, unit: Unit, unitText: string, text: string): Quantity {
  return Object.freeze({ kind: p.kind, value: p.value, plus: p.plus, minus: p.minus, unit, unitText, text, decimals: p.decimals });
}

function fromString(raw: string, what: string, allowLimits: boolean): Result<Quantity> {
  const text = raw.trim();
  if (text.length > MAX_TEXT) {
    return fail(issue("bad-quantity", `${what} is ${text.length} characters long, too long for a quantity`, HINT));
  }
  const parsed = scanQuantityString(text, what);
  if ("code" in parsed) return fail(parsed);
  const issues: Issue[] = [];
  if ((parsed.kind === "upper-limit" || parsed.kind === "lower-limit") && !allowLimits) {
    issues.push(issue("limit-not-allowed", `${what} is a limit (${quoteText(text)}), which is not allowed here`, LIMIT_HINT));
  }
  const unit = parseUnit(parsed.unitText);
  if (!unit.ok) issues.push(...unit.issues);
  if (issues.length > 0 || !unit.ok) return fail(...issues);
  return ok(build(parsed, unit.value, parsed.unitText, text));
}

function fromNumber(raw: number, what: string): Result<Quantity> {
  if (!Number.isFinite(raw)) {
    return fail(issue("non-finite-number", `${what} is not a finite number: ${String(raw)}`, "write a finite number; leave the field out when the value is unknown"));
  }
  const text = Object.is(raw, -0) ? "-0" : String(raw);
  const decimals = decimalsOfNumber(text);
  const q: Quantity = { kind: "exact", value: raw, plus: 0, minus: 0, unit: unitById("1"), unitText: "", text, decimals };
  return ok(Object.freeze(q));
}

function decimalsOfNumber(text: string): number | undefined {
  const sc = new Scanner(text, "");
  const d = sc.number(true);
  return d && sc.done ? decimalPlaces(d) : undefined;
}

/** A mapping field holding a plain number: a YAML number, or a string such as "1.50". */
function mappingNumber(raw: unknown, key: string, what: string, issues: Issue[]): { value: number; decimals?: number } | undefined {
  if (typeof raw === "number") {
    if (!Number.isFinite(raw)) {
      issues.push(issue("non-finite-number", `${what}: ${key} is not a finite number: ${String(raw)}`, "write a finite number", key));
      return undefined;
    }
    return { value: raw, decimals: decimalsOfNumber(String(raw)) };
  }
  if (typeof raw === "string") {
    const text = raw.trim().split("−").join("-");
    if (startsWithNonFiniteWord(text, 0)) {
      issues.push(issue("non-finite-number", `${what}: ${key} is not a finite number: ${quoteText(raw)}`, "write a finite number", key));
      return undefined;
    }
    const sc = new Scanner(text, what);
    let d: DecimalText | undefined;
    try {
      d = sc.number(true);
    } catch (e) {
      if (!(e instanceof QuantitySyntax)) throw e;
      issues.push({ ...e.issue, path: key });
      return undefined;
    }
    if (d && sc.done) {
      const value = decimalValue(d);
      if (!Number.isFinite(value) || (value === 0 && !decimalIsZero(d))) {
        issues.push(issue("non-finite-number", `${what}: ${key} is out of range: ${quoteText(raw)}`, "write a finite number; choose another unit", key));
        return undefined;
      }
      return { value, decimals: decimalPlaces(d) };
    }
  }
  issues.push(issue("bad-quantity-field", `${what}: ${key} must be a plain number; got ${describeValue(raw)}`, `write e.g. ${key}: 0.2 (the unit goes in \`unit\`)`, key));
  return undefined;
}

function fromMapping(raw: Record<string, unknown>, what: string, allowLimits: boolean): Result<Quantity> {
  const issues: Issue[] = [];
  const keys = Object.keys(raw);
  for (const k of keys) {
    if (!MAPPING_KEYS.has(k)) {
      issues.push(issue("bad-quantity-field", `${what} has an unknown field ${quoteText(k)}`, `${MAPPING_HINT}, with optional limit: upper or lower`, k));
    }
  }
  const has = (k: string) => Object.prototype.hasOwnProperty.call(raw, k) && raw[k] !== undefined;

  let value: { value: number; decimals?: number } | undefined;
  if (!has("value")) issues.push(issue("bad-quantity-field", `${what} has no \`value\` field`, MAPPING_HINT, "value"));
  else value = mappingNumber(raw.value, "value", what, issues);

  let unit: Unit | undefined = unitById("1");
  let unitText = "";
  if (has("unit")) {
    const u = raw.unit;
    if (typeof u !== "string") {
      issues.push(issue("bad-quantity-field", `${what}: unit must be text; got ${describeValue(u)}`, 'write e.g. unit: "km/s"', "unit"));
      unit = undefined;
    } else {
      unitText = u.trim();
      const parsed = parseUnit(u);
      if (parsed.ok) unit = parsed.value;
      else {
        for (const i of parsed.issues) issues.push({ ...i, path: "unit" });
        unit = undefined;
      }
    }
  }

  let kind: QuantityKind = "exact";
  if (has("limit")) {
    const l = raw.limit;
    if (l === "upper") kind = "upper-limit";
    else if (l === "lower") kind = "lower-limit";
    else issues.push(issue("bad-quantity-field", `${what}: limit must be "upper" or "lower"; got ${describeValue(l)}`, "write limit: upper or limit: lower", "limit"));
    if (!allowLimits) issues.push(issue("limit-not-allowed", `${what} is a limit, which is not allowed here`, LIMIT_HINT, "limit"));
  }
  const isLimit = has("limit");

  let plus = 0;
  let minus = 0;
  const hasSigma = has("sigma");
  const hasPlus = has("plus");
  const hasMinus = has("minus");
  if (isLimit && (hasSigma || hasPlus || hasMinus)) {
    issues.push(issue("bad-quantity-field", `${what}: a limit takes no uncertainty`, "write { value, unit, limit } alone", hasSigma ? "sigma" : hasPlus ? "plus" : "minus"));
  }
  if (hasSigma && (hasPlus || hasMinus)) {
    issues.push(issue("bad-quantity-field", `${what} gives both sigma and plus/minus`, "give sigma for a symmetric uncertainty, or plus and minus for an asymmetric one", "sigma"));
  } else if (hasSigma) {
    const sigma = mappingNumber(raw.sigma, "sigma", what, issues);
    if (sigma) {
      if (sigma.value < 0) issues.push(issue("negative-uncertainty", `${what}: sigma is negative (${sigma.value})`, "an uncertainty is a size: write it without a sign", "sigma"));
      else plus = minus = sigma.value;
      if (!isLimit) kind = "measured";
    }
  } else if (hasPlus || hasMinus) {
    if (!hasPlus) issues.push(issue("bad-quantity-field", `${what} gives minus but no plus`, "give both plus and minus, or sigma when they are equal", "plus"));
    if (!hasMinus) issues.push(issue("bad-quantity-field", `${what} gives plus but no minus`, "give both plus and minus, or sigma when they are equal", "minus"));
    const p = hasPlus ? mappingNumber(raw.plus, "plus", what, issues) : undefined;
    const m = hasMinus ? mappingNumber(raw.minus, "minus", what, issues) : undefined;
    if (p && p.value < 0) issues.push(issue("negative-uncertainty", `${what}: plus is negative (${p.value})`, "plus is the size of the upward uncertainty: write it without a sign", "plus"));
    if (p && m && p.value >= 0) {
      plus = p.value;
      // A signed minus ("-0.2", as papers print it) means the same as its size; see the comment at the top.
      minus = Math.abs(m.value);
      if (!isLimit) kind = "measured";
    }
  }

  if (issues.length > 0 || !value || !unit) return fail(...issues);
  const q: Quantity = Object.freeze({ kind, value: value.value, plus: isLimit ? 0 : plus, minus: isLimit ? 0 : minus, unit, unitText, text: "", decimals: value.decimals });
  return ok(Object.freeze({ ...q, text: formatQuantity(q) }));
}
