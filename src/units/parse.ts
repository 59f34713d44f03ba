import { fail, issue, ok, type Issue, type Result } from "../problem.js";
import { DEFAULT_SET } from "../constants/sets.js";
import { relativeUncertainty } from "../constants/constant.js";
import { UNITS, findUnit, unitById, unitSpellings } from "./catalog.js";
import {
  ANGLE,
  DIMENSIONLESS,
  GRAVITATIONAL_PARAMETER,
  LENGTH,
  MASS,
  TIME,
  VELOCITY,
  describeDimension,
  multiplyDimensions,
  powerDimension,
  sameDimension,
  type Dimension,
} from "./dimension.js";
import type { Unit } from "./unit.js";

/*
 * Unit strings.
 *
 * A unit is either one catalogue spelling ("km/s", "M_sun", "solar masses"),
 * matched exactly after trimming and collapsing whitespace, or a product of
 * catalogue units with whole-number powers:
 *
 *   km s^-1   km s-1   km s**-1   km·s⁻¹   km/s   m3 s-2   km^3/s^2   Msun/(pc^3)
 *
 * Factors are separated by spaces, "·", "⋅", "*" or "."; a power follows its
 * unit as "^n", "^(n)", "**n", plain digits ("s-1", "m3") or superscripts
 * ("s⁻¹"). A "/" divides by the one factor (or bracketed group) that follows
 * it; anything after that factor is refused as ambiguous ("m3/kg s2" could be
 * read two ways), so write "m3 kg-1 s-2" or "m3/(kg s2)".
 *
 * Spelling is case-sensitive ("Mm" is not "mm"): an unknown unit is an error
 * with suggestions, never a guess.
 */

const G_REL = relativeUncertainty(DEFAULT_SET.G);

/** Longest unit text parsed; longer strings are refused outright. */
const MAX_UNIT_LENGTH = 200;
/** Deepest nesting of brackets accepted. */
const MAX_DEPTH = 4;
/** Largest power accepted on a factor. */
const MAX_POWER = 12;

const SUPERSCRIPT_DIGITS: Readonly<Record<string, number>> = {
  "⁰": 0, "¹": 1, "²": 2, "³": 3, "⁴": 4, "⁵": 5, "⁶": 6, "⁷": 7, "⁸": 8, "⁹": 9,
};
const SUPERSCRIPT_MINUS = "⁻";
const SUPERSCRIPT_PLUS = "⁺";
const TO_SUPERSCRIPT: Readonly<Record<string, string>> = {
  "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹",
};

const WHITESPACE_RUN = /\s+/g;

interface Factor {
  readonly unit: Unit;
  readonly power: number;
}

/** Result cache: parsing runs once per value in every record. Results are frozen, so sharing them is safe. */
const CACHE = new Map<string, Result<Unit>>();
const CACHE_LIMIT = 4096;

/**
 * Parses a unit string into a catalogue unit or a compound of catalogue units.
 * Never throws: any input gives a value or issues.
 */
export function parseUnit(text: string): Result<Unit> {
  if (typeof text !== "string") {
    return fail(issue("bad-unit", "a unit must be written as text", `write a unit such as ${EXAMPLE_LIST}`));
  }
  const cached = CACHE.get(text);
  if (cached) return cached;
  const result = freezeResult(parseUncached(text));
  if (CACHE.size >= CACHE_LIMIT) CACHE.clear();
  CACHE.set(text, result);
  return result;
}

function freezeResult(r: Result<Unit>): Result<Unit> {
  if (!r.ok) {
    for (const i of r.issues) Object.freeze(i);
    Object.freeze(r.issues);
  }
  return Object.freeze(r);
}

const EXAMPLE_LIST = "s, d, yr, au, pc, mas, km/s, Msun";

