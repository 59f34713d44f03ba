/**
 * The built demo site in a real browser (Debian's Chromium, headless): the
 * reference table's sorting and filtering, the table without JavaScript,
 * typeset equations with their fonts, the charts, a base path, a phone-width
 * viewport, the dark scheme, and full-page screenshots under test-artifacts/.
 *
 * Every context aborts and records any request to a host other than
 * 127.0.0.1, and every test ends by asserting that its context saw no
 * console error, page error, policy violation, failed request or 4xx/5xx.
 */
import katex from "katex";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AuditReport, Status } from "../../src/audit/types.js";
import { STATUSES } from "../../src/audit/types.js";
import { serveStatic, type StaticServer } from "../../src/serve/static-server.js";
import { buildSite, renderSite } from "../../src/site/build.js";
import type { TableRow } from "../../src/site/table.js";
import { compactKatex, katexClassMap, katexStylesheetPath } from "../../src/site/katex-compact.js";
import { katexStylesheet } from "../../src/site/katex-classes.js";
import { decodeEntities } from "../site/helpers/html-scan.js";
import { launchChromium, requireChromium } from "./helpers/chromium.js";
import { watchedContext } from "./helpers/context-watch.js";

const ROOT = path.resolve(__dirname, "../..");
const DEMO_RECORDS = path.join(ROOT, "content/records");
const ARTIFACTS = path.join(ROOT, "test-artifacts", "browser");
/** Fewer draws than the default keep the build short; the pages are the same shape at any count. */
const DRAWS = 2000;
const SUB = "/sub/";
/** The object the demo scenario makes discrepant on purpose. */
const DISCREPANT_ID = "skxs-58";
const LOCALE = "en-US";

let browser: Browser;
let report: AuditReport;
let rows: TableRow[];
let site: StaticServer;
/** Where the demo site was built (what `site` serves). */
let siteDir: string;
let subSite: StaticServer;
const temp: string[] = [];

beforeAll(async () => {
  // before the build, so a missing browser fails in a second with the install command
  requireChromium();
  const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-browser-"));
  temp.push(dir);
  const out = path.join(dir, "site");
  const subOut = path.join(dir, "site-sub");
  siteDir = out;
  const built = await buildSite({ recordsDir: DEMO_RECORDS, outDir: out, audit: { draws: DRAWS } });
  await renderSite({ report: built.report, outDir: subOut, basePath: SUB });
  // what the site offers for download, read back from the built files
  report = JSON.parse(readFileSync(path.join(out, "downloads/audit.json"), "utf8")) as AuditReport;
  rows = (JSON.parse(readFileSync(path.join(out, "downloads/reference-table.json"), "utf8")) as { rows: TableRow[] }).rows;
  site = await serveStatic(out);
  subSite = await serveStatic(subOut, { basePath: SUB });
  browser = await launchChromium();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await site?.close();
  await subSite?.close();
  for (const d of temp) rmSync(d, { recursive: true, force: true });
});

// ---------------------------------------------------------------- reading the pages

/** The table rows in page order, with what the tests look at. */
async function tableState(page: Page): Promise<Array<{ id: string; status: string; visible: boolean; cells: string[]; sort: string[] }>> {
  return page.$$eval("#reference-table tbody tr", (trs) =>
    trs.map((tr) => {
      const cells = Array.from((tr as HTMLTableRowElement).cells);
      return {
        id: tr.getAttribute("data-id") ?? "",
        status: tr.getAttribute("data-status") ?? "",
        visible: !(tr as HTMLElement).hidden && (tr as HTMLElement).getBoundingClientRect().height > 0,
        cells: cells.map((c) => (c.textContent ?? "").trim()),
        sort: cells.map((c) => c.getAttribute("data-sort") ?? ""),
      };
    }),
  );
}

/** Column positions in the home table, from its header keys. */
async function columnIndex(page: Page, key: string): Promise<number> {
  const keys = await page.$$eval("#reference-table thead th", (ths) => ths.map((th) => th.getAttribute("data-sort-key") ?? ""));
  const i = keys.indexOf(key);
  expect(i, `column ${key} in the table header`).toBeGreaterThanOrEqual(0);
  return i;
}

