import { katexReference } from "./helpers/katex-reference.js";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { auditMeasurement, siUnitOf } from "../../src/audit/audit-measurement.js";
import { DEFAULT_THRESHOLDS } from "../../src/audit/compare.js";
import { ALL_CONSTANTS } from "../../src/constants/sets.js";
import { METHODS, getMethod } from "../../src/methods/index.js";
import type { FormatNumber, MethodDefinition, SIInputs } from "../../src/methods/method.js";
import { latexNumber } from "../../src/quantity/format.js";
import { loadRecords } from "../../src/records/load.js";
import type { MeasurementRecord, SlotInput } from "../../src/records/types.js";
import { UNITS } from "../../src/units/catalog.js";
import { Random } from "../../src/uncertainty/random.js";
import { katexCacheStats, renderTex } from "../../src/site/katex.js";
import { texSkeleton } from "../../src/site/tex-skeleton.js";
import { SAMPLES } from "../methods/sample-inputs.js";

/**
 * The shape cache gives exactly what KaTeX gives. KaTeX itself, called with
 * the options the site documents, is the reference: every equation below is
 * typeset both ways and the two strings must be equal, byte for byte. The
 * equations are the real ones: general forms and symbols of every method,
 * constants and units, and the substituted equations the audit writes, with
 * random inputs, and with random numbers in every form latexNumber writes
 * (negative, zero, integers, plain decimals, powers of ten with and without
 * a minus, 1 to 17 significant digits, NaN and infinities).
 */

const REFERENCE_OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" } as const;

function direct(tex: string, displayMode: boolean): string {
  return katexReference(tex, { ...REFERENCE_OPTIONS, displayMode });
}

interface Case {
  readonly tex: string;
  readonly displayMode: boolean;
}

/** Every case typeset both ways; the cases whose strings differ. */
function mismatches(cases: readonly Case[]): string[] {
  const out: string[] = [];
  for (const c of cases) {
    if (renderTex(c.tex, c.displayMode) !== direct(c.tex, c.displayMode)) out.push(`${c.displayMode ? "display" : "inline"}: ${c.tex}`);
  }
  return out;
}

function distinctShapes(cases: readonly Case[]): number {
  return new Set(cases.map((c) => (c.displayMode ? "D" : "I") + texSkeleton(c.tex).skeleton)).size;
}

const RECORDS = path.resolve(__dirname, "../../content/records");
const OPTIONS = { draws: 0, thresholds: DEFAULT_THRESHOLDS };

/** A record input with its value moved: eccentricities in [0, 0.95), inclinations in (5°, 175°), others scaled. */
function moved(input: SlotInput, rng: Random): SlotInput {
  const q = input.quantity;
  let value: number;
  if (input.field === "eccentricity") value = 0.95 * rng.uniform();
  else if (input.field === "inclination") value = (5 + 170 * rng.uniform()) * ((Math.PI / 180) / q.unit.scale);
  else value = q.value * 10 ** ((rng.uniform() < 0.1 ? 3 : 0.3) * (2 * rng.uniform() - 1));
  return { ...input, quantity: { ...q, value } };
}

function movedMeasurement(m: MeasurementRecord, rng: Random): MeasurementRecord {
  const inputs: Record<string, SlotInput> = {};
  for (const [slot, input] of Object.entries(m.inputs)) inputs[slot] = moved(input, rng);
  return { ...m, inputs };
}

/** The display-mode equations the audit writes for every demo measurement, `rounds` times with moved inputs. */
async function auditedEquations(rounds: number, seed: number): Promise<{ general: Case[]; substituted: Case[] }> {
  const outcome = await loadRecords(RECORDS);
  const rng = new Random(seed);
  const general: Case[] = [];
  const substituted: Case[] = [];
  for (let round = 0; round < rounds; round++) {
    for (const record of outcome.records) {
      for (const m of record.measurements) {
        const method = getMethod(m.method);
        if (!method) throw new Error(`no method ${m.method}`);
        const audit = auditMeasurement(record.id, method, round === 0 ? m : movedMeasurement(m, rng), OPTIONS);
        for (const eq of audit.equations) {
          if (round === 0) general.push({ tex: eq.general, displayMode: true });
          if (eq.substituted) substituted.push({ tex: eq.substituted, displayMode: true });
        }
      }
    }
  }
  return { general, substituted };
}

