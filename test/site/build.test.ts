import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AuditReport } from "../../src/audit/types.js";
import { buildSite, renderSite } from "../../src/site/build.js";
import { TABLE_COLUMNS } from "../../src/site/table.js";
import { ALL_CONSTANTS } from "../../src/constants/sets.js";
import { METHODS } from "../../src/methods/index.js";
import { headlineOf } from "../../src/site/headline.js";
import { katexStylesheetPath, siteKatexStylesheet } from "../../src/site/katex-compact.js";
import { digest } from "../../src/cache/digest.js";
import { readFileSync } from "node:fs";
import { validateXML } from "xmllint-wasm";
import { referenceTableVOTable } from "../../src/export/votable.js";
import { combinedIndex } from "../../src/site/downloads.js";
import { combinedValueText } from "../../src/site/combined-view.js";
import { formatRatio, formatWithSigma } from "../../src/site/display.js";
import { unitSymbol } from "../../src/site/unit-display.js";
import { parseCsv } from "./helpers/csv-parse.js";
import { decodeEntities, listFiles, readText, startTags, textContent } from "./helpers/html-scan.js";

const ROOT = path.resolve(__dirname, "../..");
const FIXTURE_RECORDS = path.join(ROOT, "test/fixtures/site/records");
const DEMO_RECORDS = path.join(ROOT, "content/records");
const DRAWS = 400;
const VOTABLE_SCHEMA = readFileSync(path.join(ROOT, "test/fixtures/votable/VOTable-1.4.xsd"), "utf8");

const temp: string[] = [];
function tempDir(label: string): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), `steelyard-site-${label}-`));
  temp.push(dir);
  return dir;
}
afterAll(() => {
  for (const d of temp) rmSync(d, { recursive: true, force: true });
});

function htmlFiles(dir: string): string[] {
  return listFiles(dir).filter((f) => f.endsWith(".html"));
}

