import { deserialize, serialize } from "node:v8";
import path from "node:path";
import nunjucks from "nunjucks";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/index.js";
import type { AuditReport } from "../../src/audit/types.js";
import { ALL_CONSTANTS } from "../../src/constants/sets.js";
import { METHODS } from "../../src/methods/index.js";
import { fragmentsOf } from "../../src/site/fragments.js";
import { adoptHomeRowHtml, homeRowHtmlOf } from "../../src/site/home-rows.js";
import { createPageRenderer, NUNJUCKS_OPTIONS } from "../../src/site/page-render.js";
import { CONTENT_DIR } from "../../src/site/paths.js";
import { buildSiteData } from "../../src/site/site-data.js";

/**
 * The home table's rows are rendered one object at a time (on the build
 * workers, and kept in the cache). Here the rows' HTML is checked against the
 * same rows rendered by one loop in one template, as the page once did, and
 * adopted rows against rows rendered afresh.
 */

const RECORDS = path.resolve(__dirname, "../fixtures/site/records");
const INCLUDES = path.join(CONTENT_DIR, "_includes");
let report: AuditReport;

beforeAll(async () => {
  report = await runAudit(RECORDS, { draws: 400 });
});

function copied(r: AuditReport): AuditReport {
  return deserialize(serialize(r)) as AuditReport;
}

/** Every row through one loop over the partial's own text, in one template. */
function inOneLoop(rows: unknown[], basePath: string): string {
  const env = new nunjucks.Environment(new nunjucks.FileSystemLoader(INCLUDES), { ...NUNJUCKS_OPTIONS });
  const partial = env.getTemplate("partials/home-row.njk", true);
  // the partial's body after its first line (comment and import), looped
  const body = (partial as unknown as { tmplStr: string }).tmplStr.split("\n").slice(1).join("\n");
  const loop = `{% from "partials/status.njk" import status %}\n{% for r in rows %}\n${body}{% endfor %}\n`;
  const steelyard = { link: (p: string) => `${basePath}${p}` };
  return new nunjucks.Template(loop, env).render({ rows, steelyard });
}

/** The object pages' renderer's home rows, links under `basePath`. */
function rowRenderer(basePath: string) {
  return createPageRenderer(INCLUDES, { basePath, version: "test", settings: report.settings, hasChanges: false }).homeRow;
}

describe("home rows rendered one object at a time", () => {
  it("are the text one loop over all rows gives, under the root and under a base path", () => {
    for (const base of ["/", "/mass-audit/"]) {
      const data = buildSiteData({ report: copied(report), basePath: base, methods: METHODS, constants: ALL_CONSTANTS });
      expect(data.rows.length).toBeGreaterThan(3);
      expect(data.homeRowsHtml).toBe(inOneLoop([...data.rows], base));
      expect(data.homeRowsHtml).toContain(`href="${base}objects/`);
    }
  });

  it("are taken as adopted for the same base path, and rendered again for another", () => {
    const r = copied(report);
    const render = rowRenderer("/");
    const fresh = buildSiteData({ report: copied(report), basePath: "/", methods: METHODS, constants: ALL_CONSTANTS }).homeRowsHtml;
    // a marked row stands in for each adopted one, to see which are used
    for (const o of r.objects) {
      const home = fragmentsOf(o).home;
      if (home) adoptHomeRowHtml(o, "/", render(home).replace("<tr ", "<tr data-adopted "));
    }
    expect(homeRowHtmlOf(r.objects[0], "/other/")).toBeUndefined();
    const adopted = buildSiteData({ report: r, basePath: "/", methods: METHODS, constants: ALL_CONSTANTS }).homeRowsHtml;
    expect(adopted.replace(/<tr data-adopted /g, "<tr ")).toBe(fresh);
    expect(adopted.split("<tr data-adopted ").length - 1).toBe(r.objects.filter((o) => fragmentsOf(o).home).length);
    const elsewhere = buildSiteData({ report: r, basePath: "/other/", methods: METHODS, constants: ALL_CONSTANTS }).homeRowsHtml;
    expect(elsewhere).not.toContain("data-adopted");
    expect(elsewhere).toContain('href="/other/objects/');
  });

  it("are rendered again with the site's own method titles", () => {
    const r = copied(report);
    const render = rowRenderer("/");
    for (const o of r.objects) {
      const home = fragmentsOf(o).home;
      if (home) adoptHomeRowHtml(o, "/", render(home));
    }
    const renamed = METHODS.map((m) => ({ ...m, title: `${m.title} (renamed)` }));
    const html = buildSiteData({ report: r, basePath: "/", methods: renamed, constants: ALL_CONSTANTS }).homeRowsHtml;
    const rows = html.split("</tr>").length - 1;
    expect(html.split("(renamed)</td>").length - 1).toBe(rows);
  });
});
