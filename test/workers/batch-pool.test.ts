import { mkdtempSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { describe, expect, it } from "vitest";
import { runBatches } from "../../src/workers/batch-pool.js";

const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-pool-"));
const worker = path.join(dir, "double.mjs");
writeFileSync(
  worker,
  `import { parentPort, workerData } from "node:worker_threads";
parentPort.on("message", (m) => {
  if (m.kind === "end") return parentPort.close();
  if (m.items.includes(workerData.poison)) return parentPort.postMessage({ kind: "failed", message: "poisoned item" });
  parentPort.postMessage({ kind: "done", batch: m.batch, out: m.items.map((x) => x * 2) });
});
`,
);

type Reply = { kind: "done"; batch: number; out: number[] } | { kind: "failed"; message: string };

function run(items: number[], poison = -1) {
  const got = new Map<number, number[]>();
  const promise = runBatches<number, Reply>({
    url: pathToFileURL(worker),
    count: 2,
    workerData: { poison },
    items,
    batchSize: 3,
    inFlight: 2,
    request: (batch, chunk) => ({ kind: "items", batch, items: chunk }),
    onReply: (r) => got.set(r.batch, r.out),
    name: "test worker",
    unfinished: "its items were doubled",
  });
  return { promise, got };
}

describe("batch pool", () => {
  it("answers every batch once, whatever order the workers finish in", async () => {
    const items = Array.from({ length: 20 }, (_, i) => i);
    const { promise, got } = run(items);
    await promise;
    expect([...got.keys()].sort((a, b) => a - b)).toEqual([0, 1, 2, 3, 4, 5, 6]);
    const flat = [...got.entries()].sort((a, b) => a[0] - b[0]).flatMap(([, v]) => v);
    expect(flat).toEqual(items.map((x) => x * 2));
  });

  it("rejects with the worker's message on the first failure", async () => {
    const { promise } = run([1, 2, 3, 4, 5, 6, 7], 5);
    await expect(promise).rejects.toThrow("test worker: poisoned item");
  });

  it("resolves at once with nothing to do", async () => {
    const { promise, got } = run([]);
    await promise;
    expect(got.size).toBe(0);
  });
});
