import type { Reference } from "../audit/types.js";
import type { Quantity } from "../quantity/quantity.js";

/** Where a value was found in its file (1-based; 0 when unknown). */
export interface Location {
  readonly line: number;
  readonly column: number;
}

/** One record input, resolved to the method slot its dimension selects. */
export interface SlotInput {
  readonly field: string;
  readonly slot: string;
  readonly quantity: Quantity;
  readonly location: Location;
}

export interface PublishedValue {
  readonly result: string;
  readonly quantity: Quantity;
  readonly location: Location;
}

/** A measurement that passed validation and can be audited. */
export interface MeasurementRecord {
  readonly key: string;
  readonly method: string;
  readonly reference: Reference;
  /** Keyed by slot name. */
  readonly inputs: Readonly<Record<string, SlotInput>>;
  /** Keyed by result name. */
  readonly published: Readonly<Record<string, PublishedValue>>;
  readonly use: boolean;
  readonly comment?: string;
  readonly location: Location;
}

export interface ObjectRecord {
  readonly id: string;
  readonly name: string;
  /** Path relative to the records folder, forward slashes. */
  readonly file: string;
  readonly aliases: readonly string[];
  readonly notes?: string;
  /** Only the measurements that passed validation; the others are in the problems. */
  readonly measurements: readonly MeasurementRecord[];
}

export interface LoadOutcome {
  /** Records with at least one valid measurement, sorted by id. */
  readonly records: readonly ObjectRecord[];
  /** Every problem (errors and warnings), sorted by file, line, column. */
  readonly problems: readonly import("../problem.js").Problem[];
  /** Every file considered (.yaml / .yml), relative paths, sorted. */
  readonly files: readonly string[];
  /** Files with at least one error-severity problem. */
  readonly filesWithErrors: readonly string[];
}
