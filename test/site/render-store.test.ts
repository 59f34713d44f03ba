import { katexReference } from "./helpers/katex-reference.js";
import { execFileSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it, vi } from "vitest";
import { listFiles } from "./helpers/html-scan.js";
import { tempDirs } from "./helpers/temp-dirs.js";

const ROOT = path.resolve(__dirname, "../..");
const DEMO = path.join(ROOT, "content/records");
const CLI = path.join(ROOT, "bin/steelyard.js");
const REFERENCE_OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml" } as const;

const tempDir = tempDirs("steelyard-render-store");

type Adapter = typeof import("../../src/site/katex.js");
type Store = typeof import("../../src/site/render-store.js");
type Templates = typeof import("../../src/site/compiled-templates.js");

/** A fresh KaTeX adapter and store, as a new process has them: no shape known. */
async function freshModules(): Promise<{ k: Adapter; store: Store; t: Templates }> {
  vi.resetModules();
  const k = await import("../../src/site/katex.js");
  const store = await import("../../src/site/render-store.js");
  const t = await import("../../src/site/compiled-templates.js");
  return { k, store, t };
}

const shape = (a: string, p: string) => `\\mathcal{G}M = \\frac{4\\pi^{2}\\,\\left(${a}\\,\\mathrm{AU}\\right)^{3}}{\\left(${p}\\,\\mathrm{yr}\\right)^{2}}`;
const GENERAL = "M_{\\mathrm{tot}} = \\frac{a^{n}}{P^{m}}"; // no number in it: one KaTeX run

