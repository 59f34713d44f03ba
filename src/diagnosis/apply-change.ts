import { auditMeasurement } from "../audit/audit-measurement.js";
import type { MeasurementAudit, Thresholds } from "../audit/types.js";
import type { ConstantSet } from "../constants/sets.js";
import type { MethodDefinition } from "../methods/method.js";
import type { Quantity } from "../quantity/quantity.js";
import { slotSI } from "../records/validate-measurement.js";
import type { MeasurementRecord, SlotInput } from "../records/types.js";
import type { InputChange } from "./types.js";

/**
 * Applies input changes to a copy of a measurement record. The record itself
 * is never modified. Changes naming a slot the record lacks are programmer
 * mistakes: hypotheses check their slots in `applies`.
 */
export function applyInputChanges(record: MeasurementRecord, changes: readonly InputChange[]): MeasurementRecord {
  const inputs: Record<string, SlotInput> = { ...record.inputs };
  const need = (slot: string): SlotInput => {
    const i = inputs[slot];
    if (!i) throw new Error(`diagnosis: measurement ${record.key} has no input ${slot} to change`);
    return i;
  };
  for (const c of changes) {
    switch (c.kind) {
      case "scale": {
        const i = need(c.slot);
        const q = i.quantity;
        const f = Math.abs(c.factor);
        const quantity: Quantity = { ...q, value: q.value * c.factor, plus: q.plus * f, minus: q.minus * f };
        inputs[c.slot] = { ...i, quantity };
        break;
      }
      case "set": {
        const i = need(c.slot);
        const quantity: Quantity = { ...i.quantity, value: c.value_si / i.quantity.unit.scale };
        inputs[c.slot] = { ...i, quantity };
        break;
      }
      case "drop":
        need(c.slot);
        delete inputs[c.slot];
        break;
      case "swap": {
        const [a, b] = c.slots;
        const ia = need(a);
        const ib = need(b);
        inputs[a] = { ...ia, quantity: ib.quantity };
        inputs[b] = { ...ib, quantity: ia.quantity };
        break;
      }
    }
  }
  return { ...record, inputs };
}

/** The record with the uncertainties of `slots` set to zero (taken as exact). */
export function withoutUncertainty(record: MeasurementRecord, slots: readonly string[]): MeasurementRecord {
  const inputs: Record<string, SlotInput> = { ...record.inputs };
  for (const slot of slots) {
    const i = inputs[slot];
    if (!i) continue;
    inputs[slot] = { ...i, quantity: { ...i.quantity, kind: "exact", plus: 0, minus: 0 } };
  }
  return { ...record, inputs };
}

/**
 * Audits a changed record exactly as the report does (no Monte Carlo);
 * undefined when the changed inputs leave the method's domain (its own
 * validation refuses them) or give a non-finite result.
 */
export function reaudit(
  method: MethodDefinition,
  record: MeasurementRecord,
  thresholds: Thresholds,
  constants: ConstantSet,
): MeasurementAudit | undefined {
  const si: Record<string, number> = {};
  for (const [slot, input] of Object.entries(record.inputs)) si[slot] = slotSI(input.quantity);
  if (method.validate(si).some((i) => (i.severity ?? "error") === "error")) return undefined;
  const audit = auditMeasurement("", method, record, { draws: 0, thresholds, constants });
  const finite = Object.values(audit.results).every((r) => Number.isFinite(r.value_si) && Number.isFinite(r.sigma_si));
  return finite ? audit : undefined;
}
