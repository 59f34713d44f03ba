import { existsSync, mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync, utimesSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { OutputManifest } from "../../src/cache/output-manifest.js";

const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-manifest-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function put(out: string, rel: string, text: string): { size: number; mtimeMs: number } {
  const file = path.join(out, rel);
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, text);
  const s = statSync(file);
  return { size: s.size, mtimeMs: s.mtimeMs };
}

describe("output manifest", () => {
  it("reuses a file only when its key matches and it is untouched since", () => {
    const out = path.join(dir, "site");
    const file = path.join(dir, "m.bin");
    const first = new OutputManifest(file, out);
    for (const id of ["a", "b", "c", "d"]) {
      const w = put(out, `objects/${id}/index.html`, `page ${id}`);
      first.wrote(`objects/${id}/index.html`, `key-${id}`, w.size, w.mtimeMs);
    }
    first.save();

    // b: edited by hand (size changes); c: removed; d: same size, other time
    writeFileSync(path.join(out, "objects/b/index.html"), "edited page b");
    rmSync(path.join(out, "objects/c/index.html"));
    utimesSync(path.join(out, "objects/d/index.html"), new Date(2001, 0, 1), new Date(2001, 0, 1));

    const second = new OutputManifest(file, out);
    expect(second.reuse("objects/a/index.html", "key-a")).toBe(true);
    expect(second.reuse("objects/a/index.html", "key-other")).toBe(false);
    expect(second.reuse("objects/b/index.html", "key-b")).toBe(false);
    expect(second.reuse("objects/c/index.html", "key-c")).toBe(false);
    expect(second.reuse("objects/d/index.html", "key-d")).toBe(false);
    expect(second.reuse("objects/e/index.html", "key-e")).toBe(false);
  });

  it("removes the files of the last build that this build does not make, and their empty folders", () => {
    const out = path.join(dir, "site2");
    const file = path.join(dir, "m2.bin");
    const first = new OutputManifest(file, out);
    for (const id of ["keep", "gone"]) {
      const w = put(out, `objects/${id}/index.html`, id);
      first.wrote(`objects/${id}/index.html`, id, w.size, w.mtimeMs);
    }
    const dl = put(out, "downloads/audit.json", "{}");
    first.wrote("downloads/audit.json", "k", dl.size, dl.mtimeMs);
    first.save();
    const second = new OutputManifest(file, out);
    const removed = second.removeStale("objects/", new Set(["objects/keep/index.html"]));
    expect(removed).toBe(1);
    expect(existsSync(path.join(out, "objects/gone"))).toBe(false);
    expect(existsSync(path.join(out, "objects/keep/index.html"))).toBe(true);
    // outside the prefix nothing is touched
    expect(existsSync(path.join(out, "downloads/audit.json"))).toBe(true);
  });
});
