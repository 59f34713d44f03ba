import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { compiledWorkerUrl } from "../workers/batch-pool.js";
import type { MonteCarloJob } from "./monte-carlo-job.js";
import type { MonteCarloRun } from "./monte-carlo.js";
import type { WorkerReply, WorkerRequest } from "./monte-carlo-worker.js";

/**
 * Runs many Monte Carlo jobs on worker threads. Job k goes to worker
 * k mod W, each worker runs its share in order, and the runs come back in the
 * order of the jobs. A run depends only on its job (its seed, inputs and
 * number of draws), so the runs are the same numbers as on one thread.
 *
 * The worker is compiled JavaScript (dist/uncertainty/monte-carlo-worker.js).
 * Where that file is not beside this module, as when the TypeScript sources
 * run under a test runner, no pool starts and the caller runs the jobs itself.
 */

export interface PoolOptions {
  /** Worker threads; default os.availableParallelism(). */
  readonly workers?: number;
  /** Worker script; default the compiled worker beside this module. */
  readonly workerUrl?: URL;
  /** Runs per reply message (default 64). */
  readonly chunk?: number;
}

/** The compiled worker beside this module, or undefined when there is none (running from the TypeScript sources). */
export function defaultWorkerUrl(): URL | undefined {
  return compiledWorkerUrl("monte-carlo-worker.js", import.meta.url);
}

export function defaultWorkerCount(): number {
  return Math.max(1, availableParallelism());
}

/**
 * Starts the jobs on worker threads and returns their runs, in job order, or
 * undefined (without starting anything) when no worker script is available.
 * The promise rejects if a worker fails.
 */
export function startMonteCarloPool(jobs: readonly MonteCarloJob[], options: PoolOptions = {}): Promise<MonteCarloRun[]> | undefined {
  const url = options.workerUrl ?? defaultWorkerUrl();
  if (!url) return undefined;
  const count = Math.max(1, Math.min(options.workers ?? defaultWorkerCount(), jobs.length));
  const chunk = Math.max(1, options.chunk ?? 64);
  const shares: MonteCarloJob[][] = Array.from({ length: count }, () => []);
  jobs.forEach((job, k) => shares[k % count].push(job));
  const runs: MonteCarloRun[] = new Array(jobs.length);
  return new Promise<MonteCarloRun[]>((resolve, reject) => {
    let open = count;
    let failed = false;
    const workers: Worker[] = [];
    const fail = (error: Error): void => {
      if (failed) return;
      failed = true;
      for (const w of workers) void w.terminate();
      reject(error);
    };
    shares.forEach((share, w) => {
      const worker = new Worker(url);
      workers.push(worker);
      let done = false;
      worker.on("message", (reply: WorkerReply) => {
        if (reply.kind === "runs") {
          reply.runs.forEach((run, i) => {
            runs[(reply.first + i) * count + w] = run;
          });
        } else {
          done = true;
          if (--open === 0 && !failed) resolve(runs);
        }
      });
      worker.on("error", (error) => fail(error instanceof Error ? error : new Error(String(error))));
      worker.on("exit", (code) => {
        if (!done) fail(new Error(`Monte Carlo worker ${w} stopped (exit code ${code}) before finishing its ${share.length} jobs`));
      });
      worker.postMessage({ jobs: share, chunk } satisfies WorkerRequest);
    });
  });
}