/** Stable sort of ids by a key; rows without a key go last in either direction (the table's documented rule). */
function expectedOrder<T>(items: Array<{ id: string; key: T | null }>, compare: (a: T, b: T) => number, descending: boolean): string[] {
  return items
    .map((item, index) => ({ ...item, index }))
    .sort((a, b) => {
      if (a.key === null || b.key === null) return Number(a.key === null) - Number(b.key === null) || a.index - b.index;
      const d = compare(a.key, b.key);
      return (descending ? -d : d) || a.index - b.index;
    })
    .map((item) => item.id);
}

async function sortButton(page: Page, key: string): Promise<void> {
  await page.click(`button.sort-button[data-sort-key="${key}"]`);
}

async function ariaSort(page: Page, key: string): Promise<string | null> {
  return page.getAttribute(`#reference-table thead th[data-sort-key="${key}"]`, "aria-sort");
}

async function openHome(page: Page, url: string = site.url): Promise<void> {
  const response = await page.goto(url, { waitUntil: "load" });
  expect(response?.status(), `status of ${url}`).toBe(200);
}

/** Object pages wait for their web fonts as well as for load. */
async function openObject(page: Page, id: string, base: StaticServer = site): Promise<void> {
  const response = await page.goto(`${base.url}objects/${id}/`, { waitUntil: "load" });
  expect(response?.status(), `status of the page of ${id}`).toBe(200);
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
}

function rowOf(id: string): TableRow {
  const row = rows.find((r) => r.object_id === id);
  if (!row) throw new Error(`no table row for ${id} in the downloads`);
  return row;
}

