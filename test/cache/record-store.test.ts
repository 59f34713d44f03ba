import { appendFileSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readRecordStore, recordStoreState, shardOf, SHARDS, writeRecordStore, type StoreCodec } from "../../src/cache/record-store.js";

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

describe("reading the shards", () => {
  interface V {
    readonly file: string;
    readonly key: string;
    readonly text: string;
    readonly bytes?: Uint8Array;
  }
  const entries = (withBytes: boolean): V[] =>
    Array.from({ length: 300 }, (_, i) => ({
      file: `rec-${i}.yaml`,
      key: `k${i}`,
      text: `entry ${i} `.repeat(1 + (i % 40)),
      ...(withBytes ? { bytes: Uint8Array.from({ length: 64 + (i % 50) }, (_, j) => (i + j) % 256) } : {}),
    }));

  it("gives every value back whole when a codec says they hold no bytes, so one buffer serves every shard", () => {
    const folder = path.join(dir, "no-bytes");
    const codec: StoreCodec<V> = { encode: (e) => ({ value: e }), decode: (v) => v as V, valuesHoldNoBytes: true };
    const written = entries(false);
    writeRecordStore(folder, written, new Map(), codec);
    const back = readRecordStore<V>(folder, codec);
    expect([...back.values()].sort((a, b) => Number(a.key.slice(1)) - Number(b.key.slice(1)))).toEqual(written);
  });

  it("keeps values that hold byte arrays intact when the codec does not say so", () => {
    const folder = path.join(dir, "with-bytes");
    const written = entries(true);
    writeRecordStore(folder, written, new Map());
    const back = readRecordStore<V>(folder);
    // byte arrays deserialised as views of a buffer read again for the next shard would show another shard's bytes
    for (const e of written) expect(Buffer.from(back.get(e.file)!.bytes!).equals(Buffer.from(e.bytes!))).toBe(true);
  });
});

describe("record store with blobs kept apart", () => {
  interface B {
    readonly file: string;
    readonly key: string;
    /** Reads the blob back (from the store's blob file, on demand). */
    readonly blob: () => Uint8Array;
  }
  let reads = 0;
  const codec: StoreCodec<B> = {
    encode: (e) => ({ value: { file: e.file, key: e.key }, blob: e.blob() }),
    decode: (v, blob) => {
      const { file, key } = v as { file: string; key: string };
      let cached: Uint8Array | undefined;
      return {
        file,
        key,
        blob: () => {
          if (!cached) {
            reads++;
            cached = blob!();
          }
          return cached;
        },
      };
    },
  };
  const made = (i: number, tag = ""): B => {
    const bytes = Buffer.from(`blob of ${i}${tag} `.repeat(1 + (i % 13)));
    return { file: `${String(i % 5).padStart(3, "0")}/rec-${i}.yaml`, key: `k${i}${tag}`, blob: () => bytes };
  };
  const text = (e: B | undefined) => Buffer.from(e!.blob()).toString("utf8");

  it("reads a blob only when asked, and keeps the blobs of a shard written again", () => {
    const folder = path.join(dir, "blobs");
    const entries = Array.from({ length: 300 }, (_, i) => made(i));
    writeRecordStore(folder, entries, new Map(), codec);
    reads = 0;
    const back = readRecordStore(folder, codec);
    expect(back.size).toBe(300);
    expect(reads).toBe(0);
    expect(text(back.get("002/rec-7.yaml"))).toBe("blob of 7 ".repeat(8));
    expect(reads).toBe(1);

    // one entry changes: its shard is written again, with the blobs of its neighbours read from the old file first
    const next = [...back.values()].map((e) => (e.file === "003/rec-8.yaml" ? made(8, "b") : e));
    expect(writeRecordStore(folder, next, back, codec)).toBe(1);
    const again = readRecordStore(folder, codec);
    for (const e of entries) {
      const want = e.file === "003/rec-8.yaml" ? "blob of 8b ".repeat(9) : text(e);
      expect(text(again.get(e.file))).toBe(want);
    }
    // one blob file per shard is left
    const shard = String(shardOf("003/rec-8.yaml")).padStart(2, "0");
    expect(readdirSync(folder).filter((f) => f.startsWith(`shard-${shard}.`) && f.endsWith(".blobs"))).toHaveLength(1);
  });

  it("drops a shard whose blob file is missing or of another size", () => {
    const folder = path.join(dir, "blobs-damaged");
    writeRecordStore(folder, Array.from({ length: 100 }, (_, i) => made(i)), new Map(), codec);
    const victim = readdirSync(folder).find((f) => f.endsWith(".blobs"))!;
    const shard = Number(victim.slice("shard-".length, "shard-".length + 2));
    appendFileSync(path.join(folder, victim), "x");
    const back = readRecordStore(folder, codec);
    const inShard = Array.from({ length: 100 }, (_, i) => made(i)).filter((e) => shardOf(e.file) === shard);
    expect(inShard.length).toBeGreaterThan(0);
    expect(back.size).toBe(100 - inShard.length);
    for (const e of inShard) expect(back.has(e.file)).toBe(false);
  });
});
