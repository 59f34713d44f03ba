// Changes one published value in one record of a generated catalogue, as an
// author correcting a typo would: the last printed digit of the first published
// value in the first record (by path) that has one.
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

function* yamlFiles(dir) {
  const entries = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  for (const e of entries) {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) yield* yamlFiles(full);
    else if (e.isFile() && /\.ya?ml$/.test(e.name)) yield full;
  }
}

/** `"2.03 ± 0.04 Msun"` → the number's text and where it sits in the line. */
const PUBLISHED_LINE = /^(\s+[a-z0-9_]+: "\(?)(\d+(?:\.\d+)?)/;

/**
 * Adds `step` units in the last place to that value (wrapping the digit
 * within 1..9 so the value stays positive and keeps its length), writes the
 * file back and returns { file, before, after }.
 */
export function editOnePublishedValue(dir, step = 1) {
  for (const file of yamlFiles(dir)) {
    const lines = readFileSync(file, "utf8").split("\n");
    const at = lines.findIndex((l) => l.trim() === "published:");
    if (at < 0 || at + 1 >= lines.length) continue;
    const match = PUBLISHED_LINE.exec(lines[at + 1]);
    if (!match) continue;
    const number = match[2];
    const last = Number(number[number.length - 1]);
    const digit = ((last - 1 + step) % 9 + 9) % 9 + 1;
    const changed = number.slice(0, -1) + String(digit);
    const before = lines[at + 1];
    lines[at + 1] = match[1] + changed + before.slice(match[0].length);
    writeFileSync(file, lines.join("\n"));
    return { file, before: before.trim(), after: lines[at + 1].trim() };
  }
  throw new Error(`editOnePublishedValue: no record under ${dir} has a published value to change`);
}
