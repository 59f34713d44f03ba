/**
 * Reproducible builds: the same records give a byte-identical site (audit JSON included), and so do
 * the same records with every mapping's keys in another order, written to other file paths order.
 */
import { createHash } from "node:crypto";
import { cpSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { createRequire } from "node:module";
import { beforeAll, describe, expect, it } from "vitest";
import { buildSite } from "../../src/site/build.js";

const yaml = createRequire(import.meta.url)("js-yaml") as {
  load(text: string): unknown;
  dump(value: unknown, options?: Record<string, unknown>): string;
};

function listFiles(root: string, dir = root): string[] {
  return readdirSync(dir)
    .sort()
    .flatMap((name) => {
      const full = path.join(dir, name);
      return statSync(full).isDirectory() ? listFiles(root, full) : [path.relative(root, full)];
    });
}

function digest(root: string): Map<string, string> {
  return new Map(listFiles(root).map((f) => [f, createHash("sha256").update(readFileSync(path.join(root, f))).digest("hex")]));
}

/** Reverses the key order of every mapping, recursively (lists keep their order). */
function reverseKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(reverseKeys);
  if (value && typeof value === "object") {
    return Object.fromEntries(Object.entries(value as Record<string, unknown>).reverse().map(([k, v]) => [k, reverseKeys(v)]));
  }
  return value;
}

const tmp = mkdtempSync(path.join(os.tmpdir(), "steelyard-repro-"));
const RECORDS = path.resolve("content/records");
const DRAWS = { draws: 2000 };
let first: Map<string, string>;

beforeAll(async () => {
  await buildSite({ recordsDir: RECORDS, outDir: path.join(tmp, "a"), audit: DRAWS });
  first = digest(path.join(tmp, "a"));
}, 240_000);

describe("reproducible builds", () => {
  it("builds the same records into a byte-identical site twice", async () => {
    await buildSite({ recordsDir: RECORDS, outDir: path.join(tmp, "b"), audit: DRAWS });
    const second = digest(path.join(tmp, "b"));
    expect([...second.keys()]).toEqual([...first.keys()]);
    const differing = [...first.keys()].filter((f) => first.get(f) !== second.get(f));
    expect(differing).toEqual([]);
    expect(first.has("downloads/audit.json")).toBe(true);
  }, 240_000);

  it("gives the same site when every record's keys are in another order", async () => {
    const copy = path.join(tmp, "records-reordered");
    cpSync(RECORDS, copy, { recursive: true });
    for (const f of listFiles(copy).filter((f) => f.endsWith(".yaml"))) {
      const full = path.join(copy, f);
      const data = reverseKeys(yaml.load(readFileSync(full, "utf8")));
      writeFileSync(full, yaml.dump(data, { lineWidth: -1 }));
    }
    await buildSite({ recordsDir: copy, outDir: path.join(tmp, "c"), audit: DRAWS });
    const third = digest(path.join(tmp, "c"));
    const differing = [...first.keys()].filter((f) => first.get(f) !== third.get(f));
    expect(differing).toEqual([]);
  }, 240_000);
});
