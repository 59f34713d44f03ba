import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { main, type Io } from "../../src/cli.js";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "content/records");
const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-cli-cache-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function capture(): Io & { text: () => string; errors: () => string } {
  let out = "";
  let err = "";
  return { out: (t) => void (out += t), err: (t) => void (err += t), text: () => out, errors: () => err };
}

describe("build's cache options", () => {
  it("keeps its cache in --cache-dir and says the same on a second build", async () => {
    const cache = path.join(dir, "cache");
    const site = path.join(dir, "site");
    const args = ["build", DEMO, "--out", site, "--cache-dir", cache, "--draws", "200", "--quiet", "--exit-zero"];
    const first = capture();
    expect(await main(args, first)).toBe(0);
    const names = readdirSync(cache);
    expect(names.some((n) => n.startsWith("records-"))).toBe(true);
    expect(names.some((n) => n.startsWith("site-") && n.endsWith(".bin"))).toBe(true);
    const second = capture();
    expect(await main(args, second)).toBe(0);
    expect(second.text()).toBe(first.text());
    expect(first.text()).toMatch(/^Wrote 42 pages to .*: 37 objects, /);
  });

  it("refuses --no-cache with --cache-dir, and the cache options on check", async () => {
    const both = capture();
    expect(await main(["build", DEMO, "--out", path.join(dir, "x"), "--no-cache", "--cache-dir", path.join(dir, "c")], both)).toBe(2);
    expect(both.errors()).toContain("--no-cache and --cache-dir");
    expect(existsSync(path.join(dir, "x"))).toBe(false);
    const check = capture();
    expect(await main(["check", DEMO, "--cache-dir", path.join(dir, "c")], check)).toBe(2);
    expect(check.errors()).toContain("--cache-dir is an option of build");
    const check2 = capture();
    expect(await main(["check", DEMO, "--no-cache"], check2)).toBe(2);
  });

  it("builds without reading or writing a cache under --no-cache", async () => {
    const site = path.join(dir, "site-nocache");
    // the default cache folder (in the working folder) is left as it was
    const defaultCache = path.resolve(".cache", "steelyard");
    const listing = (): string[] =>
      existsSync(defaultCache) ? readdirSync(defaultCache).map((n) => `${n}:${statSync(path.join(defaultCache, n)).mtimeMs}`).sort() : [];
    const before = listing();
    const io = capture();
    expect(await main(["build", DEMO, "--out", site, "--no-cache", "--draws", "200", "--quiet", "--exit-zero"], io)).toBe(0);
    expect(existsSync(path.join(site, "objects/skab-88/index.html"))).toBe(true);
    expect(io.text()).toMatch(/^Wrote 42 pages/);
    expect(listing()).toEqual(before);
  });
});
