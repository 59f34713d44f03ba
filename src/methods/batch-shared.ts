import type { DrawColumns } from "./method.js";
import { AU, MIN_SIN_INCLINATION, solveCompanionMass, type RangeRule } from "./shared.js";

/**
 * Building blocks of the methods' batch kernels. Each is one plain loop over
 * typed arrays that does as much as it can per draw (the range checks of the
 * inputs it reads, the formula, the finiteness of what it writes), with no
 * function calls and no branches on which inputs are present inside the
 * loop: that is what lets the engine compile it to tight machine code. Where
 * an optional input is absent, a column of its neutral value stands in (e = 0,
 * sin i = 1). Range rules are those of `checkRanges`; every loop clears
 * valid[j] where draw j breaks a rule and leaves it alone otherwise. Formulas
 * follow the methods' compute() term by term, to rounding.
 */

let zeros = new Float64Array(4096);
let ones = new Float64Array(4096).fill(1);

/** A read-only column of n zeros, standing in for an absent eccentricity. */
export function zeroColumn(n: number): Float64Array {
  if (zeros.length < n) zeros = new Float64Array(n);
  return zeros;
}

/** A read-only column of n ones, standing in for sin i = 1 or for a check that does not apply. */
export function oneColumn(n: number): Float64Array {
  if (ones.length < n) ones = new Float64Array(n).fill(1);
  return ones;
}

/** Scratch columns for intermediate values (a length, a sine), reused from call to call. */
const scratch: Float64Array[] = [];

/** Scratch column number k with room for n draws; its contents are whatever the last user left. */
export function scratchColumn(k: number, n: number): Float64Array {
  if (!scratch[k] || scratch[k].length < n) scratch[k] = new Float64Array(Math.max(n, 4096));
  return scratch[k];
}

/** The slots a method's range rules put under `rule`. */
export function slotsWithRule(rules: Readonly<Record<string, RangeRule>>, rule: RangeRule): string[] {
  return Object.keys(rules).filter((slot) => rules[slot] === rule);
}

/** The "positive" rule (a finite number greater than zero) on one column; absent columns are skipped. */
export function requirePositive(column: Float64Array | undefined, n: number, valid: Uint8Array): void {
  if (column === undefined) return;
  for (let j = 0; j < n; j++) {
    const x = column[j];
    if (!(x > 0 && x < Infinity)) valid[j] = 0;
  }
}

/** The "positive" rule on each column of `slots` that is present and not in `done` (already checked by a fused loop). */
export function requireOtherPositive(columns: DrawColumns, slots: readonly string[], done: readonly string[], n: number, valid: Uint8Array): void {
  for (const slot of slots) if (!done.includes(slot)) requirePositive(columns[slot], n, valid);
}

/**
 * A length as `lengthOf` gives it: the linear column when present, else the
 * angular one times the distance, or times 1 au / parallax. Writes valid[j]
 * afresh (1 or 0) from the "positive" rule on the columns it reads, so it
 * comes first in a kernel, and returns their slot names.
 */
export function lengthColumn(
  columns: DrawColumns,
  linearSlot: string,
  angularSlot: string,
  n: number,
  out: Float64Array,
  valid: Uint8Array,
): string[] {
  const linear = columns[linearSlot];
  const angular = columns[angularSlot];
  const distance = columns.distance;
  const parallax = columns.parallax;
  if (linear !== undefined) {
    for (let j = 0; j < n; j++) {
      const a = linear[j];
      out[j] = a;
      valid[j] = a > 0 && a < Infinity ? 1 : 0;
    }
    return [linearSlot];
  }
  if (angular !== undefined && distance !== undefined) {
    for (let j = 0; j < n; j++) {
      const alpha = angular[j];
      const d = distance[j];
      out[j] = alpha * d;
      valid[j] = alpha > 0 && alpha < Infinity && d > 0 && d < Infinity ? 1 : 0;
    }
    return [angularSlot, "distance"];
  }
  if (angular !== undefined && parallax !== undefined) {
    for (let j = 0; j < n; j++) {
      const alpha = angular[j];
      const p = parallax[j];
      out[j] = alpha * (AU / p);
      valid[j] = alpha > 0 && alpha < Infinity && p > 0 && p < Infinity ? 1 : 0;
    }
    return [angularSlot, "parallax"];
  }
  throw new Error(`lengthColumn: needs ${linearSlot}, or ${angularSlot} with a parallax or a distance`);
}

