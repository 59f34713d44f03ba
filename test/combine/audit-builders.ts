import type { MeasurementAudit, ObjectAudit, ResultAudit } from "../../src/audit/types.js";

const MSUN_KG = 1.3271244e20 / 6.6743e-11;

/** A result as the audit reports it, in solar masses (display) and kg (SI). */
export function massResult(name: string, valueMsun: number, plus: number, minus = plus): ResultAudit {
  return {
    name,
    value_si: valueMsun * MSUN_KG,
    sigma_si: ((plus + minus) / 2) * MSUN_KG,
    sigma_plus_si: plus * MSUN_KG,
    sigma_minus_si: minus * MSUN_KG,
    unit_si: "kg",
    display_unit: "Msun",
    display_unit_latex: "M_{\\odot}",
    value: valueMsun,
    sigma: (plus + minus) / 2,
    budget: [],
  };
}

/** A plain-number result (display unit "1"). */
export function plainResult(name: string, value: number, plus: number, minus = plus): ResultAudit {
  return {
    name,
    value_si: value,
    sigma_si: (plus + minus) / 2,
    sigma_plus_si: plus,
    sigma_minus_si: minus,
    unit_si: "",
    display_unit: "1",
    display_unit_latex: "",
    value,
    sigma: (plus + minus) / 2,
    budget: [],
  };
}

export function measurement(key: string, results: ResultAudit[], extra: Partial<MeasurementAudit> = {}): MeasurementAudit {
  return {
    key,
    method: "relative-orbit",
    status: "consistent",
    use: true,
    reference: { cite: `Invented ${key}` },
    inputs: {},
    assumptions: [],
    results: Object.fromEntries(results.map((r) => [r.name, r])),
    comparisons: {},
    equations: [],
    seed: 1,
    ...extra,
  };
}

export function object(id: string, measurements: MeasurementAudit[]): ObjectAudit {
  return { id, name: id.toUpperCase(), file: `${id}.yaml`, aliases: [], status: "consistent", measurements };
}

export const SOLAR_MASS_KG = MSUN_KG;
