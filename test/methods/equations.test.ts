import katex from "katex";
import { describe, expect, it } from "vitest";
import { METHODS } from "../../src/methods/index.js";
import type { FormatNumber, MethodDefinition, SIInputs } from "../../src/methods/method.js";
import { findUnit } from "../../src/units/catalog.js";
import { ANGLE, DIMENSIONLESS, LENGTH, MASS, TIME, VELOCITY, sameDimension, type Dimension } from "../../src/units/dimension.js";
import { SAMPLES } from "./sample-inputs.js";

/** Renders in KaTeX's strict mode, throwing on any error or non-standard construct. */
function render(tex: string, displayMode = true): string {
  return katex.renderToString(tex, { displayMode, throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" });
}

const SI_LATEX: ReadonlyArray<readonly [Dimension, string]> = [
  [TIME, "\\mathrm{s}"],
  [LENGTH, "\\mathrm{m}"],
  [ANGLE, "\\mathrm{rad}"],
  [VELOCITY, "\\mathrm{m\\,s^{-1}}"],
  [MASS, "\\mathrm{m^{3}\\,s^{-2}}"],
  [DIMENSIONLESS, ""],
];

function dimensionsOf(m: MethodDefinition): Record<string, Dimension> {
  const dims: Record<string, Dimension> = {};
  for (const i of m.inputs) dims[i.slot] = i.dimension;
  for (const r of m.results) dims[r.name] = r.dimension;
  return dims;
}

/** A formatter like the site's: mantissa × 10^exponent and the SI unit (GM units for masses); records every call. */
function recordingFormatter(m: MethodDefinition): { fmt: FormatNumber; names: Set<string> } {
  const dims = dimensionsOf(m);
  const names = new Set<string>();
  const fmt: FormatNumber = (value, name) => {
    names.add(name);
    const d = dims[name];
    if (!d) throw new Error(`fmt called with unknown name ${name}`);
    const unit = SI_LATEX.find(([dim]) => sameDimension(dim, d))?.[1];
    if (unit === undefined) throw new Error(`no unit for ${name}`);
    const [mant, exp] = value.toExponential(4).split("e");
    const number = Number(exp) === 0 ? mant : `${mant}\\times10^{${Number(exp)}}`;
    return unit ? `${number}\\,${unit}` : number;
  };
  return { fmt, names };
}

const placeholder: FormatNumber = () => "\\square";

/** Every value nudged by 1%, keeping the same combination of inputs. */
function nudged(x: SIInputs): SIInputs {
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(x)) out[k] = v === 0 ? 0 : v * 1.01;
  return out;
}

describe.each(METHODS.map((m) => [m.id, m] as const))("%s: definition", (_id, m) => {
  it("renders every general equation, input symbol and result symbol in KaTeX strict mode", () => {
    expect(m.equations.length).toBeGreaterThan(0);
    for (const eq of m.equations) expect(render(eq.latex)).toContain("katex-display");
    for (const i of m.inputs) expect(render(i.symbol, false)).toContain("katex");
    for (const r of m.results) expect(render(r.symbol, false)).toContain("katex");
  });

  it("ties every equation to declared results, and every result to an equation", () => {
    const names = new Set(m.results.map((r) => r.name));
    const covered = new Set<string>();
    const keys = new Set<string>();
    for (const eq of m.equations) {
      for (const r of eq.results) {
        expect(names.has(r), r).toBe(true);
        covered.add(r);
      }
      keys.add(eq.results.join("|"));
    }
    expect([...covered].sort()).toEqual([...names].sort());
    expect(keys.size).toBe(m.equations.length);
  });

  it("has display units of the right dimension from the unit catalogue", () => {
    for (const r of m.results) {
      const u = findUnit(r.displayUnit);
      expect(u, r.displayUnit).toBeDefined();
      expect(sameDimension(u!.dimension, r.dimension), r.name).toBe(true);
    }
    for (const r of m.results.filter((x) => sameDimension(x.dimension, MASS))) expect(r.displayUnit).toBe("Msun");
    for (const r of m.results.filter((x) => sameDimension(x.dimension, LENGTH))) expect(r.displayUnit).toBe("au");
  });

  it("tells slots that share a record field apart by dimension", () => {
    const seen = new Map<string, Dimension[]>();
    for (const i of m.inputs) {
      const dims = seen.get(i.field) ?? [];
      expect(dims.some((d) => sameDimension(d, i.dimension)), `${i.field} twice with one dimension`).toBe(false);
      seen.set(i.field, [...dims, i.dimension]);
    }
  });

  it("states its source, summary and assumptions in words", () => {
    expect(m.source.cite.length).toBeGreaterThan(40);
    expect(m.summary.length).toBeGreaterThan(40);
    expect(m.assumptions.length).toBeGreaterThan(0);
    expect(m.title.length).toBeGreaterThan(5);
  });
});

describe.each(METHODS.flatMap((m) => (SAMPLES[m.id] ?? []).map((s) => [`${m.id}: ${s.label}`, m, s.inputs] as const)))(
  "%s: substituted equations",
  (_label, m, inputs) => {
    const results = m.compute(inputs);

    it("line up with the general equations and render in KaTeX strict mode", () => {
      const { fmt } = recordingFormatter(m);
      const subs = m.substituted(inputs, results, fmt);
      expect(subs.map((e) => e.results)).toEqual(m.equations.map((e) => e.results));
      const shown = new Set<string>();
      for (const eq of subs) {
        if (eq.latex === "") continue;
        expect(render(eq.latex)).toContain("katex-display");
        for (const r of eq.results) shown.add(r);
      }
      expect([...shown].sort()).toEqual(Object.keys(results).sort());
    });

    it("typeset every computed result and every input the results depend on through fmt", () => {
      const { fmt, names } = recordingFormatter(m);
      m.substituted(inputs, results, fmt);
      for (const r of Object.keys(results)) expect(names.has(r), r).toBe(true);
      const partials = m.partials(inputs);
      for (const slot of Object.keys(inputs)) {
        const used = Object.values(partials).some((row) => row[slot] !== 0);
        if (used) expect(names.has(slot), slot).toBe(true);
      }
    });

    it("keep a fixed structure: only the numbers change with the values", () => {
      const other = nudged(inputs);
      expect(m.validate(other)).toEqual([]);
      const otherResults = m.compute(other);
      const a = m.substituted(inputs, results, placeholder).map((e) => e.latex);
      const b = m.substituted(other, otherResults, placeholder).map((e) => e.latex);
      expect(b).toEqual(a);
      const real = recordingFormatter(m).fmt;
      const c = m.substituted(inputs, results, real).map((e) => e.latex);
      const d = m.substituted(other, otherResults, real).map((e) => e.latex);
      expect(d.filter((x, k) => x !== "" && x === c[k])).toEqual([]);
    });
  },
);