describe("the equation shapes and compiled templates kept between builds", () => {
  it("lets a new process splice a known shape without running KaTeX, with KaTeX's own bytes", async () => {
    const cacheDir = tempDir("keep");
    const first = await freshModules();
    const loaded = first.store.loadRenderStore(cacheDir);
    expect(loaded.known.size).toBe(0);
    first.k.renderTex(shape("1.496", "3.156"), true);
    first.k.renderTex(GENERAL, true);
    expect(first.k.katexTypesetCount()).toBe(4); // the equation, its skeleton and its probe; the general form once
    expect(first.store.saveRenderStore(loaded)).toBe(true);

    const second = await freshModules();
    const again = second.store.loadRenderStore(cacheDir);
    expect(again.known.size).toBe(2);
    const numbers: Array<[string, string]> = [
      ["2.5", "4.1"],
      ["123.456", "0.000789"],
    ];
    for (const [a, p] of numbers) {
      expect(second.k.renderTex(shape(a, p), true)).toBe(katexReference(shape(a, p), { ...REFERENCE_OPTIONS, displayMode: true }));
    }
    expect(second.k.renderTex(GENERAL, true)).toBe(katexReference(GENERAL, { ...REFERENCE_OPTIONS, displayMode: true }));
    expect(second.k.katexTypesetCount()).toBe(0);
    // nothing new: the file is left alone
    expect(second.store.saveRenderStore(again)).toBe(false);
    // a new shape is added to what the file held
    second.k.renderTex("a = 1", false);
    expect(second.store.saveRenderStore(again)).toBe(true);
    const third = await freshModules();
    expect(third.store.loadRenderStore(cacheDir).known.size).toBe(3);
  });

  it("ignores a file written under another key, or whose shapes do not match their digest", async () => {
    const cacheDir = tempDir("refuse");
    const a = await freshModules();
    const store = a.store.loadRenderStore(cacheDir);
    a.k.renderTex(GENERAL, true);
    a.store.saveRenderStore(store);
    const good = JSON.parse(readFileSync(store.file, "utf8")) as { key: string; digest: string; shapes: Array<{ pieces: string[] }>; templates: unknown[] };

    // another tool or KaTeX version
    writeFileSync(store.file, JSON.stringify({ ...good, key: "0".repeat(40) }));
    let b = await freshModules();
    expect(b.store.loadRenderStore(cacheDir).known.size).toBe(0);
    expect(b.k.renderTex(GENERAL, true)).toBe(katexReference(GENERAL, { ...REFERENCE_OPTIONS, displayMode: true }));
    expect(b.k.katexTypesetCount()).toBe(1);

    // a changed piece under the old digest
    const changed = { ...good, shapes: good.shapes.map((s) => ({ ...s, pieces: s.pieces.map((p) => p.replace("katex", "other")) })) };
    writeFileSync(store.file, JSON.stringify(changed));
    b = await freshModules();
    expect(b.store.loadRenderStore(cacheDir).known.size).toBe(0);

    // not JSON at all
    writeFileSync(store.file, "{ half a file");
    b = await freshModules();
    expect(b.store.loadRenderStore(cacheDir).known.size).toBe(0);
    expect(b.k.renderTex(GENERAL, true)).toBe(katexReference(GENERAL, { ...REFERENCE_OPTIONS, displayMode: true }));
  });

  it("renders a template from its kept code as from its text, and compiles it only once per text", async () => {
    const dir = tempDir("templates");
    const file = path.join(dir, "t.njk");
    writeFileSync(file, "{% for x in xs %}<li>{{ x | upper }}</li>\n{% endfor %}{% include 'p.njk' %}");
    writeFileSync(path.join(dir, "p.njk"), "<p>{{ xs | length }} & {{ '<b>' }}</p>");
    const options = { autoescape: true, trimBlocks: true, lstripBlocks: true, throwOnUndefined: false };
    const nunjucks = (await import("nunjucks")).default;
    const plain = new nunjucks.Environment(new nunjucks.FileSystemLoader(dir), options).getTemplate("t.njk", true).render({ xs: ["a", "b<"] });
    expect(plain).toContain("&lt;b&gt;");

    const a = await freshModules();
    const rendered = new nunjucks.Environment(a.t.compiledTemplateLoader(dir, options), options).getTemplate("t.njk", true).render({ xs: ["a", "b<"] });
    expect(rendered).toBe(plain);
    const kept = a.t.takeLearnedTemplates();
    expect(kept).toHaveLength(2);
    expect(a.t.takeLearnedTemplates()).toEqual([]);

    // a new thread or process given the code compiles nothing
    const b = await freshModules();
    expect(b.t.importTemplates(kept)).toBe(2);
    const again = new nunjucks.Environment(b.t.compiledTemplateLoader(dir, options), options).getTemplate("t.njk", true).render({ xs: ["a", "b<"] });
    expect(again).toBe(plain);
    expect(b.t.takeLearnedTemplates()).toEqual([]);
    // an edited template is another key: compiled anew, and the page follows the edit
    writeFileSync(path.join(dir, "p.njk"), "<p>{{ xs | first }}</p>");
    const edited = new nunjucks.Environment(b.t.compiledTemplateLoader(dir, options), options).getTemplate("t.njk", true).render({ xs: ["a", "b<"] });
    expect(edited).toBe(new nunjucks.Environment(new nunjucks.FileSystemLoader(dir), options).getTemplate("t.njk", true).render({ xs: ["a", "b<"] }));
    expect(edited).toContain("<p>a</p>");
    expect(b.t.takeLearnedTemplates()).toHaveLength(1);
  });

  it("refuses shapes that are not well formed", async () => {
    const { k } = await freshModules();
    const skeleton = k.exportShapes();
    expect(skeleton).toEqual([]);
    expect(
      k.importShapes([
        { key: "Xa = 1", pieces: ["<b>"], slots: [] }, // no display mode
        { key: "Da = 9000000008", pieces: ["<b>", "</b>"], slots: [1] }, // a marker index the skeleton does not have
        { key: "Db = 9000000008", pieces: ["<b>"], slots: [0] }, // one piece too few
        { key: "Dc = 9000000008", pieces: ["<b>", "</b>"], slots: [0] },
      ]),
    ).toBe(1);
    expect(k.exportShapes().map((s) => s.key)).toEqual(["Dc = 9000000008"]);
  });

  it("gives the same site from a process that reads the kept shapes as from one built without any cache", () => {
    const plain = tempDir("plain-site");
    execFileSync(process.execPath, [CLI, "build", DEMO, "--out", plain, "--no-cache", "--exit-zero", "--quiet", "--draws", "300"]);
    const cacheDir = tempDir("cli-cache");
    const first = tempDir("first-site");
    execFileSync(process.execPath, [CLI, "build", DEMO, "--out", first, "--cache-dir", cacheDir, "--exit-zero", "--quiet", "--draws", "300"]);
    const kept = JSON.parse(readFileSync(path.join(cacheDir, "render-store.json"), "utf8")) as { shapes: unknown[]; templates: unknown[] };
    expect(kept.shapes.length).toBeGreaterThan(20);
    // the object page, its layout and the partials it and the home rows include
    expect(kept.templates.length).toBeGreaterThanOrEqual(4);
    // another output folder: every page is rendered again, in a new process, from the kept shapes
    const second = tempDir("second-site");
    execFileSync(process.execPath, [CLI, "build", DEMO, "--out", second, "--cache-dir", cacheDir, "--exit-zero", "--quiet", "--draws", "300"]);
    const files = listFiles(plain);
    expect(files.length).toBeGreaterThan(40);
    expect(listFiles(second)).toEqual(files);
    for (const f of files) {
      const want = readFileSync(path.join(plain, f));
      expect(readFileSync(path.join(first, f)).equals(want), f).toBe(true);
      expect(readFileSync(path.join(second, f)).equals(want), f).toBe(true);
    }
  });
});
