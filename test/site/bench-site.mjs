// Benchmark of the site build at scale: `node test/site/bench-site.mjs [OBJECTS] [OUT_DIR]`
// after `npm run compile`. It audits the demo records once, repeats their objects
// under new ids until there are OBJECTS of them, renders the site and prints the
// time, the bytes written and the peak memory. Not run by the test suite.
import { mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const { runAudit } = await import(path.join(root, "dist/audit/index.js"));
const { renderSite } = await import(path.join(root, "dist/site/build.js"));
const { katexTypesetCount } = await import(path.join(root, "dist/site/katex.js"));

const count = Number(process.argv[2] ?? 2000);
const keep = process.argv[3];
const out = keep ?? mkdtempSync(path.join(os.tmpdir(), "steelyard-bench-"));

const t0 = performance.now();
const demo = await runAudit(path.join(root, "content/records"), { draws: 2000 });
const t1 = performance.now();
const objects = [];
for (let i = 0; objects.length < count; i++) {
  const o = demo.objects[i % demo.objects.length];
  const copy = Math.floor(i / demo.objects.length);
  // every copy gets substituted equations of its own, as real objects have, so KaTeX's memo cannot help
  const measurements = o.measurements.map((m) => ({
    ...m,
    equations: m.equations.map((eq) => ({ ...eq, substituted: eq.substituted ? `${eq.substituted}\\qquad(${copy})` : "" })),
  }));
  objects.push({ ...o, id: `${o.id}-${copy}`, name: `${o.name} #${copy}`, measurements });
}
const report = { ...demo, objects, summary: { ...demo.summary, objects: objects.length } };

let peak = 0;
const timer = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 200);
const pages = await renderSite({ report, outDir: out, quiet: true });
const t2 = performance.now();
clearInterval(timer);

let bytes = 0;
let objectBytes = 0;
const walk = (dir) => {
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    const s = statSync(p);
    if (s.isDirectory()) walk(p);
    else {
      bytes += s.size;
      if (p.includes(`${path.sep}objects${path.sep}`)) objectBytes += s.size;
    }
  }
};
walk(out);
console.log(
  JSON.stringify(
    {
      objects: count,
      pages,
      audit_seconds: +((t1 - t0) / 1000).toFixed(2),
      render_seconds: +((t2 - t1) / 1000).toFixed(2),
      ms_per_page: +((t2 - t1) / pages).toFixed(2),
      katex_typesets: katexTypesetCount(),
      site_megabytes: +(bytes / 1e6).toFixed(1),
      mean_object_page_kilobytes: +(objectBytes / count / 1e3).toFixed(1),
      peak_rss_megabytes: Math.round(peak / 1e6),
    },
    null,
    1,
  ),
);
if (!keep) rmSync(out, { recursive: true, force: true });
