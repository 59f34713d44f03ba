import { METHODS } from "../../../src/methods/index.js";

/** Equations of every kind the site typesets: each method's general forms and symbols, and some substituted shapes. */
export function sampleTex(): Array<{ tex: string; display: boolean }> {
  const out: Array<{ tex: string; display: boolean }> = [];
  for (const m of METHODS) {
    for (const e of m.equations) out.push({ tex: e.latex, display: true });
    for (const i of m.inputs) out.push({ tex: i.symbol, display: false });
    for (const r of m.results) out.push({ tex: r.symbol, display: false });
  }
  out.push(
    { tex: "d = \\frac{1\\,\\mathrm{au}}{5.915\\times10^{-7}\\,\\mathrm{rad}} = 2.529\\times10^{17}\\,\\mathrm{m}", display: true },
    { tex: "\\left(\\frac{P}{2\\pi\\mathcal{G}}\\right)^{1/3} K\\sqrt{1-e^{2}} = 0.0124\\,M_{\\odot}", display: true },
    { tex: "\\sqrt{1-e^{2}} = \\left(\\frac{a}{b}\\right)^{1/3}", display: true },
    { tex: "M_{\\mathrm{tot}}", display: false },
    { tex: "x = -0.5, 10.25, (a, b] \\leq \\sin^{3} i", display: false },
  );
  return out;
}
