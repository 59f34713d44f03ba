import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { METHODS } from "../../src/methods/index.js";
import type { MethodDefinition, SIInputs } from "../../src/methods/method.js";
import { companionMassColumn, oneColumn } from "../../src/methods/batch-shared.js";
import { solveCompanionMass } from "../../src/methods/shared.js";
import { Random } from "../../src/uncertainty/random.js";
import { SAMPLES } from "./sample-inputs.js";

/**
 * Every method's batch kernel against its own validate() and compute(), draw
 * by draw: the same draws must be refused, and every accepted draw must give
 * the same results to 1e-12 relative. The kernels use other but equivalent
 * arithmetic (a·a·a for a³, Halley steps on the cubic instead of Newton steps
 * on its cube-root form, a short series for sin i near 90°), so agreement is to
 * rounding, about 1e-15; 1e-12 leaves room for that and none for a wrong term.
 *
 * A difference of two masses (a component given beside a total) is compared
 * relative to the total, since a one-ulp change in the total is all the two
 * ways of computing it may differ by.
 */

const TOLERANCE = 1e-12;
const DRAWS = 3000;
/** Kernels must leave these alone: the columns have room past n. */
const SENTINEL = -12345.5;

interface Batch {
  readonly columns: Record<string, Float64Array>;
  readonly draws: SIInputs[];
}

/** Draws around a valid sample: most within a few per cent, some pushed out of the domain on purpose. */
function drawsAround(method: MethodDefinition, base: SIInputs, n: number, seed: number): Batch {
  const random = new Random(seed);
  const slots = Object.keys(base).sort();
  const draws: SIInputs[] = [];
  for (let j = 0; j < n; j++) {
    const si: Record<string, number> = {};
    for (const slot of slots) si[slot] = base[slot] * (1 + 0.05 * random.normal());
    if (slots.includes("eccentricity")) si.eccentricity = base.eccentricity + 0.2 * Math.max(base.eccentricity, 0.01) * random.normal();
    if (slots.includes("inclination")) {
      // across the whole range, so that both ways of taking sin i are used
      si.inclination = random.uniform() < 0.5 ? base.inclination * (1 + 0.05 * random.normal()) : 0.05 + random.uniform() * (Math.PI - 0.1);
    }
    if (random.uniform() < 0.1) breakOne(method, si, slots, random);
    draws.push(si);
  }
  const columns: Record<string, Float64Array> = {};
  for (const slot of slots) {
    const column = new Float64Array(n + 4).fill(SENTINEL);
    draws.forEach((si, j) => {
      column[j] = si[slot];
    });
    columns[slot] = column;
  }
  return { columns, draws };
}

/** One input of a draw moved to or beyond the edge of its range. */
function breakOne(method: MethodDefinition, si: Record<string, number>, slots: readonly string[], random: Random): void {
  const slot = slots[Math.floor(random.uniform() * slots.length)];
  const pick = <T>(options: readonly T[]): T => options[Math.floor(random.uniform() * options.length)];
  if (slot === "eccentricity") si.eccentricity = pick([-1e-9, -0.2, 1, 1.0000001, 0.999999, 0, 1.5]);
  else if (slot === "inclination") si.inclination = pick([0, Math.PI, 1e-7, Math.PI - 1e-7, -0.3, 3.3, 2e-6, Math.PI / 2]);
  else if (slot === "primary_mass" || slot === "secondary_mass") {
    const total = method.compute({ ...si, [slot]: undefined as unknown as number }).total_mass;
    si[slot] = total !== undefined && random.uniform() < 0.6 ? total * pick([1, 1 + 1e-9, 1 - 1e-9, 2]) : pick([0, -si[slot], 1e300]);
  } else si[slot] = pick([0, -si[slot], -0, Number.MAX_VALUE, 1e200, 1e-300 * si[slot]]);
}

function allFinite(results: Readonly<Record<string, number>>, names: readonly string[]): boolean {
  return names.every((name) => Number.isFinite(results[name]));
}

/** The part of each result the two computations may differ by: the result itself, or the total it was taken from. */
function scaleOf(method: MethodDefinition, si: SIInputs, results: Readonly<Record<string, number>>, name: string): number {
  const difference =
    method.id === "relative-orbit" &&
    ((name === "secondary_mass" && si.primary_mass !== undefined) || (name === "primary_mass" && si.secondary_mass !== undefined));
  return difference ? Math.abs(results.total_mass) : Math.abs(results[name]);
}

interface Mismatch {
  readonly draw: number;
  readonly what: string;
}