function parseUncached(text: string): Result<Unit> {
  if (text.length > MAX_UNIT_LENGTH) {
    return fail(issue("bad-unit", `unit text of ${text.length} characters is too long to be a unit`, `write a unit such as ${EXAMPLE_LIST}`));
  }
  const normal = text.trim().replace(WHITESPACE_RUN, " ");
  const exact = findUnit(normal);
  if (exact) return ok(exact);

  const parser = new CompoundParser(normal);
  const outcome = parser.parse();
  if (outcome.syntax) {
    // Keep the syntax problem, but a near catalogue spelling ("km//s" → "km/s") is the better hint.
    const near = suggestions(normal);
    return fail(near.length > 0 ? { ...outcome.syntax, hint: didYouMean(near, normal) } : outcome.syntax);
  }
  if (outcome.unknown.length > 0) {
    const whole = wholeTextSuggestion(normal);
    if (whole) return fail(whole);
    return fail(
      ...outcome.unknown.map((name) =>
        issue(
          "unknown-unit",
          name === normal ? `unknown unit ${quote(name)}` : `unknown unit ${quote(name)} in ${quote(normal)}`,
          suggestionHint(name),
        ),
      ),
    );
  }
  return buildCompound(outcome.factors, normal);
}

/** An unknown-unit issue for the whole text when it is close to one catalogue spelling (e.g. "Solar masses"). */
function wholeTextSuggestion(normal: string): Issue | undefined {
  const near = suggestions(normal);
  if (near.length === 0) return undefined;
  return issue("unknown-unit", `unknown unit ${quote(normal)}`, didYouMean(near, normal));
}

function quote(s: string): string {
  const shown = s.length > 40 ? `${s.slice(0, 40)}…` : s;
  return `"${shown}"`;
}

interface ParseOutcome {
  factors: Factor[];
  unknown: string[];
  syntax?: Issue;
}

function isDigit(c: string): boolean {
  return c >= "0" && c <= "9";
}

function isSeparatorChar(c: string): boolean {
  return c === " " || c === "·" || c === "⋅" || c === "." || c === "*";
}

function isSuperscript(c: string): boolean {
  return c in SUPERSCRIPT_DIGITS || c === SUPERSCRIPT_MINUS || c === SUPERSCRIPT_PLUS;
}

/** Characters that end a unit name. "+" and "-" end it only when a digit follows (a power). */
function endsName(s: string, i: number): boolean {
  const c = s[i];
  if (isSeparatorChar(c) || c === "/" || c === "^" || c === "(" || c === ")" || isDigit(c) || isSuperscript(c)) return true;
  if ((c === "-" || c === "+") && i + 1 < s.length && isDigit(s[i + 1])) return true;
  return false;
}

class SyntaxProblem {
  constructor(readonly issue: Issue) {}
}

const COMPOUND_HINT = 'write powers as "km s-1", "km s^-1", "m3 s-2" or "km/s"';

class CompoundParser {
  private i = 0;
  private readonly factors: Factor[] = [];
  private readonly unknown: string[] = [];

  constructor(private readonly s: string) {}

  parse(): ParseOutcome {
    if (this.s.length === 0) return { factors: [], unknown: [] };
    try {
      this.expression(0, 1);
      if (this.i < this.s.length) this.syntax(`unexpected ${quote(this.s[this.i])} in unit ${quote(this.s)}`);
    } catch (e) {
      if (e instanceof SyntaxProblem) return { factors: [], unknown: [], syntax: e.issue };
      throw e;
    }
    return { factors: this.factors, unknown: this.unknown };
  }

  private syntax(message: string, hint: string = COMPOUND_HINT): never {
    throw new SyntaxProblem(issue("bad-unit", message, hint));
  }

  /** Skips separators: 0 when there were none, 1 for spaces only, 2 when an operator ("·", "*", ".") was among them. */
  private skipSeparators(): 0 | 1 | 2 {
    let found: 0 | 1 | 2 = 0;
    while (this.i < this.s.length && isSeparatorChar(this.s[this.i])) {
      if (this.s[this.i] !== " ") {
        if (found === 2) this.syntax(`two operators in a row in unit ${quote(this.s)}`);
        found = 2;
      } else if (found === 0) {
        found = 1;
      }
      this.i++;
    }
    return found;
  }

  private skipSpaces(): void {
    while (this.i < this.s.length && this.s[this.i] === " ") this.i++;
  }

