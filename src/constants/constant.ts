/**
 * A physical or astronomical constant. A constant cannot exist without the
 * standard that defines or measures it.
 */
export interface Constant {
  /** Key used in code and in method definitions, e.g. "G", "GM_sun", "au". */
  readonly key: string;
  readonly name: string;
  /** LaTeX symbol for the methods and constants pages. */
  readonly latex: string;
  /** Value in SI base units. */
  readonly value: number;
  /** Standard uncertainty (1σ) in the same units; 0 when exact. */
  readonly uncertainty: number;
  /** SI unit, plain text, e.g. "m3 kg-1 s-2". */
  readonly unit: string;
  /** LaTeX form of the unit. */
  readonly unitLatex: string;
  /** True when the value is exact by definition (or a nominal conversion constant). */
  readonly exact: boolean;
  /** The defining standard, with its resolution or table. */
  readonly source: string;
  /** How the value was derived from other constants, when it was. */
  readonly derivation?: string;
}

export function defineConstant(c: Constant): Constant {
  if (!Number.isFinite(c.value) || !(c.uncertainty >= 0)) {
    throw new Error(`constant ${c.key}: value and uncertainty must be finite and non-negative`);
  }
  if (c.exact && c.uncertainty !== 0) throw new Error(`constant ${c.key}: an exact constant has no uncertainty`);
  return Object.freeze({ ...c });
}

/** Relative standard uncertainty. */
export function relativeUncertainty(c: Constant): number {
  return c.uncertainty / Math.abs(c.value);
}
