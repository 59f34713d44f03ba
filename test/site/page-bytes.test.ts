import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { runAudit } from "../../src/audit/index.js";
import type { AuditReport } from "../../src/audit/types.js";
import { renderTex } from "../../src/site/katex.js";
import { PageBytes } from "../../src/site/page-bytes.js";
import { createPageRenderer } from "../../src/site/page-render.js";

/**
 * Object pages are written as bytes put together from encoded equation
 * templates; they must be the bytes of the page rendered as text, encoded
 * whole (Node's own UTF-8 encoder is the reference).
 */

const DEMO = path.resolve(__dirname, "../../content/records");
const INCLUDES = path.resolve(__dirname, "../../content/_includes");
let report: AuditReport;

beforeAll(async () => {
  report = await runAudit(DEMO, { draws: 400 });
});

describe("object pages as bytes", () => {
  it("are the UTF-8 bytes of the page rendered as text, for every demo object", () => {
    const render = createPageRenderer(INCLUDES, { basePath: "/", version: "test", settings: report.settings, hasChanges: false });
    expect(report.objects.length).toBeGreaterThan(20);
    for (const obj of report.objects) {
      const text = render.text({ obj, problems: [] });
      expect(text).toContain('class="katex-display"');
      expect(Buffer.from(render.bytes({ obj, problems: [] })).equals(Buffer.from(text, "utf8")), obj.id).toBe(true);
    }
  });

  it("fall back to the text when a record's own text holds a placeholder", () => {
    const assembler = new PageBytes();
    const render = createPageRenderer(INCLUDES, { basePath: "/", version: "test", settings: report.settings, hasChanges: false }, assembler);
    const obj = report.objects.find((o) => o.measurements.length > 0)!;
    assembler.begin();
    const odd = { ...obj, name: `${obj.name} ${assembler.displayEquation("x = 1")}` };
    const text = render.text({ obj: odd, problems: [] });
    expect(text).toContain("\ue000");
    expect(Buffer.from(render.bytes({ obj: odd, problems: [] })).equals(Buffer.from(text, "utf8"))).toBe(true);
  });
});

describe("PageBytes", () => {
  const TEX = ["M = \\frac{4\\pi^{2}a^{3}}{GP^{2}} = 1.23\\times10^{30}", "M = \\frac{4\\pi^{2}a^{3}}{GP^{2}} = 4.56\\times10^{29}", "x_{σ} = 7"];

  it("puts each equation where its placeholder was, with the bytes renderTex gives", () => {
    const pb = new PageBytes();
    pb.begin();
    const marks = TEX.map((t) => pb.displayEquation(t));
    const page = `<p>é ${marks[0]} – ${marks[1]}</p>${marks[2]}\n`;
    const expected = `<p>é ${renderTex(TEX[0], true)} – ${renderTex(TEX[1], true)}</p>${renderTex(TEX[2], true)}\n`;
    expect(Buffer.from(pb.assemble(page)!).toString("utf8")).toBe(expected);
  });

  it("gives a repeating equation the same bytes on every page, the first included", () => {
    const pb = new PageBytes();
    const tex = "M = \\frac{4\\pi^{2}a^{3}}{GP^{2}}\\;(\\text{new shape } 31)";
    for (let page = 0; page < 3; page++) {
      pb.begin();
      const page1 = `<p>${pb.displayEquation(tex, true)}</p>${pb.displayEquation(TEX[0])}`;
      expect(Buffer.from(pb.assemble(page1)!).toString("utf8")).toBe(`<p>${renderTex(tex, true)}</p>${renderTex(TEX[0], true)}`);
    }
  });

  it("refuses a page whose placeholders are missing, repeated, out of order or from another page", () => {
    const pb = new PageBytes();
    pb.begin();
    const [a, b] = TEX.slice(0, 2).map((t) => pb.displayEquation(t));
    expect(pb.assemble(`${a}`)).toBeUndefined();
    expect(pb.assemble(`${a}${a}${b}`)).toBeUndefined();
    expect(pb.assemble(`${a}${b}${b}`)).toBeUndefined();
    expect(pb.assemble(`${b}${a}`)).toBeUndefined();
    expect(pb.assemble(`${a}${b}`)).toBeDefined();
    pb.begin();
    expect(pb.assemble(`${a}`)).toBeUndefined();
    expect(new PageBytes().assemble(`${a}`)).toBeDefined(); // another writer's tag is only text to it
  });

  it("grows its buffer for a page larger than it", () => {
    const pb = new PageBytes();
    pb.begin();
    const mark = pb.displayEquation(TEX[0]);
    const filler = "ü".repeat(1 << 20);
    const out = pb.assemble(filler + mark + filler);
    expect(Buffer.from(out!).toString("utf8")).toBe(filler + renderTex(TEX[0], true) + filler);
  });
});
