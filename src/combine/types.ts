/**
 * The combined reference value of one result of one object, over its
 * measurements marked `use: true`. All *_si values in SI (kg for masses).
 */

/** How the average was formed. */
export type CombinationProcedure =
  /** Inverse-variance weighted mean (every uncertainty symmetric). */
  | "weighted-mean"
  /** Barlow's linear-σ likelihood (some uncertainty asymmetric). */
  | "linear-sigma";

/** One measurement's part in the average. */
export interface CombinedInput {
  readonly key: string;
  readonly method: string;
  readonly value_si: number;
  readonly sigma_plus_si: number;
  readonly sigma_minus_si: number;
  /** Share of the total weight at the average, 0..1. */
  readonly weight: number;
  /** (value − average) / σ of this measurement at the average. */
  readonly pull: number;
  /** pull², its part of χ². */
  readonly chi2: number;
}

/** A measurement with this result that was not combined, and why. */
export interface ExcludedInput {
  readonly key: string;
  readonly method: string;
  readonly reason: string;
}

export interface CombinedEstimate {
  readonly value_si: number;
  /** Upper and lower 1σ, scaled by the Birge ratio when it exceeds 1. */
  readonly sigma_plus_si: number;
  readonly sigma_minus_si: number;
  /** Mean of the two sides. */
  readonly sigma_si: number;
  /** Before any scaling by the Birge ratio. */
  readonly internal_sigma_plus_si: number;
  readonly internal_sigma_minus_si: number;
  readonly unit_si: string;
  readonly display_unit: string;
  readonly display_unit_latex: string;
  /** Value and (scaled) uncertainties in the display unit. */
  readonly value: number;
  readonly sigma_plus: number;
  readonly sigma_minus: number;
}

export interface Combined {
  readonly result: string;
  /** Number of measurements combined. */
  readonly count: number;
  /** null when no measurement could be combined. */
  readonly estimate: CombinedEstimate | null;
  readonly procedure: CombinationProcedure;
  /** χ² of the measurements about the average; null when none was combined. */
  readonly chi2: number | null;
  /** count − 1 (0 for one measurement or none). */
  readonly dof: number;
  /** √(χ²/(N−1)); null for fewer than two measurements. */
  readonly birge_ratio: number | null;
  /** True when the Birge ratio exceeds 1 and the uncertainty was multiplied by it. */
  readonly scaled: boolean;
  /** Sorted by key. */
  readonly inputs: readonly CombinedInput[];
  /** Key of the measurement with the largest weight; null when none. */
  readonly heaviest: string | null;
  /** Key of the measurement with the largest part of χ²; null for fewer than two. */
  readonly most_discordant: string | null;
  /** Sorted by key. */
  readonly excluded: readonly ExcludedInput[];
  /** Plain-words remarks: the scaling, the procedure, exclusions. */
  readonly notes: readonly string[];
}

/** Keyed by result name, keys sorted. */
export type CombinedValues = Readonly<Record<string, Combined>>;