/**
 * 4π²a³/P² (Kepler's third law in GM form) with the "positive" rule on P and
 * the "eccentricity" rule on `ecc`, and a finite result.
 */
export function keplerColumn(period: Float64Array, length: Float64Array, ecc: Float64Array, n: number, out: Float64Array, valid: Uint8Array): void {
  const k = 4 * Math.PI * Math.PI;
  for (let j = 0; j < n; j++) {
    const a = length[j];
    const P = period[j];
    const e = ecc[j];
    const M = (k * (a * a * a)) / (P * P);
    out[j] = M;
    if (!(P > 0 && P < Infinity && e >= 0 && e < 1 && M - M === 0)) valid[j] = 0;
  }
}

/** cos t by its Taylor series to t¹⁸ (the first term left out is below 5e-19 for |t| ≤ 1). */
function cosNear(t: number): number {
  const u = t * t;
  return (
    1 +
    u *
      (-1 / 2 +
        u *
          (1 / 24 +
            u *
              (-1 / 720 +
                u *
                  (1 / 40320 +
                    u * (-1 / 3628800 + u * (1 / 479001600 + u * (-1 / 87178291200 + u * (1 / 20922789888000 + u * (-1 / 6402373705728000)))))))))
  );
}

/**
 * sin i into `sines`, with the "inclination" rule (0 < i < π and sin i not
 * close to zero). For 33° < i < 147° sin i = cos(i − π/2) from a short series,
 * to about 1e-16; elsewhere Math.sin.
 */
export function inclinationColumn(incl: Float64Array, n: number, sines: Float64Array, valid: Uint8Array): void {
  const halfPi = Math.PI / 2;
  let outside = 0;
  for (let j = 0; j < n; j++) {
    const t = incl[j] - halfPi;
    if (t > -1 && t < 1) {
      // well inside (0, π): the rule holds, as sin i > 0.54
      sines[j] = cosNear(t);
    } else {
      sines[j] = NaN;
      outside++;
    }
  }
  if (outside === 0) return;
  for (let j = 0; j < n; j++) {
    if (sines[j] === sines[j]) continue;
    const i = incl[j];
    const s = Math.sin(i);
    sines[j] = s;
    if (!(i > 0 && i < Math.PI && s >= MIN_SIN_INCLINATION)) valid[j] = 0;
  }
}

/** Results must be finite (NaN − NaN and ∞ − ∞ are NaN). */
export function requireFinite(column: Float64Array, n: number, valid: Uint8Array): void {
  for (let j = 0; j < n; j++) {
    const x = column[j];
    if (!(x - x === 0)) valid[j] = 0;
  }
}

/**
 * The positive root of (m sin i)³ = f (M₁ + m)² for many draws, as
 * `solveCompanionMass` gives it (to about 1e-15 relative), with the
 * "positive" rule on M₁ and a finite result.
 *
 * With v = m/M₁ and c = f/(s³M₁) the root solves H(v) = v³ − c(1+v)² = 0.
 * Each draw starts from the tangent line v₀ = v_ref + (dv/dc)(c − c_ref)
 * through an exact root at a nearby reference c_ref: the centre of c's bin on
 * a grid of eight bins per octave (c_ref keeps the sign, the exponent and the
 * first three mantissa bits of c), so within 6.3 % of c, and v₀ within about
 * 5e-4 of the root. A Halley step (cubic convergence) and a Newton step
 * (quadratic) on the polynomial H follow, which need no cube root; the
 * Newton step is then below 3e-8 of v and leaves an error of order 1e-15. The
 * start, and so every digit of the result, depends on the draw alone, not on
 * which draws share a call. A draw whose last step is larger goes to the
 * exact solver. The exact roots at the references are kept in a small table
 * from call to call (they depend on c_ref alone). Draws already invalid are
 * skipped.
 *
 * `sines` is the column of sin i, or the column of ones for sin i = 1.
 */
