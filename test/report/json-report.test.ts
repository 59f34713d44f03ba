import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/run.js";
import { auditRecords } from "../../src/audit/audit-records.js";
import { reportJsonChunks } from "../../src/report/json-report.js";
import type { AuditReport } from "../../src/audit/types.js";

describe("check --json in pieces", () => {
  it("gives exactly JSON.stringify(report, null, 2) for a real audit with problems", async () => {
    for (const dir of ["test/fixtures/audit/records", "test/fixtures/audit/broken", "test/fixtures/records/broken"]) {
      const report = await runAudit(path.resolve(dir), { draws: 50 });
      const pieces = [...reportJsonChunks(report)];
      expect(pieces.length).toBeGreaterThan(report.objects.length);
      expect(pieces.join("")).toBe(JSON.stringify(report, null, 2) + "\n");
    }
  });

  it("handles an audit with no objects", () => {
    const empty = auditRecords({ records: [], problems: [], files: [], filesWithErrors: [] }, { draws: 0 });
    expect([...reportJsonChunks(empty)].join("")).toBe(JSON.stringify(empty, null, 2) + "\n");
  });

  // reference: the language's own JSON.stringify (ECMA-262) with a two-space gap
  it("gives JSON.stringify's text for any JSON value as an object", () => {
    fc.assert(
      fc.property(fc.array(fc.jsonValue(), { maxLength: 4 }), fc.jsonValue(), (objects, head) => {
        const report = { head, objects } as unknown as AuditReport;
        expect([...reportJsonChunks(report)].join("")).toBe(JSON.stringify(report, null, 2) + "\n");
      }),
      { numRuns: 300 },
    );
  });
});
