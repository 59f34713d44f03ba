import type { MethodDefinition } from "../methods/method.js";
import { runMonteCarlo, type DrawInput, type MonteCarloRun } from "./monte-carlo.js";

/** Everything the Monte Carlo of one measurement needs, as plain data that can be sent to a worker thread. */
export interface MonteCarloJob {
  /** Method id, as in the registry. */
  readonly method: string;
  readonly inputs: readonly DrawInput[];
  readonly draws: number;
  readonly seed: number;
}

export function runMonteCarloJob(method: MethodDefinition, job: MonteCarloJob): MonteCarloRun {
  if (job.method !== method.id) throw new Error(`Monte Carlo job for ${job.method} run with method ${method.id}`);
  return runMonteCarlo(method, job.inputs, job.draws, job.seed);
}
