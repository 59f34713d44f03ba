import { parentPort } from "node:worker_threads";
import { getMethod } from "../methods/index.js";
import { runMonteCarloJob, type MonteCarloJob } from "./monte-carlo-job.js";
import type { MonteCarloRun } from "./monte-carlo.js";

/**
 * Worker thread of the Monte Carlo pool: receives one share of the jobs, runs
 * them in order and posts the runs back in chunks, then closes.
 */

export interface WorkerRequest {
  readonly jobs: readonly MonteCarloJob[];
  /** Runs per reply message. */
  readonly chunk: number;
}

export type WorkerReply =
  | { readonly kind: "runs"; readonly first: number; readonly runs: readonly MonteCarloRun[] }
  | { readonly kind: "done" };

if (!parentPort) throw new Error("monte-carlo-worker must run as a worker thread");
const port = parentPort;

port.once("message", (request: WorkerRequest) => {
  let runs: MonteCarloRun[] = [];
  let first = 0;
  request.jobs.forEach((job, k) => {
    const method = getMethod(job.method);
    if (!method) throw new Error(`Monte Carlo job for unknown method ${job.method}`);
    runs.push(runMonteCarloJob(method, job));
    if (runs.length === request.chunk) {
      port.postMessage({ kind: "runs", first, runs } satisfies WorkerReply);
      first = k + 1;
      runs = [];
    }
  });
  if (runs.length > 0) port.postMessage({ kind: "runs", first, runs } satisfies WorkerReply);
  port.postMessage({ kind: "done" } satisfies WorkerReply);
  port.close();
});
