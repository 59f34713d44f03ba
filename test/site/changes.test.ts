import { copyFileSync, cpSync, existsSync, mkdtempSync, readFileSync, rmSync, unlinkSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AuditReport } from "../../src/audit/types.js";
import { main } from "../../src/cli.js";
import { readPreviousAudit } from "../../src/site/build.js";
import { changesView } from "../../src/site/changes-view.js";
import { combinedValueText } from "../../src/site/combined-view.js";
import { formatZ } from "../../src/site/display.js";
import { decodeEntities, listFiles, readText, startTags, textContent } from "./helpers/html-scan.js";

const ROOT = path.resolve(__dirname, "../..");
const FIXTURE = path.join(ROOT, "test/fixtures/site/releases");
const DRAWS = "100";

const temp: string[] = [];
function tempDir(label: string): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), `steelyard-changes-${label}-`));
  temp.push(dir);
  return dir;
}
afterAll(() => {
  for (const d of temp) rmSync(d, { recursive: true, force: true });
});

async function run(args: string[]) {
  let out = "";
  let err = "";
  const code = await main(args, { out: (t) => (out += t), err: (t) => (err += t) });
  return { code, out, err };
}

/** Replaces `from` by `to` in a record file, failing loudly when the text is not there. */
function edit(file: string, from: string, to: string): void {
  const text = readFileSync(file, "utf8");
  if (!text.includes(from)) throw new Error(`${file} does not contain ${JSON.stringify(from)}`);
  writeFileSync(file, text.replace(from, to));
}

const ADDED = `name: Orvell 43 AB
id: orvell-43-ab
measurements:
  - key: orbit-2024
    method: relative-orbit
    reference:
      cite: "Maddox 2024, J. Invented Astron. 9, 3"
    inputs:
      period: 20.0 ± 0.1 yr
      semimajor_axis: 8.0 ± 0.05 au
`;

/** The page's text with runs of white space as one space. */
const words = (html: string): string => textContent(html).replace(/\s+/g, " ");

const rowsOf = (html: string, tableId: string) => {
  const start = html.indexOf(`id="${tableId}"`);
  if (start < 0) return [];
  const table = html.slice(start, html.indexOf("</table>", start));
  return startTags(table).filter((t) => t.name === "tr" && t.attributes.has("data-id"));
};
const listOf = (html: string, sectionId: string) => {
  const start = html.indexOf(`<section id="${sectionId}"`);
  const section = html.slice(start, html.indexOf("</section>", start));
  return startTags(section).filter((t) => t.name === "li" && t.attributes.has("data-id")).map((t) => t.attributes.get("data-id"));
};