  /** expression := term ((separator | "/") term)*; the sign says whether the expression sits under a "/". */
  private expression(depth: number, sign: number): void {
    if (depth > MAX_DEPTH) this.syntax(`brackets nested too deeply in unit ${quote(this.s)}`);
    this.skipSpaces();
    this.term(depth, sign);
    let divided = false;
    for (;;) {
      const separator = this.skipSeparators();
      if (this.i >= this.s.length || this.s[this.i] === ")") {
        if (separator === 2) this.syntax(`unit ${quote(this.s)} ends with an operator`);
        return;
      }
      const c = this.s[this.i];
      if (c === "/") {
        if (separator === 2) this.syntax(`two operators in a row in unit ${quote(this.s)}`);
        if (divided) this.ambiguous();
        this.i++;
        this.skipSpaces();
        this.term(depth, -sign);
        divided = true;
        continue;
      }
      if (divided) this.ambiguous();
      if (separator === 0 && c !== "(") this.syntax(`unexpected ${quote(c)} in unit ${quote(this.s)}`);
      this.term(depth, sign);
    }
  }

  private ambiguous(): never {
    throw new SyntaxProblem(
      issue(
        "ambiguous-unit",
        `unit ${quote(this.s)} can be read more than one way: a "/" divides by the one factor that follows it`,
        'write every power explicitly, e.g. "km s-1 Mpc-1", or bracket the divisor, e.g. "km/(s Mpc)"',
      ),
    );
  }

  /** term := (name | "1" | "(" expression ")") power? */
  private term(depth: number, sign: number): void {
    if (this.i >= this.s.length) this.syntax(`unit ${quote(this.s)} ends where a unit was expected`);
    const c = this.s[this.i];
    if (c === "(") {
      this.i++;
      const mark = this.factors.length;
      this.expression(depth + 1, 1);
      if (this.s[this.i] !== ")") this.syntax(`unclosed bracket in unit ${quote(this.s)}`);
      this.i++;
      const power = this.power() * sign;
      for (let k = mark; k < this.factors.length; k++) {
        this.factors[k] = { unit: this.factors[k].unit, power: this.factors[k].power * power };
      }
      return;
    }
    if (isDigit(c)) {
      const start = this.i;
      while (this.i < this.s.length && isDigit(this.s[this.i])) this.i++;
      const digits = this.s.slice(start, this.i);
      if (digits !== "1") this.syntax(`a number ${quote(digits)} cannot stand in a unit ${quote(this.s)}`, "write the number with the value, not the unit");
      this.power();
      return;
    }
    if (c === ")" || c === "/" || c === "^" || isSuperscript(c) || isSeparatorChar(c) || c === "+" || c === "-") {
      this.syntax(`unexpected ${quote(c)} in unit ${quote(this.s)}`);
    }
    const start = this.i;
    while (this.i < this.s.length && !endsName(this.s, this.i)) this.i++;
    const name = this.s.slice(start, this.i);
    const power = this.power() * sign;
    const unit = findUnit(name);
    if (!unit) {
      if (!this.unknown.includes(name)) this.unknown.push(name);
      return;
    }
    for (const f of atomsOf(unit)) this.factors.push({ unit: f.unit, power: f.power * power });
  }

  /** power := "^" int | "^(" int ")" | "**" int | int | superscript int; 1 when absent. */
  private power(): number {
    const s = this.s;
    if (this.i >= s.length) return 1;
    const c = s[this.i];
    let n: number | undefined;
    if (c === "^") {
      this.i++;
      if (s[this.i] === "(") {
        this.i++;
        n = this.integer();
        if (s[this.i] !== ")") this.syntax(`unclosed bracket after "^" in unit ${quote(s)}`);
        this.i++;
      } else {
        n = this.integer();
      }
    } else if (c === "*" && s[this.i + 1] === "*") {
      this.i += 2;
      n = this.integer();
    } else if (isDigit(c) || ((c === "-" || c === "+") && isDigit(s[this.i + 1] ?? ""))) {
      n = this.integer();
    } else if (isSuperscript(c)) {
      n = this.superscriptInteger();
    } else {
      return 1;
    }
    if (s[this.i] === "." && isDigit(s[this.i + 1] ?? "")) this.syntax(`powers must be whole numbers in unit ${quote(s)}`);
    if (n === 0) this.syntax(`a power of 0 in unit ${quote(s)} cancels the unit`, "leave the factor out");
    if (Math.abs(n) > MAX_POWER) this.syntax(`power ${n} in unit ${quote(s)} is too large`);
    return n;
  }

