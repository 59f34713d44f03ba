import { mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readRecordStore, recordStoreState, shardOf, SHARDS, writeRecordStore } from "../../src/cache/record-store.js";

const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-store-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface E {
  readonly file: string;
  readonly key: string;
  readonly n: number;
}

describe("sharded record store", () => {
  it("keeps every entry, and rewrites only the shard of an entry that changed", () => {
    const folder = path.join(dir, "store");
    const entries: E[] = Array.from({ length: 500 }, (_, i) => ({ file: `${String(i % 7).padStart(3, "0")}/rec-${i}.yaml`, key: `k${i}`, n: i }));
    expect(writeRecordStore(folder, entries, new Map())).toBe(SHARDS);
    const back = readRecordStore<E>(folder);
    expect(back.size).toBe(500);
    expect(back.get("003/rec-10.yaml")).toEqual({ file: "003/rec-10.yaml", key: "k10", n: 10 });

    const stateBefore = recordStoreState(folder);
    const times = new Map(readdirSync(folder).map((f) => [f, statSync(path.join(folder, f)).mtimeMs]));
    // entries taken over from what was read are the same objects; one is new
    const next = [...back.values()].map((e) => (e.file === "003/rec-10.yaml" ? { ...e, key: "k10b" } : e));
    expect(writeRecordStore(folder, next, back)).toBe(1);
    const changed = readdirSync(folder).filter((f) => statSync(path.join(folder, f)).mtimeMs !== times.get(f));
    expect(changed).toEqual([`shard-${String(shardOf("003/rec-10.yaml")).padStart(2, "0")}.bin`]);
    expect(readRecordStore<E>(folder).get("003/rec-10.yaml")?.key).toBe("k10b");
    expect(recordStoreState(folder)).not.toBe(stateBefore);

    // nothing changed: nothing written; an entry removed: its shard is written
    const again = readRecordStore<E>(folder);
    expect(writeRecordStore(folder, [...again.values()], again)).toBe(0);
    const fewer = [...again.values()].filter((e) => e.file !== "000/rec-0.yaml");
    expect(writeRecordStore(folder, fewer, again)).toBe(1);
    expect(readRecordStore<E>(folder).size).toBe(499);
  });
});