/** sRGB relative luminance and contrast ratio, WCAG 2.1 (W3C Recommendation, 2018), definitions of "relative luminance" and "contrast ratio". */
function relativeLuminance(css: string): number {
  const m = /^rgba?\((\d+),\s*(\d+),\s*(\d+)/.exec(css);
  if (!m) throw new Error(`not an rgb() colour: ${css}`);
  const lin = (v: number): number => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(Number(m[1])) + 0.7152 * lin(Number(m[2])) + 0.0722 * lin(Number(m[3]));
}
function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

/** Width and height from a PNG's IHDR chunk (PNG specification, ISO/IEC 15948:2004, section 11.2.2). */
function pngSize(png: Buffer): { width: number; height: number } {
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  expect(png.subarray(0, 8).equals(signature), "PNG signature").toBe(true);
  expect(png.subarray(12, 16).toString("latin1")).toBe("IHDR");
  return { width: png.readUInt32BE(16), height: png.readUInt32BE(20) };
}

/** The TeX of every equation on a built page, with its display mode, from KaTeX's annotations (unescaped). */
function pageEquations(html: string): Array<{ tex: string; displayMode: boolean }> {
  const out: Array<{ tex: string; displayMode: boolean }> = [];
  for (const m of html.matchAll(/<math xmlns="[^"]*"( display="block")?>.*?<annotation encoding="application\/x-tex">(.*?)<\/annotation>/g)) {
    out.push({ tex: decodeEntities(m[2]), displayMode: m[1] !== undefined });
  }
  return out;
}

/** A bare page of equations with the site's style sheet and a KaTeX sheet (the site's, or KaTeX's own beside it), by site path. */
function equationPage(equations: readonly string[], katexSheet: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><link rel="stylesheet" href="/assets/site.css"><link rel="stylesheet" href="/${katexSheet}"></head><body><main>${equations.map((e) => `<div class="equation-box">${e}</div>`).join("")}</main></body></html>`;
}

/** Every box under each equation's HTML part, in document order, relative to the page, in CSS pixels. */
async function equationBoxes(page: Page, url: string): Promise<number[][]> {
  const response = await page.goto(url, { waitUntil: "load" });
  expect(response?.status(), `status of ${url}`).toBe(200);
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  return page.$$eval(".katex-html, .katex-html *", (els) =>
    els.map((el) => {
      const r = el.getBoundingClientRect();
      return [r.left + window.scrollX, r.top + window.scrollY, r.width, r.height];
    }),
  );
}

// ---------------------------------------------------------------- tests

describe("the demo site in Chromium", () => {
  it("fails with the install command, rather than skipping, when Chromium is missing", () => {
    expect(() => requireChromium("/nonexistent/chromium")).toThrow("apt-get install -y chromium");
    expect(() => requireChromium()).not.toThrow();
  });

  it("builds a table row for every object of the demo report", () => {
    expect(rows.length).toBe(report.objects.length);
    expect(rowOf(DISCREPANT_ID).status).toBe("discrepant");
  });

  it("loads the home page with no console or page error, failed request or outside request", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    await page.evaluate(() => document.fonts.ready.then(() => undefined));
    expect(await page.title()).toContain("Reference table");
    // the table script ran: the tools are shown and the count filled in
    await expect.poll(() => page.isVisible("#table-tools")).toBe(true);
    expect((await page.textContent("#table-count"))?.trim()).toBe(`${rows.length} of ${rows.length} rows shown`);
    const origin = new URL(site.url).origin;
    expect(w.log.loaded).toContain(`${origin}/assets/site.css`);
    expect(w.log.loaded).toContain(`${origin}/assets/table.js`);
    // the policy is in force on the page (the control test below shows a violation would be caught)
    const policy = await page.getAttribute('meta[http-equiv="Content-Security-Policy"]', "content");
    expect(policy).toContain("default-src 'self'");
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("catches a policy violation and an outside request when one happens (control for the other tests)", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    const inlineRan = await page.evaluate(() => {
      const s = document.createElement("script");
      s.textContent = "document.documentElement.setAttribute('data-inline-ran', 'yes')";
      document.head.appendChild(s);
      return document.documentElement.getAttribute("data-inline-ran") === "yes";
    });
    expect(inlineRan, "the site's policy blocks inline scripts").toBe(false);
    await expect.poll(() => w.log.policyViolations.length).toBeGreaterThan(0);
    expect(w.log.policyViolations[0]).toMatch(/^script-src/);
    await expect.poll(() => w.log.consoleErrors.some((e) => /Content Security Policy/i.test(e))).toBe(true);
    // a request to another host is aborted and recorded (.invalid is reserved by RFC 2606)
    await page.goto("http://outside.invalid/").catch(() => undefined);
    expect(w.log.outsideRequests).toContain("http://outside.invalid/");
    expect(w.problems().length).toBeGreaterThanOrEqual(3);
    await w.context.close();
  });

  it("sorts a numeric column ascending, then descending on a second click", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    const initial = await tableState(page);
    expect(initial.map((r) => r.id)).toEqual(rows.map((r) => r.object_id));
    expect(await ariaSort(page, "z")).toBe("none");

    // |z| from the JSON download; rows without a comparison have none and go last
    const byZ = rows.map((r) => ({ id: r.object_id, key: r.z === null ? null : Math.abs(r.z) }));
    const ascending = expectedOrder(byZ, (a, b) => a - b, false);
    expect(ascending).not.toEqual(initial.map((r) => r.id));
    await sortButton(page, "z");
    const zColumn = await columnIndex(page, "z");
    let state = await tableState(page);
    expect(state.map((r) => r.id)).toEqual(ascending);
    expect(await ariaSort(page, "z")).toBe("ascending");
    const shownZ = state.map((r) => r.sort[zColumn]).filter((s) => s !== "").map(Number);
    for (let i = 1; i < shownZ.length; i++) expect(shownZ[i]).toBeGreaterThanOrEqual(shownZ[i - 1]);
    // the row with the largest |z| is a discrepant one
    expect(state[shownZ.length - 1].status).toBe("discrepant");

    await sortButton(page, "z");
    state = await tableState(page);
    expect(state.map((r) => r.id)).toEqual(expectedOrder(byZ, (a, b) => a - b, true));
    expect(await ariaSort(page, "z")).toBe("descending");
    expect(state[0].status).toBe("discrepant");

    // the mass column sorts by the SI value, whatever unit each row is shown in; each key is
    // the row's recomputed or combined value from the JSON download
    const massColumn = await columnIndex(page, "recomputed");
    const byMass = initial.map((r, i) => {
      const key = Number(r.sort[massColumn]);
      const row = rows[i];
      expect([row.recomputed_si, row.combined_si], `mass sort key of ${r.id}`).toContain(key);
      return { id: r.id, key };
    });
    const massAscending = expectedOrder(byMass, (a, b) => a - b, false);
    expect(massAscending).not.toEqual(initial.map((r) => r.id));
    await sortButton(page, "recomputed");
    state = await tableState(page);
    expect(state.map((r) => r.id)).toEqual(massAscending);
    expect(await ariaSort(page, "recomputed")).toBe("ascending");
    expect(await ariaSort(page, "z")).toBe("none");
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("sorts a text column alphabetically", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    const sourceColumn = await columnIndex(page, "source");
    const initial = await tableState(page);
    const bySource = initial.map((r) => ({ id: r.id, key: r.cells[sourceColumn].toLowerCase() }));
    const collate = (a: string, b: string): number => a.localeCompare(b, LOCALE);
    const ascending = expectedOrder(bySource, collate, false);
    expect(ascending, "the demo sources are not already in order").not.toEqual(initial.map((r) => r.id));

    await sortButton(page, "source");
    let state = await tableState(page);
    expect(state.map((r) => r.id)).toEqual(ascending);
    const texts = state.map((r) => r.cells[sourceColumn].toLowerCase());
    for (let i = 1; i < texts.length; i++) expect(collate(texts[i - 1], texts[i])).toBeLessThanOrEqual(0);

    await sortButton(page, "source");
    state = await tableState(page);
    expect(state.map((r) => r.id)).toEqual(expectedOrder(bySource, collate, true));
    expect(await ariaSort(page, "source")).toBe("descending");
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("filters rows by a fragment of a name and says how many are shown", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    for (const fragment of ["Velmar", "skeb"]) {
      const expected = rows.filter((r) => r.object_name.toLowerCase().includes(fragment.toLowerCase())).map((r) => r.object_id);
      expect(expected.length, `demo objects named like ${fragment}`).toBeGreaterThan(0);
      expect(expected.length).toBeLessThan(rows.length);
      await page.fill("#table-filter", fragment);
      const state = await tableState(page);
      expect(state.filter((r) => r.visible).map((r) => r.id)).toEqual(expected);
      expect(state.filter((r) => !r.visible).length).toBe(rows.length - expected.length);
      expect((await page.textContent("#table-count"))?.trim()).toBe(`${expected.length} of ${rows.length} rows shown`);
    }
    await page.fill("#table-filter", "");
    expect((await tableState(page)).every((r) => r.visible)).toBe(true);
    expect((await page.textContent("#table-count"))?.trim()).toBe(`${rows.length} of ${rows.length} rows shown`);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("filters rows by status, matching the report's count of objects with that worst status", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    const options = await page.$$eval("#table-status option", (os) => os.map((o) => (o as HTMLOptionElement).value));
    expect(options[0], "the first choice shows every status").toBe("");
    expect([...options].sort()).toEqual(["", ...STATUSES].sort());
    const perStatus = (s: Status): number => report.objects.filter((o) => o.status === s).length;
    expect(perStatus("discrepant"), "the demo has discrepant objects").toBeGreaterThan(0);
    for (const s of STATUSES) {
      await page.selectOption("#table-status", s);
      const visible = (await tableState(page)).filter((r) => r.visible);
      expect(visible.length, `rows shown for ${s}`).toBe(perStatus(s));
      for (const r of visible) expect(r.status).toBe(s);
      expect((await page.textContent("#table-count"))?.trim()).toBe(`${perStatus(s)} of ${rows.length} rows shown`);
      // and the summary table on the same page agrees
      const summary = await page.textContent(`#status-counts tr[data-status="${s}"] td`);
      expect(Number(summary?.trim())).toBe(perStatus(s));
    }
    // the status and the text filter combine
    await page.selectOption("#table-status", "discrepant");
    await page.fill("#table-filter", rowOf(DISCREPANT_ID).object_name);
    const both = (await tableState(page)).filter((r) => r.visible).map((r) => r.id);
    expect(both).toEqual([DISCREPANT_ID]);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("shows every row without JavaScript, and no tools that would need it", async () => {
    const w = await watchedContext(browser, { locale: LOCALE, javaScriptEnabled: false });
    const page = await w.context.newPage();
    await openHome(page);
    const state = await tableState(page);
    expect(state.map((r) => r.id)).toEqual(rows.map((r) => r.object_id));
    expect(state.every((r) => r.visible)).toBe(true);
    expect(await page.isVisible("#table-tools")).toBe(false);
    expect(await page.$$("button.sort-button")).toHaveLength(0);
    // the object links work as plain links
    await page.click(`#reference-table tr[data-id="${DISCREPANT_ID}"] th a`);
    await page.waitForURL(`${site.url}objects/${DISCREPANT_ID}/`);
    expect((await page.textContent("h1"))?.trim()).toBe(rowOf(DISCREPANT_ID).object_name);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  const twoMeasurementId = (): string => {
    const row = rows.find((r) => r.measurement_count === 2);
    if (!row) throw new Error("the demo has no object with two measurements");
    return row.object_id;
  };

  it.each([
    ["a discrepant object", () => DISCREPANT_ID],
    ["an object with two measurements", twoMeasurementId],
  ])("renders the equations and charts of %s", async (_label, pick) => {
    const id = pick();
    const row = rowOf(id);
    const obj = report.objects.find((o) => o.id === id);
    if (!obj) throw new Error(`no object ${id} in audit.json`);
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openObject(page, id);

    expect(await page.getAttribute("#object", "data-status")).toBe(obj.status);
    expect(await page.$$("section.measurement")).toHaveLength(row.measurement_count);
    expect(await page.isVisible(".caveat")).toBe(true);
    expect(await page.textContent(".caveat")).toContain("prompt to reread the source, not a verdict");

    // typeset equations: KaTeX markup with real size, in KaTeX's own font
    const boxes = await page.$$eval(".katex", (els) => els.map((e) => e.getBoundingClientRect()).map((r) => [r.width, r.height]));
    const equations = await page.$$(".equation-general .katex-display");
    expect(equations.length).toBeGreaterThanOrEqual(row.measurement_count);
    expect(boxes.length).toBeGreaterThanOrEqual(equations.length);
    for (const [width, height] of boxes) {
      expect(width).toBeGreaterThan(0);
      expect(height).toBeGreaterThan(0);
    }
    expect(await page.$$(".katex-mathml math")).toHaveLength(boxes.length);
    const fonts = await page.evaluate(() =>
      Array.from(document.fonts)
        .filter((f) => f.status === "loaded")
        .map((f) => f.family.replace(/["']/g, "")),
    );
    expect(fonts).toContain("KaTeX_Main");
    expect(await page.evaluate(() => document.fonts.check("16px KaTeX_Main"))).toBe(true);
    const origin = new URL(site.url).origin;
    expect(w.log.loaded.some((u) => u.startsWith(`${origin}/assets/katex/fonts/KaTeX_Main-`))).toBe(true);
    expect(await page.$eval(".katex", (e) => getComputedStyle(e).fontFamily)).toContain("KaTeX_Main");

    // one budget chart per result and a comparison chart per compared result, all drawn
    const resultCount = obj.measurements.reduce((n, m) => n + Object.keys(m.results).length, 0);
    const comparedCount = obj.measurements.reduce((n, m) => n + Object.keys(m.comparisons).filter((k) => k in m.results).length, 0);
    const charts = await page.$$eval(".budget-chart, .comparison-chart", (els) =>
      els.map((e) => ({ cls: e.getAttribute("class") ?? "", box: e.getBoundingClientRect(), shown: getComputedStyle(e).visibility === "visible" })),
    );
    expect(charts.filter((c) => c.cls.includes("budget-chart"))).toHaveLength(resultCount);
    expect(charts.filter((c) => c.cls.includes("comparison-chart"))).toHaveLength(comparedCount);
    expect(comparedCount).toBeGreaterThan(0);
    for (const c of charts) {
      expect(c.shown).toBe(true);
      expect(c.box.width).toBeGreaterThan(0);
      expect(c.box.height).toBeGreaterThan(0);
    }
    // the chart of the headline result carries the same published value as the table download
    const headline = `#measurement-${row.measurement}-${row.result}`;
    const published = await page.getAttribute(`${headline} .comparison-chart g[data-series="published"]`, "data-value");
    expect(row.published).not.toBeNull();
    expect(Number(published)).toBe(row.published);
    // shares of the first-order variance add up to one (up to rounding of the sum)
    const shares = (await page.$$eval(`${headline} .budget-chart g[data-share]`, (gs) => gs.map((g) => Number(g.getAttribute("data-share"))))) as number[];
    expect(shares.length).toBeGreaterThan(0);
    expect(shares.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 9);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("works under a base path: stylesheet, script, fonts and object links all load", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page, subSite.url);
    const origin = new URL(subSite.url).origin;
    expect(subSite.url).toBe(`${origin}${SUB}`);
    expect(w.log.loaded).toContain(`${origin}${SUB}assets/site.css`);
    const rules = await page.evaluate(() =>
      Array.from(document.styleSheets).map((s) => ({ href: s.href ?? "", rules: s.cssRules.length })),
    );
    expect(rules.find((s) => s.href.endsWith(`${SUB}assets/site.css`))?.rules ?? 0).toBeGreaterThan(0);
    await expect.poll(() => page.isVisible("#table-tools")).toBe(true);
    // every local address on the page starts with the base path
    const local = await page.$$eval("[href], [src]", (els) =>
      els.map((e) => e.getAttribute("href") ?? e.getAttribute("src") ?? "").filter((v) => v.startsWith("/")),
    );
    expect(local.length).toBeGreaterThan(rows.length);
    expect(local.filter((v) => !v.startsWith(SUB))).toEqual([]);

    const first = rows[0];
    await page.click(`#reference-table tr[data-id="${first.object_id}"] th a`);
    await page.waitForURL(`${subSite.url}objects/${first.object_id}/`);
    await page.evaluate(() => document.fonts.ready.then(() => undefined));
    expect((await page.textContent("h1"))?.trim()).toBe(first.object_name);
    expect(w.log.loaded).toContain(`${origin}${SUB}${katexStylesheetPath()}`);
    expect(w.log.loaded.some((u) => u.startsWith(`${origin}${SUB}assets/katex/fonts/`))).toBe(true);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("fits a phone-width screen: only tables scroll sideways, each inside its own box", async () => {
    const w = await watchedContext(browser, { locale: LOCALE, viewport: { width: 375, height: 800 } });
    const page = await w.context.newPage();
    for (const open of [() => openHome(page), () => openObject(page, DISCREPANT_ID)]) {
      await open();
      const m = await page.evaluate(() => {
        const viewport = document.documentElement.clientWidth;
        // elements that reach past the right edge without a scrolling box around them
        const sticking: string[] = [];
        for (const el of Array.from(document.body.querySelectorAll("*"))) {
          const box = el.getBoundingClientRect();
          if (box.width === 0 || box.right <= viewport + 0.5) continue;
          let up = el.parentElement;
          let contained = false;
          while (up && up !== document.body) {
            if (getComputedStyle(up).overflowX !== "visible") contained = true;
            up = up.parentElement;
          }
          const parentSticks = el.parentElement !== null && el.parentElement.getBoundingClientRect().right > viewport + 0.5;
          if (!contained && !parentSticks) {
            sticking.push(`${el.tagName.toLowerCase()}${el.id ? "#" + el.id : ""}${el.className && typeof el.className === "string" ? "." + el.className.split(" ").join(".") : ""} reaches ${Math.round(box.right)} px`);
          }
        }
        const table = document.querySelector("#reference-table, table.inputs") as HTMLElement | null;
        const wrapper = table?.closest(".table-scroll") as HTMLElement | null;
        return {
          path: location.pathname,
          viewport,
          page: document.documentElement.scrollWidth,
          body: document.body.scrollWidth,
          sticking,
          table: table ? table.scrollWidth : -1,
          wrapper: wrapper ? wrapper.clientWidth : -1,
          wrapperOverflow: wrapper ? getComputedStyle(wrapper).overflowX : "",
        };
      });
      expect(m.viewport).toBe(375);
      expect(m.sticking, `elements wider than the phone on ${m.path}`).toEqual([]);
      expect(m.page, `page width of ${m.path}`).toBeLessThanOrEqual(m.viewport);
      expect(m.body, `body width of ${m.path}`).toBeLessThanOrEqual(m.viewport);
      // a wide table scrolls in its own box rather than widening the page
      expect(m.wrapper).toBeGreaterThan(0);
      expect(m.wrapper).toBeLessThanOrEqual(m.viewport);
      expect(m.wrapperOverflow).toBe("auto");
    }
    // on the home page the table is wider than the phone, so the checks above are not empty
    await openHome(page);
    expect(await page.$eval("#reference-table", (t) => t.scrollWidth)).toBeGreaterThan(375);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("follows the dark colour scheme, keeping the body text readable in both", async () => {
    const w = await watchedContext(browser, { locale: LOCALE });
    const page = await w.context.newPage();
    await openHome(page);
    const colours = async (): Promise<{ bg: string; fg: string; dark: boolean }> =>
      page.evaluate(() => ({
        bg: getComputedStyle(document.body).backgroundColor,
        fg: getComputedStyle(document.body).color,
        dark: matchMedia("(prefers-color-scheme: dark)").matches,
      }));
    await page.emulateMedia({ colorScheme: "light" });
    const light = await colours();
    await page.emulateMedia({ colorScheme: "dark" });
    const dark = await colours();
    expect(light.dark).toBe(false);
    expect(dark.dark).toBe(true);
    expect(dark.bg).not.toBe(light.bg);
    expect(relativeLuminance(dark.bg)).toBeLessThan(relativeLuminance(light.bg));
    // WCAG 2.1 (W3C, 2018) success criterion 1.4.3: at least 4.5:1 for body text
    expect(contrastRatio(light.fg, light.bg)).toBeGreaterThanOrEqual(4.5);
    expect(contrastRatio(dark.fg, dark.bg)).toBeGreaterThanOrEqual(4.5);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("lays out the compacted equations of an object page box for box as KaTeX's own output", async () => {
    const built = readFileSync(path.join(siteDir, "objects", DISCREPANT_ID, "index.html"), "utf8");
    const equations = pageEquations(built);
    expect(equations.length).toBeGreaterThan(10);
    const raw = equations.map(({ tex, displayMode }) =>
      katex.renderToString(tex, { displayMode, throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" }),
    );
    const compact = raw.map(compactKatex);
    // the page holds exactly the compacted strings, and they are smaller
    compact.forEach((c, i) => expect(built.includes(c), equations[i].tex).toBe(true));
    expect(compact.join("").length).toBeLessThan(0.9 * raw.join("").length);
    // a control: one thin space made a medium one (by its class) must show in the boxes
    const k = (name: string): string => katexClassMap().get(name)!;
    const altered = compact.map((c) => c.replace(`class="${k("mspace")} ${k("margin-right:.1667em")}"`, `class="${k("mspace")} ${k("margin-right:.2222em")}"`));
    expect(altered.join("")).not.toBe(compact.join(""));
    // KaTeX's raw output is laid out with KaTeX's own sheet, put beside the site's copy (whose fonts it shares)
    writeFileSync(path.join(siteDir, "assets", "katex", "katex.min.css"), katexStylesheet());
    const pages = { raw, compact, altered };
    for (const [name, eqs] of Object.entries(pages)) {
      mkdirSync(path.join(siteDir, "layout-check", name), { recursive: true });
      writeFileSync(path.join(siteDir, "layout-check", name, "index.html"), equationPage(eqs, name === "raw" ? "assets/katex/katex.min.css" : katexStylesheetPath()));
    }
    const w = await watchedContext(browser, { locale: LOCALE, viewport: { width: 1600, height: 900 } });
    const page = await w.context.newPage();
    const boxes: Record<string, number[][]> = {};
    for (const name of Object.keys(pages)) boxes[name] = await equationBoxes(page, `${site.url}layout-check/${name}/`);
    expect(boxes.raw.length).toBeGreaterThan(500);
    expect(boxes.compact).toEqual(boxes.raw);
    expect(boxes.altered.length).toBe(boxes.raw.length);
    expect(boxes.altered).not.toEqual(boxes.raw);
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });

  it("saves full-page screenshots of the home page and of an object page", async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    const viewport = { width: 1280, height: 720 };
    const w = await watchedContext(browser, { locale: LOCALE, viewport });
    const page = await w.context.newPage();
    const shots: Array<[string, () => Promise<void>]> = [
      ["home.png", () => openHome(page)],
      [`object-${DISCREPANT_ID}.png`, () => openObject(page, DISCREPANT_ID)],
    ];
    for (const [name, open] of shots) {
      await open();
      const file = path.join(ARTIFACTS, name);
      rmSync(file, { force: true });
      const png = await page.screenshot({ fullPage: true, animations: "disabled" });
      writeFileSync(file, png);
      const size = pngSize(readFileSync(file));
      expect(size.width).toBe(viewport.width);
      // full page: taller than the window, as tall as the document
      const docHeight = await page.evaluate(() => document.documentElement.scrollHeight);
      expect(size.height).toBeGreaterThan(viewport.height);
      expect(size.height).toBe(docHeight);
    }
    expect(w.problems()).toEqual([]);
    await w.context.close();
  });
});
