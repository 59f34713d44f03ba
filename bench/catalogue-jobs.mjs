// The Monte Carlo jobs of the generated catalogue: what `check` and `build` hand the
// kernels, measurement by measurement, made from the records in memory (nothing is written).
import { monteCarloJob } from "../dist/audit/audit-measurement.js";
import { DEFAULT_THRESHOLDS } from "../dist/audit/compare.js";
import { DEFAULT_SET } from "../dist/constants/sets.js";
import { getMethod } from "../dist/methods/index.js";
import { loadRecordText } from "../dist/records/load.js";
import { objectRecord } from "./generate.mjs";

/** The jobs of objects 1..count of the catalogue with `seed`, each with its method, in record order. */
export function catalogueJobs(count, seed, draws) {
  const options = { draws, thresholds: DEFAULT_THRESHOLDS, constants: DEFAULT_SET };
  const out = [];
  for (let n = 1; n <= count; n++) {
    const r = objectRecord(n, seed);
    const { record, problems } = loadRecordText(r.text, r.file);
    if (!record) throw new Error(`catalogueJobs: object ${n} does not load: ${problems.map((p) => p.message).join("; ")}`);
    for (const m of record.measurements) {
      const method = getMethod(m.method);
      const job = monteCarloJob(record.id, method, m, options);
      if (job) out.push({ method, job });
    }
  }
  return out;
}
