import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readChunkedFile, writeChunkedFile } from "../../src/cache/chunked-file.js";
import { digest } from "../../src/cache/digest.js";
import { createHash } from "node:crypto";

const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-chunked-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("chunked cache file", () => {
  it("gives back every value exactly, including what JSON would lose", () => {
    const file = path.join(dir, "exact.bin");
    const values = [{ z: -0, nan: NaN, inf: -Infinity, none: undefined, big: 1.7976931348623157e308, tiny: 5e-324 }, "ünïcode ☉", [1, [2, [3]]]];
    writeChunkedFile(file, "test", values);
    const back = readChunkedFile(file, "test")!;
    expect(back).toHaveLength(3);
    const first = back[0] as Record<string, number | undefined>;
    expect(Object.is(first.z, -0)).toBe(true);
    expect(Number.isNaN(first.nan)).toBe(true);
    expect(first.inf).toBe(-Infinity);
    expect("none" in first && first.none === undefined).toBe(true);
    expect(first.big).toBe(1.7976931348623157e308);
    expect(first.tiny).toBe(5e-324);
    expect(back[1]).toBe("ünïcode ☉");
    expect(back[2]).toEqual([1, [2, [3]]]);
  });

  it("gives back byte arrays intact after the reader has read on past them", () => {
    const file = path.join(dir, "bytes.bin");
    // about 6 MB of values, each holding bytes of its own, so that the reader refills many times
    const values = Array.from({ length: 600 }, (_, i) => ({ i, bytes: new Uint8Array(10_000 + i).fill(i % 251) }));
    writeChunkedFile(file, "test-bytes", values);
    const back = readChunkedFile(file, "test-bytes") as Array<{ i: number; bytes: Uint8Array }>;
    expect(back).toHaveLength(600);
    for (const v of back) {
      expect(v.bytes.length).toBe(10_000 + v.i);
      expect(v.bytes.every((b) => b === v.i % 251)).toBe(true);
    }
  });

  it("reads values larger than its read buffer", () => {
    const file = path.join(dir, "large.bin");
    const big = "x".repeat(3 * 1024 * 1024);
    writeChunkedFile(file, "test", [big, "after"]);
    const back = readChunkedFile(file, "test")!;
    expect((back[0] as string).length).toBe(big.length);
    expect(back[1]).toBe("after");
  });

  it("reads a missing, foreign, truncated or other-kind file as nothing", () => {
    const file = path.join(dir, "ok.bin");
    writeChunkedFile(file, "records", [{ a: 1 }, { b: 2 }]);
    expect(readChunkedFile(file, "records")).toEqual([{ a: 1 }, { b: 2 }]);
    expect(readChunkedFile(file, "pages")).toBeUndefined();
    expect(readChunkedFile(path.join(dir, "missing.bin"), "records")).toBeUndefined();
    const bytes = readFileSync(file);
    const cut = path.join(dir, "cut.bin");
    writeFileSync(cut, bytes.subarray(0, bytes.length - 3));
    expect(readChunkedFile(cut, "records")).toBeUndefined();
    const foreign = path.join(dir, "foreign.bin");
    writeFileSync(foreign, "{\"not\": \"a cache\"}");
    expect(readChunkedFile(foreign, "records")).toBeUndefined();
  });
});

describe("digest", () => {
  it("is SHA-1 over length-prefixed parts, so part boundaries matter", () => {
    const expected = createHash("sha1").update("2:ab1:c").digest("hex");
    expect(digest(["ab", "c"])).toBe(expected);
    expect(digest(["a", "bc"])).not.toBe(expected);
    // bytes and their UTF-8 text give the same digest; the prefix counts bytes, not characters
    expect(digest([Buffer.from("☉", "utf8")])).toBe(digest(["☉"]));
    expect(digest(["☉"])).toBe(createHash("sha1").update("3:☉").digest("hex"));
  });
});
