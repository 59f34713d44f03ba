// What the render store (equation shapes and compiled templates kept in the
// cache folder, src/site/render-store.ts) saves a one-record rebuild: on one
// generated catalogue, after one full build, rebuilds after editing one
// published value alternate between keeping the store and deleting it first
// (everything else in the cache kept), and the medians and their ratio are
// printed. Both kinds of run come from the same run of this script.
//
//   npx tsc -p . && node bench/render-store.mjs [--objects 10000] [--pairs 8] [--seed S]
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { editOnePublishedValue } from "./edit-record.mjs";
import { generateCatalogue } from "./generate.mjs";

const HERE = path.dirname(fileURLToPath(import.meta.url));
const CLI = path.join(HERE, "..", "bin", "steelyard.js");

function option(name, fallback) {
  const i = process.argv.indexOf(name);
  if (i < 0) return fallback;
  const v = Number(process.argv[i + 1]);
  if (!Number.isInteger(v) || v < 1) throw new Error(`${name} takes a whole number above 0, not ${process.argv[i + 1]}`);
  return v;
}
for (const a of process.argv.slice(2)) {
  if (a.startsWith("--") && !["--objects", "--pairs", "--seed"].includes(a)) throw new Error(`unknown option ${a}; options: --objects N, --pairs N, --seed S`);
}
const objects = option("--objects", 10_000);
const pairs = option("--pairs", 8);
const seed = option("--seed", 1);

const work = mkdtempSync(path.join(os.tmpdir(), "steelyard-render-store-"));
const records = path.join(work, "records");
const site = path.join(work, "site");
const cache = path.join(work, "cache");
const store = path.join(cache, "render-store.json");

function build() {
  const t = performance.now();
  const r = spawnSync(process.execPath, [CLI, "build", records, "--out", site, "--cache-dir", cache, "--exit-zero", "--quiet"], { stdio: ["ignore", "ignore", "inherit"] });
  if (r.status !== 0) throw new Error(`build exited ${r.status}`);
  return (performance.now() - t) / 1000;
}

const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

try {
  generateCatalogue(records, objects, seed);
  console.log(`${objects} objects; first build: ${build().toFixed(2)} s`);
  const kept = [];
  const deleted = [];
  for (let i = 0; i < pairs; i++) {
    // the order within a pair alternates too, so that neither kind always runs first
    const order = i % 2 === 0 ? ["kept", "deleted"] : ["deleted", "kept"];
    for (const kind of order) {
      editOnePublishedValue(records, 1);
      if (kind === "deleted") rmSync(store, { force: true });
      const s = build();
      (kind === "kept" ? kept : deleted).push(s);
      console.log(`  pair ${i + 1}: store ${kind.padEnd(7)} ${s.toFixed(2)} s`);
    }
  }
  const mk = median(kept);
  const md = median(deleted);
  console.log(`\none-record rebuild, median of ${pairs}: store kept ${mk.toFixed(2)} s (${Math.min(...kept).toFixed(2)}–${Math.max(...kept).toFixed(2)}), ` +
    `store deleted ${md.toFixed(2)} s (${Math.min(...deleted).toFixed(2)}–${Math.max(...deleted).toFixed(2)}); kept ÷ deleted = ${(mk / md).toFixed(3)}`);
} finally {
  rmSync(work, { recursive: true, force: true });
}
