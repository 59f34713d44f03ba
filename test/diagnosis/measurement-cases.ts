import { auditMeasurement } from "../../src/audit/audit-measurement.js";
import { DEFAULT_THRESHOLDS } from "../../src/audit/compare.js";
import type { MeasurementAudit } from "../../src/audit/types.js";
import { getMethod } from "../../src/methods/index.js";
import type { MethodDefinition } from "../../src/methods/method.js";
import { loadRecordText } from "../../src/records/load.js";
import type { MeasurementRecord } from "../../src/records/types.js";
import { diagnose } from "../../src/diagnosis/diagnose.js";
import type { Diagnosis } from "../../src/diagnosis/types.js";

/** Defining constants typed in by hand, so the published values below do not come from the code under test. */
export const AU = 149597870700; // IAU 2012 Resolution B2, exact
export const GM_SUN = 1.3271244e20; // IAU 2015 Resolution B3, nominal
export const G = 6.6743e-11; // CODATA 2018
export const G_2014 = 6.67408e-11; // CODATA 2014
export const DAY = 86400;
export const JULIAN_YEAR = 365.25 * DAY;
export const PC = (648000 / Math.PI) * AU; // IAU 2015 Resolution B2
export const LY = 299792458 * JULIAN_YEAR; // c × Julian year
export const ARCSEC = Math.PI / (180 * 3600);
export const MAS = ARCSEC / 1000;
export const DEG = Math.PI / 180;
export const KM = 1000;
export const R_SUN = 6.957e8; // IAU 2015 Resolution B3, nominal
export const MSUN_KG = GM_SUN / G;

export interface Case {
  readonly method: MethodDefinition;
  readonly record: MeasurementRecord;
  readonly audit: MeasurementAudit;
}

/** A published value written with every digit, with a relative 1σ of `rel`. */
export function pub(value: number, unit: string, rel = 1e-7): string {
  return `${value} ± ${Math.abs(value) * rel} ${unit}`;
}

/** Loads one invented measurement through the real record loader and audits it as the report does. */
export function build(method: string, inputs: Record<string, string>, published: Record<string, string>): Case {
  const lines = [
    "name: Orrin Test Pair",
    "id: orrin-test",
    "measurements:",
    "  - key: trial",
    `    method: ${method}`,
    "    reference:",
    '      cite: "Invented 2030, J. Invented Astron. 1, 1"',
    "    inputs:",
    ...Object.entries(inputs).map(([k, v]) => `      ${k}: "${v}"`),
    "    published:",
    ...Object.entries(published).map(([k, v]) => `      ${k}: "${v}"`),
  ];
  const outcome = loadRecordText(lines.join("\n") + "\n", "orrin-test.yaml");
  const errors = outcome.problems.filter((p) => p.severity === "error");
  if (!outcome.record || errors.length > 0) {
    throw new Error(`test record does not load: ${errors.map((p) => `${p.path}: ${p.message}`).join("; ")}`);
  }
  const m = getMethod(method);
  if (!m) throw new Error(`no method ${method}`);
  const record = outcome.record.measurements[0];
  const audit = auditMeasurement(outcome.record.id, m, record, { draws: 0, thresholds: DEFAULT_THRESHOLDS });
  return { method: m, record, audit };
}

export function run(c: Case): Diagnosis[] {
  return diagnose(c.method, c.record, c.audit, DEFAULT_THRESHOLDS);
}

/** The diagnosis of one result; fails the test when that result is not flagged. */
export function diagnosisOf(c: Case, result: string): Diagnosis {
  const d = run(c).find((x) => x.result === result);
  if (!d) throw new Error(`${result} is not flagged (status ${c.audit.comparisons[result]?.status})`);
  return d;
}

/** Kepler's third law: GM of the pair from a (m) and P (s). */
export const keplerGM = (a: number, P: number) => (4 * Math.PI * Math.PI * a ** 3) / (P * P);

/** Solve (m s)³ = f (M1 + m)² for m by bisection (independent of the methods' own solver). */
export function cubicMass(f: number, m1: number, s = 1): number {
  let lo = 0;
  let hi = 1e3 * (m1 + f) / (s * s * s) + 1;
  for (let i = 0; i < 400; i++) {
    const mid = (lo + hi) / 2;
    if ((mid * s) ** 3 - f * (m1 + mid) ** 2 > 0) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}
