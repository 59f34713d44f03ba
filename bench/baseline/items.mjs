// The data of the bare Eleventy yardstick: N small items, one page each.
import { cpSync, mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const HERE = path.dirname(fileURLToPath(import.meta.url));
export const BASELINE_CONFIG = path.join(HERE, "eleventy.config.mjs");
export const BASELINE_INPUT = path.join(HERE, "input");

const STATUSES = ["consistent", "consistent", "consistent", "tension", "discrepant", "not-compared"];
const KINDS = ["pair", "wobble", "velocity curve", "rotation"];
const FIELDS = [
  ["period", "yr"],
  ["semimajor_axis", "arcsec"],
  ["parallax", "mas"],
  ["eccentricity", ""],
  ["k1", "km/s"],
  ["total_mass", "Msun"],
];

/** N items, deterministic: a few fields each and six rows for the table. */
export function baselineItems(n) {
  const items = [];
  for (let i = 1; i <= n; i++) {
    const id = `item-${i}`;
    items.push({
      id,
      index: i,
      name: `Item ${i}`,
      kind: KINDS[i % KINDS.length],
      status: STATUSES[i % STATUSES.length],
      group: String(Math.floor((i - 1) / 1000)).padStart(3, "0"),
      year: 1995 + (i % 31),
      notes: `Item ${i} of ${n}, invented for the build-speed comparison.`,
      previous: i > 1 ? `item-${i - 1}` : null,
      next: i < n ? `item-${i + 1}` : null,
      rows: FIELDS.map(([field, unit], k) => ({
        field,
        value: `${((i * 37 + k * 11) % 997) / 10 + 1} ± ${(((i + k) % 9) + 1) / 10}`,
        unit,
        note: k % 2 ? "as written" : "from the table of the source",
      })),
    });
  }
  return items;
}

/** Copies the baseline input folder to `dir` and writes its data file of `n` items. */
export function prepareBaselineInput(dir, n) {
  cpSync(BASELINE_INPUT, dir, { recursive: true });
  mkdirSync(path.join(dir, "_data"), { recursive: true });
  writeFileSync(path.join(dir, "_data", "items.json"), JSON.stringify(baselineItems(n)));
  return dir;
}