  private integer(): number {
    const s = this.s;
    let negative = false;
    if (s[this.i] === "-" || s[this.i] === "+") {
      negative = s[this.i] === "-";
      this.i++;
    }
    const start = this.i;
    while (this.i < s.length && isDigit(s[this.i]) && this.i - start < 3) this.i++;
    if (this.i === start) this.syntax(`a power needs digits in unit ${quote(s)}`);
    if (this.i < s.length && isDigit(s[this.i])) this.syntax(`power in unit ${quote(s)} is too large`);
    const n = Number(s.slice(start, this.i));
    return negative ? -n : n;
  }

  private superscriptInteger(): number {
    const s = this.s;
    let negative = false;
    if (s[this.i] === SUPERSCRIPT_MINUS || s[this.i] === SUPERSCRIPT_PLUS) {
      negative = s[this.i] === SUPERSCRIPT_MINUS;
      this.i++;
    }
    let n = 0;
    let count = 0;
    while (this.i < s.length && s[this.i] in SUPERSCRIPT_DIGITS) {
      n = n * 10 + SUPERSCRIPT_DIGITS[s[this.i]];
      this.i++;
      count++;
      if (count > 3) this.syntax(`power in unit ${quote(s)} is too large`);
    }
    if (count === 0) this.syntax(`a power needs digits in unit ${quote(s)}`);
    return negative ? -n : n;
  }
}

/** Catalogue units that are themselves products ("km/s", "m3/s2") split into their simple factors. */
const ATOMS = new Map<string, readonly Factor[]>();

function atomsOf(unit: Unit): readonly Factor[] {
  const known = ATOMS.get(unit.id);
  if (known) return known;
  let atoms: readonly Factor[] = [{ unit, power: 1 }];
  if (unit.id.includes("/") || unit.id.includes(" ")) {
    const parsed = new CompoundParser(unit.id).parse();
    if (parsed.syntax || parsed.unknown.length > 0) throw new Error(`unit catalogue: compound id ${unit.id} does not parse`);
    atoms = parsed.factors;
  } else if (sameDimension(unit.dimension, DIMENSIONLESS) && unit.scale === 1) {
    atoms = [];
  }
  ATOMS.set(unit.id, atoms);
  return atoms;
}

function powerSuffix(power: number): string {
  return power === 1 ? "" : String(power);
}

function superscript(power: number): string {
  if (power === 1) return "";
  let out = "";
  for (const c of String(power)) out += TO_SUPERSCRIPT[c] ?? c;
  return out;
}

/** Canonical id of a product: simple factors in typed order, positive powers first, e.g. "Msun pc-3". */
function canonicalFactors(factors: readonly Factor[]): Factor[] {
  const merged: Factor[] = [];
  for (const f of factors) {
    const k = merged.findIndex((m) => m.unit.id === f.unit.id);
    if (k >= 0) merged[k] = { unit: f.unit, power: merged[k].power + f.power };
    else merged.push(f);
  }
  const kept = merged.filter((f) => f.power !== 0);
  return [...kept.filter((f) => f.power > 0), ...kept.filter((f) => f.power < 0)];
}

