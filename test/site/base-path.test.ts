import { describe, expect, it } from "vitest";
import { normalizeBasePath, underBase } from "../../src/site/base-path.js";
import { offerPreparedSite, takePreparedSite } from "../../src/site/handoff.js";
import type { AuditReport } from "../../src/audit/types.js";

describe("base path", () => {
  it("normalizes to a leading and a trailing slash", () => {
    const cases: Array<[string, string]> = [
      ["", "/"],
      ["/", "/"],
      ["sub", "/sub/"],
      ["/sub", "/sub/"],
      ["/a//b/", "/a/b/"],
      [" /masses/v1.2/ ", "/masses/v1.2/"],
    ];
    for (const [input, expected] of cases) {
      const r = normalizeBasePath(input);
      expect(r.ok && r.value, input).toBe(expected);
    }
  });

  it("refuses what is not a plain URL path, saying how to fix it", () => {
    for (const input of ["/a b/", "/../up/", "https://example.org/", "/x?y", "/x#y", "/./"]) {
      const r = normalizeBasePath(input);
      expect(r.ok, input).toBe(false);
      if (!r.ok) {
        expect(r.issues[0].code).toBe("bad-base-path");
        expect(r.issues[0].hint).toMatch(/for example/);
      }
    }
  });

  it("puts site paths under it", () => {
    expect(underBase("/sub/", "objects/x/")).toBe("/sub/objects/x/");
    expect(underBase("/sub/", "/assets/site.css")).toBe("/sub/assets/site.css");
    expect(underBase("/", "")).toBe("/");
  });
});

describe("prepared site hand-over", () => {
  const report = { objects: [] } as unknown as AuditReport;

  it("is taken exactly once", () => {
    offerPreparedSite({ report, basePath: "/x/" });
    expect(takePreparedSite()?.basePath).toBe("/x/");
    expect(takePreparedSite()).toBeUndefined();
  });

  it("refuses a second offer while one is waiting", () => {
    offerPreparedSite({ report, basePath: "/" });
    expect(() => offerPreparedSite({ report, basePath: "/" })).toThrow(/already waiting/);
    takePreparedSite();
  });
});
