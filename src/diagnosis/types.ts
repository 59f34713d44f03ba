import type { ComparisonAudit, MeasurementAudit, Status } from "../audit/types.js";
import type { ConstantSet } from "../constants/sets.js";
import type { MethodDefinition } from "../methods/method.js";
import type { MeasurementRecord } from "../records/types.js";

/**
 * Likely causes of a disagreement: each hypothesis is one slip that papers are
 * known to make, written as a change to the inputs or to the recomputed
 * result. A hypothesis that reconciles the published value is a prompt to
 * reread the paper with that slip in mind, not a verdict.
 */

/** A change to one measurement's inputs, in the record's own terms. */
export type InputChange =
  /** Multiply the slot's value and both uncertainties by `factor` (its SI value scales the same). */
  | { readonly kind: "scale"; readonly slot: string; readonly factor: number }
  /** Leave the slot out, so the method falls back on its default (e = 0, sin i = 1, ...). */
  | { readonly kind: "drop"; readonly slot: string }
  /** Exchange the values of two slots of the same dimension. */
  | { readonly kind: "swap"; readonly slots: readonly [string, string] }
  /** Give the slot a new SI value, keeping its uncertainty as typed. */
  | { readonly kind: "set"; readonly slot: string; readonly value_si: number };

/** A change to the recomputed value of the result under diagnosis. */
export type ResultChange =
  /** The paper's number is ours times `factor` (uncertainties scale the same). */
  | { readonly kind: "factor"; readonly factor: number }
  /** The paper's number is our value of another result (a total mass reported as a component's). */
  | { readonly kind: "use-result"; readonly result: string }
  /** The paper's number is this SI value (uncertainties scale with it). */
  | { readonly kind: "value"; readonly value_si: number };

/** What a hypothesis does to one measurement; at least one part is present. */
export interface Change {
  readonly inputs?: readonly InputChange[];
  readonly result?: ResultChange;
  /**
   * Slots whose uncertainty the paper may have left out of its error budget.
   * Such a change explains an understated published uncertainty, not the value.
   */
  readonly omitted?: readonly string[];
  /** How the slip reads in a sentence: "with a 365 d year", "if K₁ and K₂ were swapped". */
  readonly phrase: string;
}

/** Everything a hypothesis may look at. */
export interface DiagnosisContext {
  readonly method: MethodDefinition;
  readonly record: MeasurementRecord;
  readonly audit: MeasurementAudit;
  /** The result under diagnosis and its comparison. */
  readonly result: string;
  readonly comparison: ComparisonAudit;
  readonly constants: ConstantSet;
}

export interface Hypothesis {
  /** Stable kebab-case id. */
  readonly id: string;
  /** Plain words, for a heading. */
  readonly title: string;
  /** What the slip is, in a sentence or two. */
  readonly description: string;
  /** Method ids it applies to. */
  readonly methods: readonly string[];
  /** Results it can touch; undefined for every result the method gives. */
  readonly results?: readonly string[];
  /** Whether the slip is possible for this measurement and result (the right slots and units are present). */
  applies(ctx: DiagnosisContext): boolean;
  /** The change the slip makes; undefined when it cannot be formed (a needed value is missing). */
  transform(ctx: DiagnosisContext): Change | undefined;
}

export interface Explanation {
  readonly hypothesis: string;
  readonly title: string;
  /** With numbers: "with a 365 d year the total mass would be 0.99795 × ours ...". */
  readonly description: string;
  /** "value": the slip reproduces the published value; "uncertainty": it explains an understated published σ. */
  readonly kind: "value" | "uncertainty";
  readonly z_after: number;
  readonly status_after: Status;
  /** published / recomputed. */
  readonly factor: number;
  /** recomputed after the slip / recomputed. */
  readonly slip_factor: number;
  readonly recomputed_after_si: number;
}

/** The diagnosis of one flagged comparison. */
export interface Diagnosis {
  readonly key: string;
  readonly method: string;
  readonly result: string;
  readonly status: Status;
  readonly z: number;
  /** Hypotheses that bring |z| within the tension threshold, best (smallest |z|) first. */
  readonly explained: readonly Explanation[];
  /** True when no single slip in the list reconciles the published value. */
  readonly unexplained: boolean;
  /** One or two sentences for the page. */
  readonly summary: string;
  /** Ids of the hypotheses that applied and were tried, sorted. */
  readonly tried: readonly string[];
}