type Form = "plain" | "negative-plain" | "integer" | "zero" | "large" | "small" | "negative-large" | "negative-small";
const FORMS: readonly Form[] = ["plain", "negative-plain", "integer", "zero", "large", "small", "negative-large", "negative-small"];

/** A random number of the given form, as latexNumber writes it with 1 to 17 significant digits. */
function numberOfForm(form: Form, rng: Random): string {
  const significant = 1 + Math.floor(17 * rng.uniform());
  const mantissa = 1 + 9 * rng.uniform();
  switch (form) {
    case "zero":
      return latexNumber(0);
    case "integer":
      return latexNumber(Math.floor(1 + 9998 * rng.uniform()), 4);
    case "plain":
    case "negative-plain": {
      const x = mantissa * 10 ** Math.floor(-3 + 6 * rng.uniform());
      return latexNumber(form === "plain" ? x : -x, significant);
    }
    case "large":
    case "negative-large": {
      const x = mantissa * 10 ** Math.floor(4 + 300 * rng.uniform());
      return latexNumber(form === "large" ? x : -x, significant);
    }
    case "small":
    case "negative-small": {
      const x = mantissa * 10 ** -Math.floor(4 + 300 * rng.uniform());
      return latexNumber(form === "small" ? x : -x, significant);
    }
  }
}

/**
 * Substituted equations of every method and every sample combination of
 * inputs, with a number formatter that writes random numbers: each pattern
 * fixes which form every slot and result takes, and `perPattern` equations
 * are drawn for it, so that shapes repeat and are spliced.
 */
function randomNumberEquations(patterns: number, perPattern: number, seed: number): Case[] {
  const rng = new Random(seed);
  const out: Case[] = [];
  for (const method of METHODS) {
    const dims = new Map<string, MethodDefinition["inputs"][number]["dimension"]>();
    for (const i of method.inputs) dims.set(i.slot, i.dimension);
    for (const r of method.results) dims.set(r.name, r.dimension);
    for (const sample of SAMPLES[method.id]) {
      const si: SIInputs = sample.inputs;
      const results = method.compute(si);
      for (let p = 0; p < patterns; p++) {
        const forms = new Map<string, Form>();
        const special = new Map<string, string>();
        for (const name of dims.keys()) {
          forms.set(name, FORMS[Math.floor(FORMS.length * rng.uniform())]);
          // now and then a number latexNumber writes without digits
          if (rng.uniform() < 0.05) special.set(name, ["\\mathrm{NaN}", "\\infty", "-\\infty"][Math.floor(3 * rng.uniform())]);
        }
        const fmt: FormatNumber = (_value, name) => {
          const d = dims.get(name);
          const unit = d ? siUnitOf(d).latex : "";
          const n = special.get(name) ?? numberOfForm(forms.get(name) ?? "plain", rng);
          return unit ? `${n}\\,${unit}` : n;
        };
        for (let k = 0; k < perPattern; k++) {
          for (const eq of method.substituted(si, results, fmt)) if (eq.latex) out.push({ tex: eq.latex, displayMode: k % 2 === 0 });
        }
      }
    }
  }
  return out;
}

/** Everything else the site typesets: method symbols and general equations, constants, units. */
function genericTex(): Case[] {
  const out: Case[] = [];
  for (const m of METHODS) {
    for (const eq of m.equations) out.push({ tex: eq.latex, displayMode: true }, { tex: eq.latex, displayMode: false });
    for (const i of m.inputs) out.push({ tex: i.symbol, displayMode: false });
    for (const r of m.results) out.push({ tex: r.symbol, displayMode: false });
  }
  for (const c of ALL_CONSTANTS) {
    out.push({ tex: c.latex, displayMode: false });
    if (c.unitLatex) out.push({ tex: c.unitLatex, displayMode: false });
  }
  for (const u of UNITS) if (u.latex) out.push({ tex: u.latex, displayMode: false });
  return out;
}

