import { relativeUncertainty, type Constant } from "../constants/constant.js";
import { formatPlain, superscript } from "./display.js";
import { renderTex } from "./katex.js";

export interface ConstantView {
  readonly key: string;
  readonly anchor: string;
  readonly name: string;
  readonly symbolHtml: string;
  readonly value: string;
  readonly uncertainty: string;
  readonly relative: string;
  readonly unitHtml: string;
  readonly unit: string;
  readonly exact: boolean;
  readonly source: string;
  readonly derivation?: string;
}

/**
 * Every digit JavaScript keeps (shortest round-trip form): integers below 10¹²
 * in full ("149597870700"), other numbers with a written exponent
 * ("1.3271244 × 10²⁰", "6.6743 × 10⁻¹¹").
 */
export function formatFull(x: number): string {
  const a = Math.abs(x);
  const plain = a === 0 || (a < 1e12 && (Number.isInteger(x) || a >= 1e-3));
  const [mantissa, exp] = (plain ? String(x) : x.toExponential()).split("e");
  const m = mantissa.replace(/^-/, "\u2212");
  return exp === undefined ? m : `${m} \u00d7 10${superscript(Number(exp))}`;
}

export function constantAnchor(key: string): string {
  return `constant-${key.replace(/[^A-Za-z0-9-]/g, "-")}`;
}

export function constantView(c: Constant): ConstantView {
  const out: { -readonly [K in keyof ConstantView]: ConstantView[K] } = {
    key: c.key,
    anchor: constantAnchor(c.key),
    name: c.name,
    symbolHtml: renderTex(c.latex, false),
    value: formatFull(c.value),
    uncertainty: c.exact ? "exact" : c.uncertainty === 0 ? "none given" : formatPlain(c.uncertainty, 2),
    relative: c.exact || c.uncertainty === 0 ? "" : `${formatPlain(relativeUncertainty(c) * 1e6, 2)} ppm`,
    unitHtml: c.unitLatex ? renderTex(c.unitLatex, false) : "",
    unit: c.unit,
    exact: c.exact,
    source: c.source,
  };
  if (c.derivation !== undefined) out.derivation = c.derivation;
  return out;
}

export function constantsView(constants: readonly Constant[]): ConstantView[] {
  return constants.map(constantView);
}
