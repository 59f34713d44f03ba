import type { Problem } from "../problem.js";
import type { QuantityKind } from "../quantity/quantity.js";
import type { Diagnosis } from "../diagnosis/types.js";
import type { CombinedValues } from "../combine/types.js";

/** The shape of `steelyard check --json` and of the site's data. All *_si values in SI (kg, m, s, rad). */

export type Status = "consistent" | "tension" | "discrepant" | "not-compared";
export const STATUSES: readonly Status[] = ["consistent", "tension", "discrepant", "not-compared"];

export interface Thresholds {
  /** |z| above this is tension. Default 1. */
  readonly tension: number;
  /** |z| above this is discrepant. Default 3. */
  readonly discrepant: number;
}

export interface Reference {
  readonly cite: string;
  readonly doi?: string;
  readonly bibcode?: string;
  readonly url?: string;
  readonly locator?: string;
}

export interface InputAudit {
  /** Record field name. */
  readonly field: string;
  /** Method slot it filled. */
  readonly slot: string;
  readonly text: string;
  readonly kind: QuantityKind;
  readonly value: number;
  readonly plus: number;
  readonly minus: number;
  readonly unit: string;
  readonly unit_latex: string;
  readonly value_si: number;
  readonly plus_si: number;
  readonly minus_si: number;
  /** SI unit of the *_si values ("kg" for masses). */
  readonly unit_si: string;
}

export interface BudgetEntry {
  /** Slot name, or a constant key such as "G". */
  readonly source: string;
  readonly label: string;
  /** Fraction of the first-order variance, 0..1. */
  readonly share: number;
}

export interface MonteCarloSummary {
  readonly draws: number;
  /** Draws rejected because they left the physical domain (e ≥ 1, negative period...). */
  readonly rejected: number;
  readonly median_si: number;
  readonly p16_si: number;
  readonly p84_si: number;
  readonly mean_si: number;
  readonly sd_si: number;
}

export interface ResultAudit {
  readonly name: string;
  readonly value_si: number;
  /** First-order 1σ (mean of the two sides when asymmetric). */
  readonly sigma_si: number;
  readonly sigma_plus_si: number;
  readonly sigma_minus_si: number;
  readonly unit_si: string;
  /** Display unit id and the value, sigma in it. */
  readonly display_unit: string;
  readonly display_unit_latex: string;
  readonly value: number;
  readonly sigma: number;
  readonly mc?: MonteCarloSummary;
  readonly budget: readonly BudgetEntry[];
}

export interface ComparisonAudit {
  readonly result: string;
  readonly published_text: string;
  readonly published_kind: QuantityKind;
  readonly published_value: number;
  readonly published_plus: number;
  readonly published_minus: number;
  readonly published_unit: string;
  readonly published_si: number;
  readonly published_plus_si: number;
  readonly published_minus_si: number;
  /** recomputed − published, SI. */
  readonly difference_si: number;
  /** recomputed / published. */
  readonly ratio: number;
  /** The σ that z divides by, SI. */
  readonly sigma_used_si: number;
  readonly sigma_from: "published" | "recomputed";
  readonly z: number;
  readonly status: Status;
}

export interface EquationAudit {
  readonly results: readonly string[];
  readonly general: string;
  readonly substituted: string;
}

export interface MeasurementAudit {
  readonly key: string;
  readonly method: string;
  readonly status: Status;
  readonly use: boolean;
  readonly comment?: string;
  readonly reference: Reference;
  readonly inputs: Readonly<Record<string, InputAudit>>;
  /** Assumptions made, in plain words (e = 0 taken, sin i = 1, ...). */
  readonly assumptions: readonly string[];
  readonly results: Readonly<Record<string, ResultAudit>>;
  readonly comparisons: Readonly<Record<string, ComparisonAudit>>;
  readonly equations: readonly EquationAudit[];
  /** Seed used for the Monte Carlo draws (derived from object id and key). */
  readonly seed: number;
  /** Likely causes, one per tension or discrepant comparison; absent when nothing is flagged. */
  readonly diagnoses?: readonly Diagnosis[];
}

export interface ObjectAudit {
  readonly id: string;
  readonly name: string;
  readonly file: string;
  readonly aliases: readonly string[];
  readonly notes?: string;
  /** Worst status over its measurements. */
  readonly status: Status;
  readonly measurements: readonly MeasurementAudit[];
  /** Reference values per result, combined over the measurements with use: true. */
  readonly combined: CombinedValues;
}

export interface AuditReport {
  readonly tool: { readonly name: "steelyard"; readonly version: string };
  readonly settings: {
    readonly thresholds: Thresholds;
    readonly draws: number;
    readonly constants: string;
  };
  readonly summary: {
    readonly files: number;
    readonly files_audited: number;
    readonly files_with_problems: number;
    readonly objects: number;
    readonly measurements: number;
    readonly status_counts: Readonly<Record<Status, number>>;
  };
  readonly objects: readonly ObjectAudit[];
  readonly problems: readonly Problem[];
}