describe("shape cache against KaTeX itself", () => {
  it("typesets every general equation, symbol, constant and unit exactly as KaTeX does", () => {
    const cases = genericTex();
    expect(cases.length).toBeGreaterThan(100);
    expect(mismatches(cases)).toEqual([]);
    // the second time round everything comes from the cache, and is still the same
    expect(mismatches(cases)).toEqual([]);
  });

  it("typesets thousands of audited equations with moved inputs exactly as KaTeX does, typesetting each shape once", async () => {
    const { general, substituted } = await auditedEquations(16, 20240611);
    expect(substituted.length).toBeGreaterThan(2000);
    const before = katexCacheStats();
    expect(mismatches([...general, ...substituted])).toEqual([]);
    const after = katexCacheStats();
    const shapes = distinctShapes([...general, ...substituted]);
    // every shape was spliced: none needed typesetting each time
    expect(after.directShapes.slice(before.directShapes.length)).toEqual([]);
    // KaTeX ran at most three times per new shape (equation, skeleton, one-digit check), not once per equation
    expect(after.typesets - before.typesets).toBeLessThanOrEqual(3 * shapes);
    expect(shapes).toBeLessThan(substituted.length / 10);
  });

  it("typesets substituted equations with random numbers of every form exactly as KaTeX does", () => {
    const cases = randomNumberEquations(5, 10, 7);
    expect(cases.length).toBeGreaterThan(2500);
    // every form occurs somewhere
    const all = cases.map((c) => c.tex).join(" ");
    expect(all).toMatch(/(?:= |\\left\()-\d/); // a negative number
    expect(all).toMatch(/\\times10\^\{-\d+\}/); // a power of ten with a minus
    expect(all).toMatch(/\\times10\^\{\d+\}/); // and without
    expect(all).toMatch(/[^\d.}]0[^\d.]/); // zero
    expect(all).toMatch(/[^\d.]\d+\.\d+[^\d]/); // a plain decimal
    expect(all).toMatch(/[^\d.^{]\d{4}[^\d.]/); // an integer
    for (const piece of ["\\mathrm{NaN}", "\\infty"]) expect(all).toContain(piece);
    const before = katexCacheStats();
    expect(mismatches(cases)).toEqual([]);
    const after = katexCacheStats();
    expect(after.directShapes.slice(before.directShapes.length)).toEqual([]);
    expect(after.typesets - before.typesets).toBeLessThanOrEqual(3 * distinctShapes(cases));
  });

  it("holds no whole strings for spliced equations, however many there are", () => {
    const before = katexCacheStats();
    const cases = randomNumberEquations(1, 60, 11);
    expect(cases.length).toBeGreaterThan(1500);
    for (const c of cases) renderTex(c.tex, c.displayMode);
    const after = katexCacheStats();
    expect(after.memoEntries).toBe(before.memoEntries);
    expect(after.splicedShapes - before.splicedShapes).toBeLessThanOrEqual(distinctShapes(cases));
  });
});

describe("shapes that cannot be spliced", () => {
  /**
   * TeX whose layout depends on the digits or on how many there are, or
   * where digits are not numbers at all. Each is typeset with numbers of
   * several lengths, so that a shape learnt from the first one is checked on
   * the others; whatever the cache decides, the output must be KaTeX's.
   */
  const TEMPLATES: readonly string[] = [
    "\\widehat{#}", "\\widetilde{#}", "\\hat{#}", "\\vec{#}", "\\cancel{#}", "\\boxed{#}", "\\fbox{#}",
    "\\mathit{#}", "\\mathfrak{#}", "\\textit{#}", "\\mathnormal{#}", "\\boldsymbol{#}", "\\mathsfit{#}",
    "\\mathbf{#}", "\\mathsf{#}", "\\mathtt{#}", "\\mathcal{#}", "\\mathbb{#}", "\\text{#\\ and #}", "\\operatorname{#}",
    "\\kern#em x", "\\kern#pt x", "\\rule{#em}{1em}", "\\begin{aligned} a &= # \\\\[#pt] b &= #\\end{aligned}",
    "\\frac#", "x^#", "x_#", "{#}^{2}", "#^{2}", "#'", "#\\,\\mathrm{m}", "\\sqrt[#]{#}", "\\color{#}{x}",
    "\\overline{#}", "\\underbrace{#}_{#}", "\\xrightarrow{#}", "\\phantom{#}#", "\\smash{#}", "\\overset{#}{=}",
    "\\left(#\\right)^{#}", "\\binom{#}{#}", "-#.#", "#.", ".#", "\\char#", "\\verb|#|",
  ];
  const NUMBERS: readonly string[] = ["1", "7", "12", "0.5", "123", "12345", "1234567", "3.14159", "987654321012", "9000000008"];

  it("gives KaTeX's output or KaTeX's error for each of them", () => {
    const failures: string[] = [];
    let typeset = 0;
    for (const template of TEMPLATES) {
      for (const displayMode of [false, true]) {
        for (let i = 0; i < NUMBERS.length; i++) {
          let n = 0;
          const tex = template.replace(/#/g, () => NUMBERS[(i + n++) % NUMBERS.length]);
          let expected: string;
          try {
            expected = direct(tex, displayMode);
          } catch {
            // KaTeX refuses it; so must the adapter
            expect(() => renderTex(tex, displayMode), tex).toThrow(/KaTeX could not typeset/);
            continue;
          }
          typeset++;
          if (renderTex(tex, displayMode) !== expected) failures.push(`${displayMode ? "display" : "inline"}: ${tex}`);
        }
      }
    }
    expect(failures).toEqual([]);
    expect(typeset).toBeGreaterThan(500);
  });

  it("falls back for digits that are sizes, arguments or italic, and says why", () => {
    for (const tex of ["\\kern1.5em x", "\\frac12", "\\mathit{123}", "\\widehat{12}", "\\sqrt23"]) renderTex(tex, true);
    const reasons = new Map(katexCacheStats().directShapes.filter((s) => s.displayMode).map((s) => [s.skeleton, s.reason]));
    expect(reasons.get(texSkeleton("\\kern1.5em x").skeleton)).toMatch(/tag/);
    expect(reasons.get(texSkeleton("\\frac12").skeleton)).toMatch(/appears 0 times/);
    expect(reasons.get(texSkeleton("\\mathit{123}").skeleton)).toMatch(/class mathit/);
    expect(reasons.get(texSkeleton("\\widehat{12}").skeleton)).toMatch(/differs|digits/);
    expect(reasons.get(texSkeleton("\\sqrt23").skeleton)).toBeDefined();
  });
});

describe("the fonts whose digits may be swapped", () => {
  /**
   * The cache swaps digits only in spans of these classes. KaTeX's own output
   * is the check: a digit typeset in each font gives the same string whatever
   * the digit, apart from the digit itself. Italic digits are the contrast:
   * there the strings differ (oldstyle depths and italic corrections).
   */
  const sameForEveryDigit = (command: string): boolean => {
    // the digit stands in the TeX annotation as {d} and in MathML and HTML as >d<
    const masked = (d: number): string => direct(`${command}{${d}}`, false).split(`{${d}}`).join("{D}").split(`>${d}<`).join(">D<");
    const zero = masked(0);
    if (!zero.includes(">D<")) throw new Error(`no digit found in the output for ${command}`);
    for (let d = 1; d <= 9; d++) if (masked(d) !== zero) return false;
    return true;
  };

  it("sets the ten digits alike in plain, roman, bold, sans-serif and typewriter type", () => {
    for (const command of ["", "\\mathrm", "\\text", "\\textrm", "\\mathbf", "\\textbf", "\\mathsf", "\\textsf", "\\mathtt", "\\texttt"]) {
      expect(sameForEveryDigit(command), command || "plain").toBe(true);
    }
  });

  it("sets italic digits differently from one another", () => {
    expect(sameForEveryDigit("\\mathit")).toBe(false);
    expect(sameForEveryDigit("\\textit")).toBe(false);
  });
});
