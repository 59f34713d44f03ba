import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";

/**
 * The compiled worker script `name` beside the module at `moduleUrl`, or
 * undefined when that module runs from the TypeScript sources (as under the
 * test runner) or the script is not there.
 */
export function compiledWorkerUrl(name: string, moduleUrl: string): URL | undefined {
  const url = new URL(`./${name}`, moduleUrl);
  if (url.protocol !== "file:" || !fileURLToPath(moduleUrl).endsWith(".js")) return undefined;
  return existsSync(fileURLToPath(url)) ? url : undefined;
}

/** A worker's answer to one batch: success carries whatever the caller expects, failure a message. */
export type BatchReply = { readonly kind: "failed"; readonly message: string } | { readonly kind: string };

export interface BatchPoolOptions<Item, Reply extends BatchReply> {
  /** The compiled worker module. */
  readonly url: URL;
  readonly count: number;
  readonly workerData: unknown;
  readonly items: readonly Item[];
  readonly batchSize: number;
  /** Batches handed to each worker before its first answer. */
  readonly inFlight: number;
  /** The message that asks for one batch. */
  readonly request: (batch: number, items: readonly Item[]) => unknown;
  /** Called once per successful batch, in the order answers arrive. */
  readonly onReply: (reply: Exclude<Reply, { kind: "failed" }>) => void;
  /** For messages: "build worker", "object page worker". */
  readonly name: string;
  /** What an early exit left undone: "its records were audited". */
  readonly unfinished: string;
}

/**
 * Splits `items` into batches and feeds them to `count` workers, keeping
 * `inFlight` batches queued per worker; resolves when every batch has been
 * answered (then tells each worker { kind: "end" }), rejects on the first
 * failure and stops every worker.
 */
export function runBatches<Item, Reply extends BatchReply>(o: BatchPoolOptions<Item, Reply>): Promise<void> {
  const batches: Item[][] = [];
  for (let i = 0; i < o.items.length; i += o.batchSize) batches.push(o.items.slice(i, i + o.batchSize));
  if (batches.length === 0) return Promise.resolve();
  let next = 0;
  let done = 0;
  return new Promise<void>((resolve, reject) => {
    const workers: Worker[] = [];
    let failed = false;
    const fail = (error: Error): void => {
      if (failed) return;
      failed = true;
      for (const w of workers) void w.terminate();
      reject(error);
    };
    const feed = (w: Worker): void => {
      if (failed || next >= batches.length) return;
      const batch = next++;
      w.postMessage(o.request(batch, batches[batch]));
    };
    for (let k = 0; k < o.count; k++) {
      const w = new Worker(o.url, { workerData: o.workerData });
      workers.push(w);
      w.on("message", (reply: Reply) => {
        if (reply.kind === "failed") {
          fail(new Error(`${o.name}: ${(reply as { message: string }).message}`));
          return;
        }
        o.onReply(reply as Exclude<Reply, { kind: "failed" }>);
        if (++done === batches.length) {
          for (const x of workers) x.postMessage({ kind: "end" });
          resolve();
        } else feed(w);
      });
      w.on("error", (e) => fail(e instanceof Error ? e : new Error(String(e))));
      w.on("exit", (code) => {
        if (done < batches.length) fail(new Error(`${o.name} stopped (exit code ${code}) before ${o.unfinished}`));
      });
    }
    for (let i = 0; i < o.inFlight; i++) for (const w of workers) feed(w);
  });
}