export function companionMassColumn(
  f: Float64Array,
  primary: Float64Array,
  sines: Float64Array,
  n: number,
  out: Float64Array,
  valid: Uint8Array,
): void {
  const ratio = scratchColumn(SCRATCH_RATIO, n);
  if (keys.length < n) keys = new Int32Array(n);
  const keyOf = keys;
  let missing = 0;
  for (let j = 0; j < n; j++) {
    const m1 = primary[j];
    const s = sines[j];
    const c = f[j] / (s * s * s * m1);
    ratio[j] = c;
    bits[0] = c;
    const key = words[HIGH] >>> BIN_SHIFT;
    keyOf[j] = key;
    if (tableKey[key & TABLE_MASK] !== key) missing++;
    if (!(m1 > 0 && m1 < Infinity)) valid[j] = 0;
  }
  if (missing > 0) {
    for (let j = 0; j < n; j++) if (valid[j] === 1 && tableKey[keyOf[j] & TABLE_MASK] !== keyOf[j]) remember(keyOf[j]);
  }
  let slow = 0;
  for (let j = 0; j < n; j++) {
    const c = ratio[j];
    const key = keyOf[j];
    const at = key & TABLE_MASK;
    let v = tableV[at] + tableSlope[at] * (c - tableC[at]);
    // one Halley step
    let u = 1 + v;
    const h = v * v * v - c * u * u;
    const h1 = 3 * v * v - 2 * c * u;
    v -= (2 * h * h1) / (2 * h1 * h1 - h * (6 * v - 2 * c));
    // one Newton step
    u = 1 + v;
    const delta = (v * v * v - c * u * u) / (3 * v * v - 2 * c * u);
    v -= delta;
    const m = primary[j] * v;
    // false for NaN: no reference, a wild start, an invalid draw; all left for later
    if (tableKey[at] === key && Math.abs(delta) <= 3e-8 * v && m > 0 && m < Infinity) {
      out[j] = m;
    } else {
      out[j] = NaN;
      slow++;
    }
  }
  if (slow > 0) {
    for (let j = 0; j < n; j++) {
      if (valid[j] === 0 || out[j] === out[j]) continue;
      const m = solveOrNaN(f[j], primary[j], sines[j]);
      out[j] = m;
      if (!(m - m === 0)) valid[j] = 0;
    }
  }
}

const SCRATCH_RATIO = 7;
let keys = new Int32Array(4096);

/** A double's bits, to read c's exponent and first mantissa bits without a logarithm. */
const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);
/** Index of the word holding the sign, the exponent and the top of the mantissa. */
const HIGH = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1 ? 1 : 0;
/** Sign, 11 exponent bits and 3 mantissa bits make the key of a bin. */
const BIN_SHIFT = 17;

const TABLE_SIZE = 1024;
const TABLE_MASK = TABLE_SIZE - 1;
const tableKey = new Int32Array(TABLE_SIZE).fill(-1);
const tableC = new Float64Array(TABLE_SIZE);
const tableV = new Float64Array(TABLE_SIZE).fill(NaN);
const tableSlope = new Float64Array(TABLE_SIZE).fill(NaN);

/** Puts the reference root of bin `key` in the table (NaN where the bin's centre has no usable root). */
function remember(key: number): void {
  const at = key & TABLE_MASK;
  // the centre of the bin: the same leading bits, then a one, then zeros
  words[HIGH] = ((key << BIN_SHIFT) | (1 << (BIN_SHIFT - 1))) >>> 0;
  words[1 - HIGH] = 0;
  const cRef = bits[0];
  tableKey[at] = key;
  tableC[at] = cRef;
  tableV[at] = NaN;
  tableSlope[at] = NaN;
  if (!(cRef > 0 && cRef < Infinity)) return;
  const v = solveCompanionMass(cRef, 1, 1);
  const u = 1 + v;
  const slope = (u * u) / (3 * v * v - 2 * cRef * u);
  if (v > 0 && slope > 0 && slope < Infinity) {
    tableV[at] = v;
    tableSlope[at] = slope;
  }
}

/** The exact root, or NaN for inputs it does not take (an invalid draw). */
function solveOrNaN(f: number, m1: number, sinI: number): number {
  if (!(f >= 0 && m1 >= 0 && sinI > 0 && sinI <= 1 + 1e-15)) return NaN;
  return solveCompanionMass(f, m1, sinI);
}
