import path from "node:path";
import { serialize } from "node:v8";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/index.js";
import type { AuditReport, ObjectAudit } from "../../src/audit/types.js";
import { auditJsonText, isOpened, lazyAudit, realAudit, storeAudit, summaryOf } from "../../src/cache/lazy-audit.js";

/** A stand-in read from the cache must be indistinguishable from the audit it stands for, and stay unread while only its summary is asked. */

const RECORDS = path.resolve(__dirname, "../fixtures/site/records");
let report: AuditReport;

beforeAll(async () => {
  report = await runAudit(RECORDS, { draws: 200 });
});

function standIn(obj: ObjectAudit): { stand: ObjectAudit; reads: () => number } {
  const stored = storeAudit(obj);
  let reads = 0;
  const stand = lazyAudit(stored.summary, () => {
    reads++;
    return stored.bytes;
  });
  return { stand, reads: () => reads };
}

describe("an audit read lazily from the cache", () => {
  it("answers id, name, file, status and the measurement statuses without reading its bytes", () => {
    const obj = report.objects[0];
    const { stand, reads } = standIn(obj);
    expect([stand.id, stand.name, stand.file, stand.status]).toEqual([obj.id, obj.name, obj.file, obj.status]);
    expect(summaryOf(stand).statuses).toEqual(obj.measurements.map((m) => m.status));
    expect(isOpened(stand)).toBe(false);
    expect(reads()).toBe(0);
    // writing the cache again reuses its bytes, read once, and still does not open it
    expect(Buffer.from(storeAudit(stand).bytes).equals(Buffer.from(serialize(obj)))).toBe(true);
    expect(isOpened(stand)).toBe(false);
    expect(reads()).toBe(1);
  });

  it("is the same audit for every reader: JSON, keys, deep equality, iteration", () => {
    for (const obj of report.objects) {
      const { stand } = standIn(obj);
      expect(JSON.stringify(stand)).toBe(JSON.stringify(obj));
      expect(Object.keys(stand)).toEqual(Object.keys(obj));
      expect(stand).toEqual(obj);
      expect(stand.measurements.map((m) => m.key)).toEqual(obj.measurements.map((m) => m.key));
      expect("combined" in stand).toBe("combined" in obj);
      expect(isOpened(stand)).toBe(true);
      expect(realAudit(stand)).toEqual(obj);
    }
    expect(isOpened(report.objects[0])).toBeUndefined();
  });

  it("writes its JSON from a copy that is not kept, and reads rereadable bytes afresh each time", () => {
    const obj = report.objects[1];
    const stored = storeAudit(obj);
    let reads = 0;
    const stand = lazyAudit(
      stored.summary,
      () => {
        reads++;
        return stored.bytes;
      },
      true,
    );
    expect(auditJsonText(stand)).toBe(JSON.stringify(obj));
    expect(auditJsonText(stand)).toBe(JSON.stringify(obj));
    expect(isOpened(stand)).toBe(false);
    expect(reads).toBe(2);
    expect(auditJsonText(obj)).toBe(JSON.stringify(obj));
  });

  it("cannot be changed", () => {
    const { stand } = standIn(report.objects[0]);
    expect(() => {
      (stand as { name: string }).name = "other";
    }).toThrow(/cannot be changed/);
  });
});