/** The record URLs a page may link to: the report's own http(s) references, as the site normalizes them. */
function recordUrls(report: AuditReport): Set<string> {
  const out = new Set<string>();
  for (const o of report.objects) {
    for (const m of o.measurements) {
      if (m.reference.url && /^https?:\/\//i.test(m.reference.url)) out.add(new URL(m.reference.url).href);
    }
  }
  return out;
}

/**
 * Everything in the built site that points somewhere. Loads (src, link href,
 * CSS url()) must stay inside the site; anchors may also go to doi.org or to a
 * record's own http(s) URL; nothing may use a javascript: or other scheme.
 */
function checkLinks(dir: string, report: AuditReport, basePath: string): string[] {
  const allowedExternal = recordUrls(report);
  const bad: string[] = [];
  const inside = (v: string): boolean => v.startsWith(basePath) && !v.startsWith("//");
  for (const file of listFiles(dir)) {
    if (file.endsWith(".html")) {
      const html = readText(dir, file);
      for (const tag of startTags(html)) {
        for (const [name, value] of tag.attributes) {
          if (name.startsWith("on")) bad.push(`${file}: event handler attribute ${tag.source}`);
          if (name === "src" || name === "srcset" || name === "poster" || name === "data" || name === "action" || name === "formaction") {
            if (!inside(value)) bad.push(`${file}: ${tag.name} ${name}=${value}`);
          }
          if (name === "href") {
            if (tag.name === "a") {
              const ok =
                value.startsWith("#") ||
                inside(value) ||
                /^https:\/\/doi\.org\/10\.[^\s"<>]+$/.test(value) ||
                allowedExternal.has(value);
              if (!ok) bad.push(`${file}: anchor href=${value}`);
            } else if (!inside(value)) {
              bad.push(`${file}: ${tag.name} href=${value}`);
            }
          }
        }
        if (tag.name === "script" && !tag.attributes.has("src")) bad.push(`${file}: inline script`);
        if (tag.name === "style") bad.push(`${file}: inline style element`);
        if (tag.name === "base") bad.push(`${file}: base element`);
      }
    }
    if (file.endsWith(".css")) {
      for (const m of readText(dir, file).matchAll(/url\(\s*(['"]?)([^)'"]*)\1\s*\)/g)) {
        const v = m[2];
        if (/^[a-z][a-z0-9+.-]*:/i.test(v) || v.startsWith("//") || v.startsWith("/")) bad.push(`${file}: url(${v})`);
      }
      if (/@import/.test(readText(dir, file))) bad.push(`${file}: @import`);
    }
  }
  return bad;
}

describe("site built from the fixture records", () => {
  let out: string;
  let report: AuditReport;
  let pages: number;
  const page = (id: string): string => readText(out, `objects/${id}/index.html`);

  beforeAll(async () => {
    out = tempDir("fixture");
    ({ report, pages } = await buildSite({ recordsDir: FIXTURE_RECORDS, outDir: out, quiet: true, audit: { draws: DRAWS } }));
  });

  it("audits the five fixture objects and reports the rejected javascript: link as a record problem", () => {
    expect(report.objects.map((o) => o.id)).toEqual(["orvell-12", "orvell-20-disc", "orvell-5-ab", "orvell-66", "orvell-9"]);
    expect(report.problems.map((p) => [p.code, p.file])).toEqual([["bad-url", "hostile.yaml"]]);
  });

  it("writes one page per object at objects/<id>/ plus the five site pages, and counts them", () => {
    const html = htmlFiles(out);
    for (const o of report.objects) expect(html).toContain(`objects/${o.id}/index.html`);
    for (const p of ["index.html", "methods/index.html", "constants/index.html", "problems/index.html", "about/index.html"]) {
      expect(html).toContain(p);
    }
    expect(html).toHaveLength(report.objects.length + 5);
    expect(pages).toBe(html.length);
  });

  it("typesets equations with KaTeX on every object page and copies KaTeX's stylesheet and fonts", () => {
    for (const o of report.objects) {
      const html = page(o.id);
      expect(html).toContain('class="katex-display"');
      expect(html).toContain('class="katex"');
      expect(html).toContain("<math");
      expect(html).not.toContain("katex-error");
    }
    const files = listFiles(out);
    // KaTeX's sheet with the equations' short class names (katex-classes.ts), not KaTeX's own file
    // under a name that holds a digest of its content, so a browser never pairs a page with an older map
    const sheet = katexStylesheetPath();
    expect(sheet).toMatch(/^assets\/katex\/katex-[0-9a-f]{12}\.css$/);
    expect(files.filter((f) => f.startsWith("assets/katex/") && f.endsWith(".css"))).toEqual([sheet]);
    for (const o of report.objects) expect(page(o.id)).toContain(`<link rel="stylesheet" href="/${sheet}">`);
    const fonts = files.filter((f) => f.startsWith("assets/katex/fonts/"));
    // every font the stylesheet names is there
    const css = readText(out, sheet);
    expect(css).toBe(siteKatexStylesheet());
    expect(sheet).toContain(digest([css]).slice(0, 12));
    const named = [...css.matchAll(/url\((fonts\/[^)]+)\)/g)].map((m) => `assets/katex/${m[1]}`);
    expect(named.length).toBeGreaterThan(10);
    for (const f of named) expect(fonts).toContain(f);
  });

  it("loads nothing from outside the site and links out only to doi.org and the records' own web addresses", () => {
    expect(checkLinks(out, report, "/")).toEqual([]);
    // the anchors that do go out are the fixture's DOI and URLs
    const index = page("orvell-5-ab");
    expect(index).toContain('href="https://doi.org/10.5555/jia.2020.5.88"');
    expect(index).toContain('href="https://example.org/papers/jia-5-88?view=full&amp;lang=en"');
  });

  it("gives no two elements of a page the same id", () => {
    for (const f of htmlFiles(out)) {
      const ids = startTags(readText(out, f)).flatMap((t) => (t.attributes.has("id") ? [t.attributes.get("id")!] : []));
      expect(ids.filter((id, i) => ids.indexOf(id) !== i), f).toEqual([]);
    }
  });

  it("sends a Content-Security-Policy that allows only the site's own files", () => {
    for (const f of htmlFiles(out)) {
      const csp = startTags(readText(out, f)).find((t) => t.name === "meta" && t.attributes.get("http-equiv") === "Content-Security-Policy");
      expect(csp, f).toBeDefined();
      const policy = new Map(
        csp!.attributes
          .get("content")!
          .split(";")
          .map((d) => d.trim().split(/\s+/))
          .map(([k, ...v]) => [k, v.join(" ")] as const),
      );
      expect(policy.get("default-src")).toBe("'self'");
      expect(policy.get("script-src")).toBe("'self'");
      expect(policy.get("style-src")).toBe("'self'");
      expect(policy.get("font-src")).toBe("'self'");
      expect(policy.get("object-src")).toBe("'none'");
      expect(policy.get("base-uri")).toBe("'none'");
      expect(policy.get("form-action")).toBe("'none'");
    }
  });

  it("escapes hostile record text in every page and never links the javascript: address", () => {
    const hostilePage = page("orvell-66");
    const everyPage = htmlFiles(out).map((f) => readText(out, f));
    for (const html of everyPage) {
      expect(html).not.toMatch(/<script>alert/);
      expect(html).not.toMatch(/<img src=x/i);
      expect(html).not.toMatch(/<b>bold<\/b>/);
      for (const tag of startTags(html)) {
        for (const [name, value] of tag.attributes) {
          if (name === "href" || name === "src") expect(value.trim().toLowerCase().startsWith("javascript:")).toBe(false);
        }
      }
    }
    expect(hostilePage).toContain("&lt;script&gt;alert(1)&lt;/script&gt; Orvell 66 &quot;Q&quot; &amp; &#39;S&#39;");
    expect(hostilePage).toContain("&lt;img src=x onerror=alert(2)&gt;");
    expect(hostilePage).toContain("&lt;/p&gt;&lt;script&gt;alert(3)&lt;/script&gt; &amp; Co");
    expect(hostilePage).toContain("&lt;script&gt;alert(5)&lt;/script&gt; &amp; &#39;x&#39;");
    expect(hostilePage).toContain("&lt;b&gt;bold&lt;/b&gt;, A&amp;B");
    // the address with quotes and angle brackets is linked percent-encoded, and shown escaped
    const links = startTags(hostilePage).filter((t) => t.name === "a" && t.attributes.get("href")?.startsWith("https://example.org/a"));
    expect(links.map((t) => t.attributes.get("href"))).toEqual(["https://example.org/a?b=1&c=%22x%22%3Cy%3E"]);
    // the refused measurement is not audited, and its problem is shown on the object page and the problems page
    expect(hostilePage).not.toContain("orbit-y</code>:");
    expect(hostilePage).toContain('id="record-problems"');
    expect(decodeEntities(hostilePage)).toContain("url scheme 'javascript:' is not allowed");
    const problems = readText(out, "problems/index.html");
    expect(problems).toContain('data-code="bad-url"');
    expect(problems).toContain("<code>hostile.yaml</code>");
    expect(problems).toContain("<code>measurements[1].reference.url</code>");
  });

  it("says on every object page that a flag is a prompt to reread the source, not a verdict", () => {
    for (const o of report.objects) {
      expect(textContent(page(o.id))).toMatch(/A flag is a prompt to reread the source, not a verdict on it\./);
    }
    expect(textContent(readText(out, "about/index.html"))).toMatch(/z is not a test statistic of two independent measurements/);
  });

  it("shows every status as a word and a marker, on the table and the object pages", () => {
    const home = readText(out, "index.html");
    const rows = startTags(home).filter((t) => t.name === "tr" && t.attributes.has("data-id"));
    expect(rows.map((t) => [t.attributes.get("data-id"), t.attributes.get("data-status")])).toEqual(
      report.objects.map((o) => [o.id, o.status]),
    );
    expect(home).toContain('<span class="status status-discrepant"><span class="status-marker" aria-hidden="true">■</span> discrepant</span>');
    expect(home).toContain('<span class="status status-tension"><span class="status-marker" aria-hidden="true">△</span> tension</span>');
    expect(page("orvell-9")).toContain("■</span> discrepant");
  });

  it("lists every tension and discrepant comparison on the problems page, linked to its measurement", () => {
    const problems = readText(out, "problems/index.html");
    const flagged = startTags(problems).filter((t) => t.name === "tr" && t.attributes.has("data-id"));
    expect(flagged.map((t) => `${t.attributes.get("data-id")}:${t.attributes.get("data-status")}`)).toEqual([
      "orvell-9:discrepant",
      "orvell-66:tension",
      "orvell-12:tension",
    ]);
    expect(problems).toContain('href="/objects/orvell-9/#measurement-velocities-2019"');
  });

  it("writes the reference table as strict RFC 4180 CSV that agrees with the audit", () => {
    const rows = parseCsv(readText(out, "downloads/reference-table.csv"));
    expect(rows[0]).toEqual([...TABLE_COLUMNS]);
    const body = rows.slice(1);
    expect(body).toHaveLength(report.objects.length);
    const col = (name: string): number => rows[0].indexOf(name);
    for (const [i, obj] of report.objects.entries()) {
      const row = body[i];
      expect(row).toHaveLength(TABLE_COLUMNS.length);
      const h = headlineOf(obj)!;
      expect(row[col("object_id")]).toBe(obj.id);
      expect(row[col("object_name")]).toBe(obj.name);
      expect(row[col("status")]).toBe(obj.status);
      expect(row[col("result")]).toBe(h.result.name);
      // shortest round-trip text: the very same double as in the report
      expect(Number(row[col("recomputed_si")])).toBe(h.result.value_si);
      expect(Number(row[col("recomputed_sigma_si")])).toBe(h.result.sigma_si);
      expect(row[col("z")]).toBe(h.comparison ? String(h.comparison.z) : "");
      expect(row[col("reference")]).toBe(h.measurement.reference.cite);
    }
    // the hostile name, with its quotes and comma-free text, survives the round trip
    expect(body.find((r) => r[0] === "orvell-66")![1]).toBe("<script>alert(1)</script> Orvell 66 \"Q\" & 'S'");
  });

  it("writes the table and the full audit as JSON that agree with the report and with the CSV", () => {
    const audit = JSON.parse(readText(out, "downloads/audit.json"));
    expect(audit).toEqual(JSON.parse(JSON.stringify(report)));
    const table = JSON.parse(readText(out, "downloads/reference-table.json"));
    expect(table.columns).toEqual([...TABLE_COLUMNS]);
    const csv = parseCsv(readText(out, "downloads/reference-table.csv")).slice(1);
    expect(table.rows).toHaveLength(csv.length);
    for (const [i, row] of table.rows.entries()) {
      TABLE_COLUMNS.forEach((c, j) => {
        const v = row[c];
        expect(v === null ? "" : String(v), `${c} of row ${i}`).toBe(csv[i][j]);
      });
    }
  });

  it("writes the combined values into the table downloads beside the headline measurement's", () => {
    const rows = parseCsv(readText(out, "downloads/reference-table.csv"));
    const col = (name: string): number => rows[0].indexOf(name);
    for (const name of ["combined", "combined_sigma", "combined_si", "combined_sigma_si", "combined_count", "birge_ratio"]) expect(col(name), name).toBeGreaterThan(0);
    for (const [i, obj] of report.objects.entries()) {
      const row = rows[i + 1];
      const c = obj.combined[headlineOf(obj)!.result.name];
      expect(row[col("combined_count")], obj.id).toBe(String(c.count));
      expect(row[col("combined_si")], obj.id).toBe(c.estimate ? String(c.estimate.value_si) : "");
      expect(row[col("combined_sigma_si")], obj.id).toBe(c.estimate ? String(c.estimate.sigma_si) : "");
      expect(row[col("birge_ratio")], obj.id).toBe(c.birge_ratio === null ? "" : String(c.birge_ratio));
    }
    // orvell-12: the 2011 velocities are marked not to be used, so one measurement is combined
    const twelve = rows.find((r) => r[0] === "orvell-12")!;
    expect(twelve[col("measurement_count")]).toBe("2");
    expect(twelve[col("combined_count")]).toBe("1");
  });

  it("writes the reference values as a VOTable that is well-formed and valid against the VOTable 1.4 schema", async () => {
    // IVOA VOTable 1.4 Recommendation (2019-10-21): the standard's own XML schema, checked with libxml2 (xmllint-wasm)
    const xml = readText(out, "downloads/reference-table.vot");
    const result = await validateXML({ xml: [{ fileName: "reference-table.vot", contents: xml }], schema: [VOTABLE_SCHEMA] });
    expect(result.errors).toEqual([]);
    expect(result.valid).toBe(true);
    expect(xml).toBe(referenceTableVOTable(report, combinedIndex(report)));
    // one table per result, one row per object with a combined value of it; the hostile name is escaped
    const tables = [...xml.matchAll(/<TABLE name="([^"]+)" nrows="(\d+)">/g)].map((m) => [m[1], Number(m[2])]);
    const expected = new Map<string, number>();
    for (const o of report.objects) for (const [name, c] of Object.entries(o.combined)) if (c.estimate) expected.set(name, (expected.get(name) ?? 0) + 1);
    expect(tables).toEqual([...expected.entries()].sort((a, b) => (a[0] < b[0] ? -1 : 1)));
    expect(xml).toContain("<TD>&lt;script&gt;alert(1)&lt;/script&gt; Orvell 66 &quot;Q&quot; &amp; &apos;S&apos;</TD>");
    expect(xml).not.toContain("<script>");
  });

  it("writes one BibTeX entry per measurement, with balanced braces and escaped record text", () => {
    const bib = readText(out, "downloads/references.bib");
    const entries = bib.split(/\n(?=@)/).filter((e) => e.startsWith("@"));
    const measurements = report.objects.flatMap((o) => o.measurements.map((m) => `${o.id}:${m.key}`));
    expect(entries.map((e) => /^@misc\{([^,]+),/.exec(e)?.[1])).toEqual(measurements);
    for (const e of entries) {
      let depth = 0;
      for (const c of e.replace(/\\[{}]/g, "")) {
        if (c === "{") depth++;
        if (c === "}") depth--;
        expect(depth).toBeGreaterThanOrEqual(0);
      }
      expect(depth).toBe(0);
    }
    const hostile = entries.find((e) => e.includes("orvell-66:orbit-x"))!;
    expect(hostile).toContain("note = {</p><script>alert(3)</script> \\& Co \\textbraceleft{}2021\\textbraceright{} 50\\% \\#7; Table <1>}");
    expect(bib).toContain("doi = {10.5555/jia.2020.5.88}");
  });

  it("lists every registered method with its equations typeset", () => {
    const html = readText(out, "methods/index.html");
    for (const m of METHODS) {
      const start = html.indexOf(`id="method-${m.id}"`);
      expect(start, m.id).toBeGreaterThan(0);
      const end = html.indexOf('<section class="method"', start + 1);
      const section = html.slice(start, end < 0 ? undefined : end);
      expect(section.split('class="katex-display"').length - 1, m.id).toBe(m.equations.length);
      for (const i of m.inputs) expect(section).toContain(`<code>${i.field}</code>`);
      for (const r of m.results) expect(section).toContain(`<code>${r.name}</code>`);
    }
  });

  it("lists every constant with its value, uncertainty and defining standard", () => {
    const html = readText(out, "constants/index.html");
    const rows = startTags(html).filter((t) => t.name === "tr" && t.attributes.has("data-key"));
    expect(rows.map((t) => t.attributes.get("data-key"))).toEqual(ALL_CONSTANTS.map((c) => c.key));
    const text = textContent(html);
    // IAU 2012 Resolution B2: the astronomical unit is 149 597 870 700 m exactly
    expect(text).toMatch(/149597870700\s+exact/);
    // CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010): G = 6.674 30(15) × 10⁻¹¹ m³ kg⁻¹ s⁻²
    expect(text).toContain("6.6743 × 10⁻¹¹");
    expect(text).toContain("1.5 × 10⁻¹⁵");
    // IAU 2015 Resolution B3: nominal solar GM = 1.327 124 4 × 10²⁰ m³ s⁻² exactly
    expect(text).toContain("1.3271244 × 10²⁰");
    for (const c of ALL_CONSTANTS) expect(text).toContain(c.source);
  });

  it("links the downloads from the home page", () => {
    const home = startTags(readText(out, "index.html"));
    const hrefs = home.filter((t) => t.name === "a" && t.attributes.has("data-download")).map((t) => t.attributes.get("href"));
    expect(hrefs).toEqual([
      "/downloads/reference-table.csv",
      "/downloads/reference-table.json",
      "/downloads/reference-table.vot",
      "/downloads/audit.json",
      "/downloads/references.bib",
    ]);
    for (const h of hrefs) expect(listFiles(out)).toContain(h!.slice(1));
  });

  it("keeps the table usable without script and gives the script its hooks", () => {
    const home = readText(out, "index.html");
    const tags = startTags(home);
    expect(tags.find((t) => t.name === "table" && t.attributes.get("id") === "reference-table")).toBeDefined();
    expect(tags.find((t) => t.attributes.get("id") === "table-tools")!.attributes.has("hidden")).toBe(true);
    expect(tags.find((t) => t.name === "script")!.attributes.get("src")).toBe("/assets/table.js");
    expect(tags.find((t) => t.name === "script")!.attributes.has("defer")).toBe(true);
    const sortable = tags.filter((t) => t.name === "th" && t.attributes.has("data-sort-type")).map((t) => t.attributes.get("data-sort-key"));
    expect(sortable).toEqual(["object", "result", "recomputed", "z", "status", "method", "source", "measurements"]);
    // numeric sort keys: SI values and |z| exactly as in the report
    const nine = report.objects.find((o) => o.id === "orvell-9")!;
    const h = headlineOf(nine)!;
    expect(home).toContain(`data-sort="${h.result.value_si}"`);
    expect(home).toContain(`data-sort="${Math.abs(h.comparison!.z)}"`);
  });
});

describe("site built under a base path", () => {
  let out: string;
  let report: AuditReport;

  beforeAll(async () => {
    out = tempDir("base");
    ({ report } = await buildSite({ recordsDir: FIXTURE_RECORDS, outDir: out, basePath: "/sub/", quiet: true, audit: { draws: DRAWS } }));
  });

  it("starts every link and load inside the site with /sub/", () => {
    expect(checkLinks(out, report, "/sub/")).toEqual([]);
    const home = startTags(readText(out, "index.html"));
    const local = home
      .filter((t) => (t.name === "a" || t.name === "link" || t.name === "script") && (t.attributes.get("href") ?? t.attributes.get("src") ?? "#")[0] === "/")
      .map((t) => t.attributes.get("href") ?? t.attributes.get("src"));
    expect(local.length).toBeGreaterThan(10);
    for (const v of local) expect(v!.startsWith("/sub/")).toBe(true);
    expect(local).toContain("/sub/objects/orvell-9/");
    expect(local).toContain("/sub/assets/site.css");
  });

  it("still writes the pages at the output folder's root", () => {
    expect(listFiles(out)).toContain("objects/orvell-9/index.html");
    expect(listFiles(out)).not.toContain("sub/index.html");
  });
});

describe("site rendered from a report with values the loader would refuse", () => {
  let out: string;
  let report: AuditReport;

  beforeAll(async () => {
    const outcome = await buildSite({ recordsDir: FIXTURE_RECORDS, outDir: tempDir("plain"), quiet: true, audit: { draws: DRAWS } });
    // a report made elsewhere may carry what our loader refuses: the site must not trust it either
    const r = JSON.parse(JSON.stringify(outcome.report)) as { objects: Array<{ id: string; measurements: Array<Record<string, any>> }> };
    const five = r.objects.find((o) => o.id === "orvell-5-ab")!;
    five.measurements[0].reference = { cite: "Injected", url: "javascript:alert(7)", doi: "not a doi <x>" };
    const c = Object.values(five.measurements[0].comparisons as Record<string, { z: number }>)[0];
    c.z = Infinity;
    report = r as unknown as AuditReport;
    out = tempDir("injected");
    await renderSite({ report, outDir: out, quiet: true });
  });

  it("shows a javascript: URL and a malformed DOI as plain text, not as links", () => {
    const html = readText(out, "objects/orvell-5-ab/index.html");
    expect(html).toContain('<span class="not-linked">javascript:alert(7)</span>');
    expect(html).toContain('<span class="not-linked">not a doi &lt;x&gt;</span>');
    expect(checkLinks(out, report, "/")).toEqual([]);
  });

  it("refuses an object id that is not a slug rather than write a page outside objects/", async () => {
    const bad = { ...report, objects: [{ ...report.objects[0], id: "../escape" }] } as AuditReport;
    const dir = tempDir("escape");
    await expect(renderSite({ report: bad, outDir: path.join(dir, "site"), quiet: true })).rejects.toThrow(/not a slug/);
    expect(listFiles(dir).filter((f) => !f.startsWith("site/"))).toEqual([]);
  });

  it("prints an infinite z as ∞ on the page and leaves it empty in the CSV and null in JSON", () => {
    expect(readText(out, "objects/orvell-5-ab/index.html")).toMatch(/<td class="num">∞<\/td>/);
    const rows = parseCsv(readText(out, "downloads/reference-table.csv"));
    const row = rows.find((r) => r[0] === "orvell-5-ab")!;
    expect(row[rows[0].indexOf("z")]).toBe("");
    const table = JSON.parse(readText(out, "downloads/reference-table.json"));
    expect(table.rows.find((r: { object_id: string }) => r.object_id === "orvell-5-ab").z).toBeNull();
  });
});

describe("site built from the demo records", () => {
  let out: string;
  let report: AuditReport;

  beforeAll(async () => {
    out = tempDir("demo");
    ({ report } = await buildSite({ recordsDir: DEMO_RECORDS, outDir: out, quiet: true, audit: { draws: DRAWS } }));
  });

  it("has records to show", () => {
    expect(report.objects.length).toBeGreaterThan(0);
  });

  it("gives every demo object a page with typeset equations", () => {
    for (const o of report.objects) {
      const html = readText(out, `objects/${o.id}/index.html`);
      expect(html).toContain('class="katex"');
      expect(html).toContain(`data-id="${o.id}"`);
    }
  });

  it("loads nothing from outside the site", () => {
    expect(checkLinks(out, report, "/")).toEqual([]);
  });

  it("gives no two elements of a demo page the same id, with the reference values and likely causes in place", () => {
    for (const f of htmlFiles(out)) {
      const ids = startTags(readText(out, f)).flatMap((t) => (t.attributes.has("id") ? [t.attributes.get("id")!] : []));
      expect(ids.filter((id, i) => ids.indexOf(id) !== i), f).toEqual([]);
    }
  });

  /** The "likely causes" blocks of a page, in page order. */
  function causeBlocks(html: string): Array<{ result: string; unexplained: string; markup: string }> {
    return html
      .split('<section class="likely-causes"')
      .slice(1)
      .map((part) => {
        const markup = part.slice(0, part.indexOf("</section>"));
        const tag = startTags(`<section${markup}`)[0];
        return { result: tag.attributes.get("data-result")!, unexplained: tag.attributes.get("data-unexplained")!, markup };
      });
  }

  it("gives every flagged comparison a likely-causes block, with the reminder that it is a prompt, not a verdict", () => {
    let blocks = 0;
    for (const o of report.objects) {
      const html = readText(out, `objects/${o.id}/index.html`);
      const found = causeBlocks(html);
      const diagnoses = o.measurements.flatMap((m) => (m.diagnoses ?? []).map((d) => d.result));
      const flagged = o.measurements.flatMap((m) => Object.values(m.comparisons).filter((c) => c.status === "tension" || c.status === "discrepant"));
      expect(diagnoses.length, o.id).toBe(flagged.length);
      expect(found.map((b) => b.result), o.id).toEqual(diagnoses);
      for (const b of found) {
        expect(textContent(b.markup)).toMatch(/a prompt to reread the paper with that slip in mind, not a verdict on it/);
        // the slips tried sit in a collapsed list
        expect(b.markup).toMatch(/<details class="hypotheses-tried">\s*<summary>Slips tried \(\d+\)<\/summary>/);
      }
      blocks += found.length;
    }
    expect(blocks).toBeGreaterThan(5);
  });

  it("puts the full-amplitude slip first on skxs-58, before any other cause, with its numbers", () => {
    const obj = report.objects.find((o) => o.id === "skxs-58")!;
    const html = readText(out, "objects/skxs-58/index.html");
    const blocks = causeBlocks(html);
    expect(blocks.map((b) => b.result)).toEqual(["mass_function", "min_secondary_mass"]);
    for (const b of blocks) {
      const d = obj.measurements[0].diagnoses!.find((x) => x.result === b.result)!;
      const causes = startTags(b.markup).filter((t) => t.name === "li" && t.attributes.get("class") === "cause");
      expect(causes.map((t) => t.attributes.get("data-hypothesis"))).toEqual(d.explained.map((e) => e.hypothesis));
      expect(causes[0].attributes.get("data-hypothesis")).toBe("k-doubled");
      const text = textContent(b.markup);
      const first = text.indexOf("Full amplitude 2K used as K");
      expect(first).toBeGreaterThan(0);
      for (const other of d.explained.slice(1)) expect(text.indexOf(other.title, first + 1)).toBeGreaterThan(first);
      expect(text).toContain(d.explained[0].description);
      expect(text).toContain(`the slip alone multiplies the recomputed value by ${formatRatio(d.explained[0].slip_factor)}`);
      if (b.result === "mass_function") {
        // f(M) = P K³ (1 − e²)^{3/2} / (2πG): doubling K multiplies it by exactly 8
        expect(d.explained[0].slip_factor).toBeCloseTo(8, 12);
        expect(text).toContain("the slip alone multiplies the recomputed value by 8.0000");
      }
    }
  });

  it("says on skdl-76-ab that no single slip explains the tension", () => {
    const obj = report.objects.find((o) => o.id === "skdl-76-ab")!;
    const d = obj.measurements[0].diagnoses![0];
    expect(d.unexplained).toBe(true);
    const [block] = causeBlocks(readText(out, "objects/skdl-76-ab/index.html"));
    expect(block.unexplained).toBe("true");
    expect(block.markup).not.toContain('class="cause"');
    const text = textContent(block.markup);
    expect(text).toContain(d.summary);
    expect(text).toMatch(/No single slip of the \d+ tried reconciles the published value/);
  });

  it("shows quessel's reference value combined over its two measurements, with a forest chart of one row each", () => {
    const obj = report.objects.find((o) => o.id === "quessel")!;
    const c = obj.combined.total_mass;
    expect(c.count).toBe(2);
    const e = c.estimate!;
    const printed = `${formatWithSigma(e.value, e.sigma_plus, e.sigma_minus)}\u00a0${unitSymbol(e.display_unit)}`;
    const html = readText(out, "objects/quessel/index.html");
    const section = html.slice(html.indexOf('<section class="reference-value" id="reference-total_mass"'));
    expect(section.length).toBeLessThan(html.length);
    expect(decodeEntities(section)).toContain(`Combined value: <span class="combined-value">${printed}</span>`);
    // the weighted mean lies between the two recomputed values, nearer the one with the smaller σ
    const [a, b] = obj.measurements.map((m) => m.results.total_mass);
    expect(e.value_si).toBeGreaterThan(Math.min(a.value_si, b.value_si));
    expect(e.value_si).toBeLessThan(Math.max(a.value_si, b.value_si));
    const nearer = a.sigma_si < b.sigma_si ? a : b;
    const farther = nearer === a ? b : a;
    expect(Math.abs(e.value_si - nearer.value_si)).toBeLessThan(Math.abs(e.value_si - farther.value_si));
    const svg = section.slice(section.indexOf('<svg class="chart forest-chart"'), section.indexOf("</svg>") + 6);
    const rows = startTags(svg).filter((t) => t.name === "g" && (t.attributes.get("class") ?? "").startsWith("forest-row"));
    expect(rows.map((t) => t.attributes.get("data-key"))).toEqual(obj.measurements.map((m) => m.key));
    const band = startTags(svg).find((t) => t.attributes.get("class") === "forest-combined")!;
    expect(Number(band.attributes.get("data-value"))).toBeCloseTo(e.value, 12);
    // the home table shows the same combined value and says so
    const home = readText(out, "index.html");
    const row = home.slice(home.indexOf('data-id="quessel"'), home.indexOf("</tr>", home.indexOf('data-id="quessel"')));
    expect(decodeEntities(row)).toContain(`${printed}<span class="value-note">combined over 2</span>`);
    expect(printed).toBe(combinedValueText(c));
  });
});