function buildCompound(factors: readonly Factor[], typed: string): Result<Unit> {
  const parts = canonicalFactors(factors);
  if (parts.length === 0) return ok(unitById("1"));
  if (parts.length === 1 && parts[0].power === 1) return ok(parts[0].unit);
  const id = parts.map((f) => f.unit.id + powerSuffix(f.power)).join(" ");
  const known = findUnit(id);
  if (known) return ok(known);

  let dim: Dimension = DIMENSIONLESS;
  // Exact powers of ten (km, cm, g) are summed as exponents so that "cm3" is exactly 1e-6 m³.
  let tens = 0;
  let rest = 1;
  for (const f of parts) {
    dim = multiplyDimensions(dim, powerDimension(f.unit.dimension, f.power));
    const k = Math.round(Math.log10(f.unit.scale));
    if (Number(`1e${k}`) === f.unit.scale) tens += k * f.power;
    else rest = f.power > 0 ? rest * Math.pow(f.unit.scale, f.power) : rest / Math.pow(f.unit.scale, -f.power);
  }
  const scale = rest * Number(`1e${tens}`);
  if (!Number.isFinite(scale) || scale <= 0) {
    return fail(issue("bad-unit", `unit ${quote(typed)} is too large or too small to represent`, "use a unit closer to the size of the value"));
  }
  const sources: string[] = [];
  for (const f of parts) if (!sources.includes(f.unit.source)) sources.push(f.unit.source);

  const extra: { gm?: number; gmRelativeUncertainty?: number } = {};
  if (sameDimension(dim, MASS)) {
    const massive = parts.filter((f) => f.unit.dimension.mass !== 0);
    const only = massive.length === 1 && massive[0].power === 1 ? massive[0].unit : undefined;
    if (only && only.gm !== undefined) {
      extra.gm = only.gm * (scale / only.scale);
      extra.gmRelativeUncertainty = only.gmRelativeUncertainty ?? 0;
    } else {
      extra.gm = scale * DEFAULT_SET.G.value;
      extra.gmRelativeUncertainty = G_REL;
    }
  }

  const unit: Unit = Object.freeze({
    id,
    symbol: parts.map((f) => f.unit.symbol + superscript(f.power)).join(" "),
    latex: parts.map((f) => (f.power === 1 ? `{${f.unit.latex}}` : `{${f.unit.latex}}^{${f.power}}`)).join("\\,"),
    dimension: dim,
    scale,
    definition: `derived from ${parts.map((f) => f.unit.id).join(", ")}`,
    source: sources.join("; "),
    aliases: Object.freeze([]) as readonly string[],
    ...extra,
  });
  return ok(unit);
}

// ---------------------------------------------------------------------------
// Suggestions

/** Spellings offered as suggestions: not the pure number "1" nor the empty spelling. */
const SPELLINGS = unitSpellings().filter((s) => s.length > 0 && s !== "1");
const LOWER_SPELLINGS = SPELLINGS.map((s) => s.toLowerCase());
/** Longest text for which near spellings are searched. */
const MAX_SUGGEST_LENGTH = 40;

/** Optimal string alignment distance, stopping early once every cell exceeds `limit`. */
function distanceWithin(a: string, b: string, limit: number): number {
  if (Math.abs(a.length - b.length) > limit) return limit + 1;
  const m = b.length;
  let prev2: number[] = new Array(m + 1).fill(0);
  let prev: number[] = Array.from({ length: m + 1 }, (_, j) => j);
  let cur: number[] = new Array(m + 1).fill(0);
  for (let i = 1; i <= a.length; i++) {
    cur[0] = i;
    let rowMin = cur[0];
    for (let j = 1; j <= m; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, prev2[j - 2] + 1);
      cur[j] = d;
      if (d < rowMin) rowMin = d;
    }
    if (rowMin > limit) return limit + 1;
    [prev2, prev, cur] = [prev, cur, prev2];
  }
  return prev[m];
}

/**
 * Catalogue spellings near `text`: those equal to it but for letter case when
 * there are any, otherwise the closest within a small edit distance (none for
 * one letter, 1 for up to 3 letters, else 2), compared case-insensitively,
 * keeping only those at the smallest distance found. At most 3, in catalogue order.
 */
