import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll } from "vitest";

/** A maker of temporary folders named `<prefix>-<label>-…`, all removed after the test file. */
export function tempDirs(prefix: string): (label: string) => string {
  const made: string[] = [];
  afterAll(() => {
    for (const d of made) rmSync(d, { recursive: true, force: true });
  });
  return (label) => {
    const d = mkdtempSync(path.join(os.tmpdir(), `${prefix}-${label}-`));
    made.push(d);
    return d;
  };
}
