import type { Status } from "../audit/types.js";

/** A combined value as a release comparison shows it. */
export interface ReleaseValue {
  readonly value_si: number;
  /** Mean of the two sides of the combined uncertainty (after any Birge scaling). */
  readonly sigma_si: number;
  readonly value: number;
  readonly sigma_plus: number;
  readonly sigma_minus: number;
  readonly display_unit: string;
  /** Measurements combined. */
  readonly count: number;
}

export interface MeasurementRef {
  readonly id: string;
  readonly key: string;
}

export interface ResultRef {
  readonly id: string;
  readonly result: string;
}

export interface MovedValue {
  readonly id: string;
  readonly result: string;
  readonly before: ReleaseValue;
  readonly after: ReleaseValue;
  /** (after − before) / √(σ_before² + σ_after²). */
  readonly shift_sigma: number;
}

export interface StatusChange {
  readonly id: string;
  readonly key: string;
  readonly before: Status;
  readonly after: Status;
}

/** What changed from one audit to the next. Every list is sorted by id, then key or result. */
export interface ReleaseComparison {
  /** Objects only in the current audit. */
  readonly added: readonly string[];
  /** Objects only in the previous audit. */
  readonly removed: readonly string[];
  /** Measurements new to an object present in both. */
  readonly measurements_added: readonly MeasurementRef[];
  /** Measurements gone from an object present in both. */
  readonly measurements_removed: readonly MeasurementRef[];
  /** Combined values of objects present in both whose value changed. */
  readonly moved: readonly MovedValue[];
  /** Combined results that appeared or disappeared for an object present in both. */
  readonly results_added: readonly ResultRef[];
  readonly results_removed: readonly ResultRef[];
  /** Measurements present in both whose status changed. */
  readonly status_changes: readonly StatusChange[];
  /** Changed settings (thresholds, constants, tool version), which can explain the other changes. */
  readonly notes: readonly string[];
}
