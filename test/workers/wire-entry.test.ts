import { mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEntries, packEntry, parseFiles, SpillFile, unpackEntry, type RecordEntry } from "../../src/build/record-work.js";
import { isOpened, summaryOf } from "../../src/cache/lazy-audit.js";
import { listRecordFiles } from "../../src/records/load.js";

/**
 * How a build worker hands an entry to the main thread: with the audit's
 * bytes in its spill file, or, for a caller that reads only summaries, with
 * the summary alone and nothing spilled for it.
 */

const RECORDS = path.resolve(__dirname, "../fixtures/site/records");
const temp = mkdtempSync(path.join(os.tmpdir(), "steelyard-wire-entry-"));
let entries: RecordEntry[];

beforeAll(async () => {
  const files = await listRecordFiles(RECORDS);
  entries = parseFiles(files.map((file) => ({ file, key: file, bytes: readFileSync(path.join(RECORDS, file)) })));
  auditEntries(entries, { draws: 200 });
});

afterAll(() => rmSync(temp, { recursive: true, force: true }));

function spillSize(file: string): number {
  try {
    return statSync(file).size;
  } catch {
    return 0;
  }
}

describe("an entry sent from a build worker", () => {
  it("arrives with its whole audit when the audit's bytes are sent", () => {
    const spill = new SpillFile(path.join(temp, "whole.bin"));
    for (const e of entries) {
      const back = unpackEntry(packEntry(e, spill));
      expect(back.audit?.object).toEqual(e.audit?.object);
    }
    spill.close();
    expect(spillSize(spill.file)).toBeGreaterThan(0);
  });

  it("arrives with its summary alone, nothing spilled, when only summaries are asked for", () => {
    const spill = new SpillFile(path.join(temp, "summaries.bin"));
    const withObject = entries.filter((e) => e.audit?.object);
    expect(withObject.length).toBeGreaterThan(1);
    for (const e of entries) {
      const back = unpackEntry(packEntry(e, spill, false));
      expect(back.file).toBe(e.file);
      expect(back.audit?.problems).toEqual(e.audit?.problems);
      const obj = e.audit?.object;
      if (!obj) {
        expect(back.audit?.object).toBeUndefined();
        continue;
      }
      const stand = back.audit!.object!;
      expect([stand.id, stand.name, stand.file, stand.status]).toEqual([obj.id, obj.name, obj.file, obj.status]);
      expect(summaryOf(stand)).toEqual(summaryOf(obj));
      expect(isOpened(stand)).toBe(false);
      // anything more is a mistake of the caller, said at once rather than answered wrongly
      expect(() => stand.measurements).toThrow(/only its summary was sent/);
    }
    spill.close();
    expect(spillSize(spill.file)).toBe(0);
  });
});