function compareBatch(method: MethodDefinition, base: SIInputs, seed: number): { mismatches: Mismatch[]; valid: number; invalid: number } {
  const { columns, draws } = drawsAround(method, base, DRAWS, seed);
  const names = Object.keys(method.compute(base)).sort();
  const out: Record<string, Float64Array> = {};
  for (const name of names) out[name] = new Float64Array(DRAWS + 4).fill(SENTINEL);
  const valid = new Uint8Array(DRAWS + 4).fill(7);
  method.batch!(columns, DRAWS, out, valid);
  const mismatches: Mismatch[] = [];
  let validCount = 0;
  for (let j = 0; j < DRAWS; j++) {
    const si = draws[j];
    // compute() is only defined on what validate() accepts
    const accepted = method.validate(si).length === 0;
    const results = accepted ? method.compute(si) : {};
    const expected = accepted && allFinite(results, names) ? 1 : 0;
    if (valid[j] !== expected) {
      mismatches.push({ draw: j, what: `valid ${valid[j]}, validate()/compute() say ${expected}: ${JSON.stringify(si)}` });
      continue;
    }
    if (expected === 0) continue;
    validCount++;
    for (const name of names) {
      const diff = Math.abs(out[name][j] - results[name]);
      const err = diff === 0 ? 0 : diff / scaleOf(method, si, results, name);
      if (!(err <= TOLERANCE)) mismatches.push({ draw: j, what: `${name}: batch ${out[name][j]}, compute ${results[name]} (${err})` });
    }
  }
  for (let j = DRAWS; j < DRAWS + 4; j++) {
    if (valid[j] !== 7) mismatches.push({ draw: j, what: "valid written past n" });
    for (const name of names) if (out[name][j] !== SENTINEL) mismatches.push({ draw: j, what: `${name} written past n` });
  }
  return { mismatches, valid: validCount, invalid: DRAWS - validCount };
}

describe("batch kernels agree with validate() and compute()", () => {
  it("every registered method has a batch kernel", () => {
    expect(METHODS.filter((m) => typeof m.batch !== "function").map((m) => m.id)).toEqual([]);
  });

  for (const method of METHODS) {
    describe(method.id, () => {
      SAMPLES[method.id].forEach((sample, k) => {
        it(`${sample.label}: same refusals, results to 1e-12`, () => {
          const { mismatches, valid, invalid } = compareBatch(method, sample.inputs, 1000 + k);
          expect(mismatches.slice(0, 5)).toEqual([]);
          // the draws really cover both cases
          expect(valid).toBeGreaterThan(DRAWS / 3);
          expect(invalid).toBeGreaterThan(20);
        });
      });
    });
  }
});

describe("companionMassColumn: the cubic for many draws", () => {
  it("matches solveCompanionMass to 1e-13 for draws near and far from the first one", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -12, max: 12, noNaN: true }),
        fc.double({ min: 12, max: 24, noNaN: true }),
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        fc.double({ min: 0.001, max: 3, noNaN: true }),
        fc.integer({ min: 1, max: 0x7fffffff }),
        (logRatio, logM1, s, spread, seed) => {
          // draws scattered by `spread` in log f, so some start far from the reference and take the slow way
          const n = 64;
          const random = new Random(seed);
          const f = new Float64Array(n);
          const m1 = new Float64Array(n);
          const sines = new Float64Array(n);
          for (let j = 0; j < n; j++) {
            m1[j] = 10 ** logM1 * (1 + 0.05 * random.normal());
            f[j] = m1[j] * 10 ** (logRatio + spread * random.normal());
            sines[j] = Math.min(1, s * (1 + 0.01 * random.normal()));
          }
          const out = new Float64Array(n);
          const valid = new Uint8Array(n).fill(1);
          companionMassColumn(f, m1, sines, n, out, valid);
          for (let j = 0; j < n; j++) {
            if (!(sines[j] > 0 && m1[j] > 0)) continue;
            const exact = solveCompanionMass(f[j], m1[j], sines[j]);
            if (valid[j] !== 1 || !(Math.abs(out[j] - exact) <= 1e-13 * exact)) return false;
          }
          return true;
        },
      ),
      { numRuns: 400, seed: 31337 },
    );
  });

  it("skips draws already refused and refuses a primary mass that is not positive", () => {
    const f = Float64Array.from([1e15, 1e15, 1e15]);
    const m1 = Float64Array.from([2e20, -2e20, 2e20]);
    const out = new Float64Array(3);
    const valid = Uint8Array.from([1, 1, 0]);
    companionMassColumn(f, m1, oneColumn(3), 3, out, valid);
    expect(Array.from(valid)).toEqual([1, 0, 0]);
    expect(out[0]).toBeCloseTo(solveCompanionMass(1e15, 2e20, 1), -5);
  });
});