describe("changes since the previous release", () => {
  let work: string;
  let first: Awaited<ReturnType<typeof run>>;
  let second: Awaited<ReturnType<typeof run>>;
  let siteA: string;
  let siteB: string;
  let before: AuditReport;
  let after: AuditReport;
  let changes: string;

  beforeAll(async () => {
    work = tempDir("work");
    const recordsA = path.join(work, "records-a");
    const recordsB = path.join(work, "records-b");
    siteA = path.join(work, "site-a");
    siteB = path.join(work, "site-b");
    cpSync(FIXTURE, recordsA, { recursive: true });
    first = await run(["build", recordsA, "--out", siteA, "--draws", DRAWS, "--quiet"]);
    const saved = path.join(work, "previous-audit.json");
    copyFileSync(path.join(siteA, "downloads/audit.json"), saved);

    cpSync(recordsA, recordsB, { recursive: true });
    // a published value changed: 0.116 → 0.096 M☉ against a recomputed 0.1163 ± 0.0047 moves z from ≈0.06 to ≈5
    edit(path.join(recordsB, "orvell-41.yaml"), "mass_function: 0.116 ± 0.004 Msun", "mass_function: 0.096 ± 0.004 Msun");
    // an input changed in a measurement with no published value: the combined value moves, no status changes
    edit(path.join(recordsB, "orvell-40-ab.yaml"), "semimajor_axis: 10.010 ± 0.008 au", "semimajor_axis: 10.050 ± 0.008 au");
    unlinkSync(path.join(recordsB, "orvell-42-disc.yaml"));
    writeFileSync(path.join(recordsB, "orvell-43-ab.yaml"), ADDED);
    second = await run(["build", recordsB, "--out", siteB, "--draws", DRAWS, "--quiet", "--compare-to", saved]);

    before = JSON.parse(readText(siteA, "downloads/audit.json"));
    after = JSON.parse(readText(siteB, "downloads/audit.json"));
    changes = readText(siteB, "changes/index.html");
  });

  it("builds both releases; the second exits 1 because a result is now discrepant", () => {
    expect([first.code, first.err]).toEqual([0, ""]);
    expect([second.code, second.err]).toEqual([1, ""]);
    expect(before.objects.map((o) => o.id)).toEqual(["orvell-40-ab", "orvell-41", "orvell-42-disc"]);
    expect(after.objects.map((o) => o.id)).toEqual(["orvell-40-ab", "orvell-41", "orvell-43-ab"]);
  });

  it("adds no changes page, and no link to one, when no previous audit is given", () => {
    expect(listFiles(siteA)).not.toContain("changes/index.html");
    expect(readText(siteA, "index.html")).not.toContain("/changes/");
    expect(readText(siteA, "objects/orvell-41/index.html")).not.toContain("/changes/");
    expect(first.out).toMatch(/^Wrote 8 pages/);
    expect(second.out).toMatch(/^Wrote 9 pages/);
  });

  it("lists exactly the object added and the object removed", () => {
    expect(listOf(changes, "objects-added")).toEqual(["orvell-43-ab"]);
    expect(listOf(changes, "objects-removed")).toEqual(["orvell-42-disc"]);
    expect(changes).toContain('<a href="/objects/orvell-43-ab/">Orvell 43 AB</a>');
    expect(listFiles(siteB)).toContain("objects/orvell-43-ab/index.html");
    // the removed object has no page to link to, but keeps its name
    expect(textContent(changes)).toContain("Orvell 42 disc");
    expect(changes).not.toContain('href="/objects/orvell-42-disc/"');
  });

  it("lists exactly the reference value that moved, by how many σ", () => {
    const moved = rowsOf(changes, "moved-table");
    expect(moved.map((t) => [t.attributes.get("data-id"), t.attributes.get("data-result")])).toEqual([["orvell-40-ab", "total_mass"]]);
    // Kepler's third law at a fixed period: M ∝ a³, so the 2021 orbit's mass grows by (10.050 / 10.010)³
    const m2021 = (r: AuditReport) => r.objects[0].measurements.find((m) => m.key === "orbit-2021")!.results.total_mass.value_si;
    expect(m2021(after) / m2021(before)).toBeCloseTo((10.05 / 10.01) ** 3, 12);
    const b = before.objects[0].combined.total_mass.estimate!;
    const a = after.objects[0].combined.total_mass.estimate!;
    const shift = (a.value_si - b.value_si) / Math.hypot(a.sigma_si, b.sigma_si);
    expect(shift).toBeGreaterThan(1);
    const start = changes.indexOf('data-result="total_mass"');
    const row = decodeEntities(changes.slice(start, changes.indexOf("</tr>", start)));
    expect(row).toContain(`<td class="num">${combinedValueText(before.objects[0].combined.total_mass)}</td>`);
    expect(row).toContain(`<td class="num">${combinedValueText(after.objects[0].combined.total_mass)}</td>`);
    expect(row).toContain(`<td class="num">+${formatZ(shift)}</td>`);
    expect(row).toContain('href="/objects/orvell-40-ab/#reference-total_mass"');
    expect(listFiles(siteB)).toContain("objects/orvell-40-ab/index.html");
    expect(readText(siteB, "objects/orvell-40-ab/index.html")).toContain('id="reference-total_mass"');
  });

  it("lists exactly the status that changed, with words and markers", () => {
    const rows = rowsOf(changes, "status-changes");
    expect(rows.map((t) => ["id", "key", "before", "after"].map((k) => t.attributes.get(`data-${k}`)))).toEqual([
      ["orvell-41", "velocities-2020", "consistent", "discrepant"],
    ]);
    expect(changes).toContain('<span class="status status-discrepant"><span class="status-marker" aria-hidden="true">■</span> discrepant</span>');
    expect(changes).not.toContain('id="measurements-changed"');
    expect(changes).not.toContain('data-change="result-');
    expect(changes).not.toContain('id="settings-changes"');
  });

  it("sums the changes up on the home page and links the page from the home page and the navigation", () => {
    const home = readText(siteB, "index.html");
    expect(words(home)).toContain(
      "Compared with the audit in previous-audit.json : 1 object added, 1 object removed, 1 reference value moved, 1 status changed.",
    );
    const homeLinks = startTags(home).filter((t) => t.name === "a" && t.attributes.get("href") === "/changes/");
    expect(homeLinks).toHaveLength(2);
    const objectPage = startTags(readText(siteB, "objects/orvell-41/index.html"));
    expect(objectPage.filter((t) => t.name === "a" && t.attributes.get("href") === "/changes/")).toHaveLength(1);
    const nav = startTags(changes).find((t) => t.name === "a" && t.attributes.get("href") === "/changes/")!;
    expect(nav.attributes.get("aria-current")).toBe("page");
    expect(textContent(changes)).toMatch(/a prompt to look at what changed in the records or the sources, not a verdict/);
  });

  it("never prints the previous audit's full path on the site", () => {
    for (const f of listFiles(siteB).filter((x) => x.endsWith(".html"))) expect(readText(siteB, f), f).not.toContain(work);
  });

  it("shows a two-measurement reference value with the set-aside orbit drawn hollow and its reason", () => {
    const obj = before.objects.find((o) => o.id === "orvell-40-ab")!;
    const c = obj.combined.total_mass;
    expect(c.count).toBe(2);
    const html = readText(siteA, "objects/orvell-40-ab/index.html");
    expect(decodeEntities(html)).toContain(`Combined value: <span class="combined-value">${combinedValueText(c)}</span>`);
    const svg = html.slice(html.indexOf('<svg class="chart forest-chart"'), html.indexOf("</svg>", html.indexOf('<svg class="chart forest-chart"')));
    const rows = startTags(svg).filter((t) => t.name === "g" && (t.attributes.get("class") ?? "").startsWith("forest-row"));
    expect(rows.map((t) => [t.attributes.get("data-key"), t.attributes.get("data-used")])).toEqual([
      ["orbit-2015", "true"],
      ["orbit-2021", "true"],
      ["orbit-1999", "false"],
    ]);
    expect(svg).toContain(">orbit-1999 (not used)</text>");
    expect(words(html)).toContain("orbit-1999 : marked not to be used: Superseded by the 2015 orbit.");
    const home = readText(siteA, "index.html");
    expect(home).toContain('combined over 2</span>');
  });
});