export function suggestions(text: string): string[] {
  if (text.length === 0 || text.length > MAX_SUGGEST_LENGTH) return [];
  const lower = text.toLowerCase();
  const sameButCase = SPELLINGS.filter((s, k) => LOWER_SPELLINGS[k] === lower && s !== text);
  if (sameButCase.length > 0) return sameButCase.slice(0, 3);
  const limit = text.length <= 1 ? 0 : text.length <= 3 ? 1 : 2;
  let best = limit + 1;
  let near: string[] = [];
  for (let k = 0; k < SPELLINGS.length; k++) {
    const d = distanceWithin(lower, LOWER_SPELLINGS[k], limit);
    if (d > limit) continue;
    if (d < best) {
      best = d;
      near = [SPELLINGS[k]];
    } else if (d === best) {
      near.push(SPELLINGS[k]);
    }
  }
  return near.slice(0, 3);
}

function didYouMean(near: readonly string[], typed: string): string {
  const quoted = near.map((s) => `"${s}"`);
  const list = quoted.length <= 1 ? quoted.join("") : `${quoted.slice(0, -1).join(", ")} or ${quoted[quoted.length - 1]}`;
  const caseOnly = near.every((s) => s.toLowerCase() === typed.toLowerCase());
  return `did you mean ${list}?${caseOnly ? " Unit spelling is case-sensitive." : ""}`;
}

function suggestionHint(name: string): string {
  const near = suggestions(name);
  if (near.length > 0) return didYouMean(near, name);
  return `write a unit such as ${EXAMPLE_LIST}`;
}

// ---------------------------------------------------------------------------
// Dimension checks

/** Familiar units named in messages; other dimensions take the first catalogue units that have them. */
const EXAMPLES: ReadonlyArray<readonly [Dimension, readonly string[]]> = [
  [TIME, ["s", "d", "yr"]],
  [LENGTH, ["km", "au", "pc"]],
  [ANGLE, ["deg", "arcsec", "mas"]],
  [VELOCITY, ["km/s", "m/s"]],
  [MASS, ["Msun", "Mjup", "kg"]],
  [GRAVITATIONAL_PARAMETER, ["m3/s2", "km3/s2"]],
];

function examplesOf(d: Dimension): string[] {
  for (const [dim, ids] of EXAMPLES) if (sameDimension(dim, d)) return [...ids];
  return UNITS.filter((u) => sameDimension(u.dimension, d)).slice(0, 3).map((u) => u.id);
}

const VOWEL_START = /^[aeiou]/i;

function article(word: string): string {
  return VOWEL_START.test(word) ? "an" : "a";
}

function needs(d: Dimension): string {
  if (sameDimension(d, DIMENSIONLESS)) return "a plain number without a unit";
  const name = describeDimension(d);
  const ex = examplesOf(d);
  return `${article(name)} ${name} unit${ex.length > 0 ? ` (${ex.join(", ")})` : ""}`;
}

function isWhat(u: Unit): string {
  if (sameDimension(u.dimension, DIMENSIONLESS)) return u.id === "1" ? "there is no unit" : `${quote(u.id)} is dimensionless`;
  const name = describeDimension(u.dimension);
  return `${quote(u.id)} is ${article(name)} ${name}`;
}

/**
 * Undefined when `unit` has (one of) the expected dimension(s); otherwise a
 * "wrong-dimension" issue such as
 * `period needs a time unit (s, d, yr); "km" is a length`.
 */
export function checkDimension(unit: Unit, expected: Dimension | readonly Dimension[], what: string): Issue | undefined {
  const list: readonly Dimension[] = Array.isArray(expected) ? (expected as readonly Dimension[]) : [expected as Dimension];
  if (list.some((d) => sameDimension(d, unit.dimension))) return undefined;
  const accepted = UNITS.filter((u) => u.id !== "1" && list.some((d) => sameDimension(d, u.dimension))).map((u) => u.id);
  const plain = list.some((d) => sameDimension(d, DIMENSIONLESS));
  let hint: string;
  if (accepted.length > 0) hint = `give ${what} in one of: ${accepted.join(", ")}${plain ? ", or as a plain number" : ""}`;
  else if (plain) hint = `write ${what} as a plain number, without a unit`;
  else hint = `give ${what} in a unit of ${list.map(describeDimension).join(" or ")}`;
  return issue("wrong-dimension", `${what} needs ${list.map(needs).join(" or ")}; ${isWhat(unit)}`, hint);
}
