import { cpSync, readFileSync, readdirSync, statSync, utimesSync, writeFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { RACY_NS, StatIndex } from "../../src/cache/stat-index.js";
import { buildSite } from "../../src/site/build.js";
import { keyRecordFolder } from "../../src/build/pipeline.js";
import { listFiles } from "../site/helpers/html-scan.js";
import { tempDirs } from "../site/helpers/temp-dirs.js";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "content/records");
const DRAWS = 200;

const tempDir = tempDirs("steelyard-stat-index");

/** An index file holding `file`'s stats as they are now, made `madeAfterNs` after its last change. */
function writeIndex(indexFile: string, shared: string, name: string, file: string, key: string, madeAfterNs: bigint): void {
  const st = statSync(file, { bigint: true });
  const entry = [name, st.size, st.mtimeNs, st.ctimeNs, st.ino, st.dev].map(String);
  writeFileSync(indexFile, JSON.stringify({ shared, madeAtNs: String(st.ctimeNs + madeAfterNs), entries: [[...entry, key]] }));
}

describe("the stat index of record files", () => {
  it("gives a file's key only while its size, times, inode and device are as recorded, and the entry is old enough", () => {
    const dir = tempDir("unit");
    const file = path.join(dir, "a.yaml");
    writeFileSync(file, "id: 'A'\n");
    const indexFile = path.join(dir, "index.json");
    const stats = () => statSync(file, { bigint: true });

    writeIndex(indexFile, "S", "a.yaml", file, "K", RACY_NS + 1n);
    expect(new StatIndex(indexFile, "S").keyOf("a.yaml", stats())).toBe("K");
    // made under other settings, or for another file name
    expect(new StatIndex(indexFile, "T").keyOf("a.yaml", stats())).toBeUndefined();
    expect(new StatIndex(indexFile, "S").keyOf("b.yaml", stats())).toBeUndefined();
    // made too soon after the file last changed: a write in the same tick could hide
    writeIndex(indexFile, "S", "a.yaml", file, "K", RACY_NS - 1n);
    expect(new StatIndex(indexFile, "S").keyOf("a.yaml", stats())).toBeUndefined();

    // the same number of bytes written again, with the old modification time put back: the change time tells
    writeIndex(indexFile, "S", "a.yaml", file, "K", RACY_NS + 1n);
    const before = stats();
    const seconds = Number(before.mtimeNs / 1_000_000n) / 1000;
    const later = Date.now() + 50;
    while (Date.now() < later) {
      // let the clock move past the file's change time
    }
    writeFileSync(file, "id: 'B'\n");
    utimesSync(file, seconds, seconds);
    const after = stats();
    expect(after.size).toBe(before.size);
    expect(after.ctimeNs).not.toBe(before.ctimeNs);
    expect(new StatIndex(indexFile, "S").keyOf("a.yaml", after)).toBeUndefined();

    // not an index at all
    writeFileSync(indexFile, "[1, 2");
    expect(new StatIndex(indexFile, "S").keyOf("a.yaml", after)).toBeUndefined();
  });

  it("is written by a build with a cache, and a later edit of the same size and modification time is still seen", async () => {
    const records = tempDir("records");
    cpSync(DEMO, records, { recursive: true });
    const cacheDir = tempDir("cache");
    const site = tempDir("site");
    // old enough for the first build's entries to be trusted by the next build
    const old = Date.now() / 1000 - 60;
    for (const f of listFiles(records)) utimesSync(path.join(records, f), old, old);
    await new Promise((r) => setTimeout(r, (Number(RACY_NS) / 1e6) + 100));

    await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    const index = readdirSync(cacheDir).find((n) => n.startsWith("stats-"));
    expect(index).toBeDefined();
    const stored = JSON.parse(readFileSync(path.join(cacheDir, index!), "utf8")) as { entries: string[][] };
    expect(stored.entries.length).toBe(listFiles(records).filter((f) => /\.ya?ml$/.test(f)).length);
    // every file is trusted now: the keys come from the index, with no bytes read
    const keyed = await keyRecordFolder(records, { draws: DRAWS }, cacheDir);
    expect(keyed!.bytes.every((b) => b === undefined)).toBe(true);

    // one digit changed for another, the file's modification time put back
    const file = listFiles(records).find((f) => readFileSync(path.join(records, f), "utf8").includes("published:"))!;
    const full = path.join(records, file);
    const text = readFileSync(full, "utf8");
    const at = text.search(/published:\s*\n\s+[a-z0-9_]+: "\(?\d/);
    const digitAt = text.slice(at).search(/\d/) + at;
    const digit = text[digitAt];
    const edited = text.slice(0, digitAt) + (digit === "9" ? "8" : String(Number(digit) + 1)) + text.slice(digitAt + 1);
    expect(edited.length).toBe(text.length);
    writeFileSync(full, edited);
    utimesSync(full, old, old);

    const rebuilt = await buildSite({ recordsDir: records, outDir: site, quiet: true, audit: { draws: DRAWS }, cacheDir });
    expect(rebuilt.stats.audited).toBe(1);
    const fresh = tempDir("fresh");
    await buildSite({ recordsDir: records, outDir: fresh, quiet: true, audit: { draws: DRAWS } });
    const files = listFiles(fresh);
    expect(listFiles(site)).toEqual(files);
    for (const f of files) expect(readFileSync(path.join(site, f)).equals(readFileSync(path.join(fresh, f))), f).toBe(true);
  });
});