describe("a previous audit that cannot be used", () => {
  let site: string;
  let outcome: Awaited<ReturnType<typeof run>>;
  let bad: string;

  beforeAll(async () => {
    const work = tempDir("bad");
    site = path.join(work, "site");
    bad = path.join(work, "not-an-audit.json");
    writeFileSync(bad, "{ this is not JSON");
    outcome = await run(["build", FIXTURE, "--out", site, "--draws", DRAWS, "--quiet", "--compare-to", bad]);
  });

  it("is reported on stderr with exit code 2, and the site is still written", () => {
    expect(outcome.code).toBe(2);
    expect(outcome.err).toMatch(/^steelyard: --compare-to: .*not-an-audit\.json is not valid JSON/);
    // three objects, the five site pages and the changes page that says why nothing was compared
    expect(outcome.out).toMatch(/^Wrote 9 pages/);
    expect(listFiles(site)).toContain("objects/orvell-41/index.html");
  });

  it("is shown on the changes page and the home page as a problem, by file name only", () => {
    const page = readText(site, "changes/index.html");
    expect(page).toContain('id="release-problems"');
    expect(page).toContain('data-code="not-json"');
    expect(textContent(page)).toContain("not-an-audit.json is not valid JSON");
    expect(page).not.toContain(path.dirname(bad));
    expect(page).not.toContain('id="moved-table"');
    const home = readText(site, "index.html");
    expect(words(home)).toMatch(/The previous audit not-an-audit\.json could not be read, so nothing was compared/);
  });

  it("gives located problems, not a crash, for a missing file and for JSON that is not an audit", () => {
    const dir = tempDir("foreign");
    const foreign = path.join(dir, "other.json");
    writeFileSync(foreign, JSON.stringify({ tool: { name: "something else", version: "1" }, objects: [] }));
    const current = JSON.parse(readText(site, "downloads/audit.json")) as AuditReport;
    const a = changesView(current, readPreviousAudit(foreign));
    expect(a.ok).toBe(false);
    expect(a.source).toBe("other.json");
    expect(a.problems.map((p) => p.path)).toEqual(["tool.name", "settings", "summary", "problems"]);
    expect(a.problems[0].message).toBe('other.json: tool.name should be "steelyard", found the text "something else"');
    expect(a.added).toEqual([]);
    const missing = path.join(dir, "gone.json");
    expect(existsSync(missing)).toBe(false);
    const b = changesView(current, readPreviousAudit(missing));
    expect(b.problems.map((p) => p.code)).toEqual(["cannot-read"]);
    expect(b.problems[0].message).toBe("cannot read gone.json: there is no such file");
  });

  it("is refused with check, which builds no changes page", async () => {
    const r = await run(["check", FIXTURE, "--compare-to", bad]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--compare-to is an option of build/);
  });
});
