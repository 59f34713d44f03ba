// How much the shape cache saves when typesetting substituted equations: the
// same equations, as the audit writes them for a generated catalogue, typeset
// by KaTeX directly and through the site's adapter (src/site/katex.ts), in one
// run, with the speed-up as a ratio. Also counts the distinct equation shapes
// of the demo records and of the catalogue.
//
//   npx tsc -p . && node bench/katex-shapes.mjs [--objects 1000] [--rounds 3] [--seed S] [--skip-check]
//
// The first pass through the adapter starts with an empty cache, so it pays
// for learning every shape (three KaTeX runs each); later passes find every
// shape known. KaTeX is warmed up before anything is timed; direct passes
// and warm adapter passes (five in a row, timed together) alternate, and the
// median of each is reported. Timings depend on what else the machine is
// doing: read the ratios, which come from one run. Unless --skip-check, every equation is then
// typeset both ways once more and the strings compared.
import katex from "katex";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { generateCatalogue } from "./generate.mjs";

const HERE = path.dirname(fileURLToPath(import.meta.url));
const ROOT = path.resolve(HERE, "..");

function parseArgs(argv) {
  const out = { objects: 1000, rounds: 3, seed: "1", check: true };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const next = () => {
      const v = argv[++i];
      if (v === undefined) throw new Error(`${a} needs a value`);
      return v;
    };
    if (a === "--objects") out.objects = Number(next());
    else if (a === "--rounds") out.rounds = Number(next());
    else if (a === "--seed") out.seed = next();
    else if (a === "--skip-check") out.check = false;
    else throw new Error(`unknown option ${a}; options: --objects N, --rounds N, --seed S, --skip-check`);
  }
  if (!Number.isInteger(out.objects) || out.objects < 1) throw new Error("--objects must be a positive whole number");
  if (!Number.isInteger(out.rounds) || out.rounds < 1) throw new Error("--rounds must be a positive whole number");
  return out;
}

async function importCompiled(rel) {
  try {
    return await import(path.join(ROOT, "dist", rel));
  } catch (error) {
    throw new Error(`cannot load dist/${rel} (${error.message}); compile first with: npx tsc -p .`);
  }
}

const { renderTex, katexCacheStats } = await importCompiled("site/katex.js");
const { texSkeleton } = await importCompiled("site/tex-skeleton.js");
const { runAudit } = await importCompiled("audit/run.js");

/** The options the adapter documents, with trust refused. */
const DIRECT_OPTIONS = { throwOnError: true, strict: "error", trust: false, output: "htmlAndMathml", displayMode: true };

/** Display-mode equations of every measurement, in page order. */
async function equationsOf(recordsDir) {
  const report = await runAudit(recordsDir, { draws: 0 });
  const general = [];
  const substituted = [];
  for (const o of report.objects) {
    for (const m of o.measurements) {
      for (const eq of m.equations) {
        general.push(eq.general);
        if (eq.substituted) substituted.push(eq.substituted);
      }
    }
  }
  return { objects: report.objects.length, general, substituted };
}

function shapeCount(texts) {
  return new Set(texts.map((t) => texSkeleton(t).skeleton)).size;
}

function seconds(fn) {
  const start = process.hrtime.bigint();
  fn();
  return Number(process.hrtime.bigint() - start) / 1e9;
}

function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

const options = parseArgs(process.argv.slice(2));

const demo = await equationsOf(path.join(ROOT, "content", "records"));
const folder = mkdtempSync(path.join(os.tmpdir(), "steelyard-katex-shapes-"));
let catalogue;
try {
  generateCatalogue(folder, options.objects, options.seed);
  catalogue = await equationsOf(folder);
} finally {
  rmSync(folder, { recursive: true, force: true });
}

const texts = catalogue.substituted;
let sink = 0;
const direct = () => {
  for (const t of texts) sink += katex.renderToString(t, DIRECT_OPTIONS).length;
};
const cached = () => {
  for (const t of texts) sink += renderTex(t, true).length;
};

// KaTeX itself warmed up first (on the demo's general forms, which the adapter has not seen),
// so that the first pass through the adapter is not also KaTeX's first run
for (const t of demo.general) sink += katex.renderToString(t, DIRECT_OPTIONS).length;
// the adapter with an empty cache: learns every shape
const coldSeconds = seconds(cached);
const learnt = katexCacheStats();
const directTimes = [];
const warmTimes = [];
/** A warm pass is short; it is run this many times in a row and timed as one, per round. */
const WARM_REPEATS = 5;
for (let r = 0; r < options.rounds; r++) {
  directTimes.push(seconds(direct));
  warmTimes.push(seconds(() => {
    for (let k = 0; k < WARM_REPEATS; k++) cached();
  }) / WARM_REPEATS);
}
const directSeconds = median(directTimes);
const warmSeconds = median(warmTimes);

let mismatched = 0;
if (options.check) {
  for (const t of texts) if (renderTex(t, true) !== katex.renderToString(t, DIRECT_OPTIONS)) mismatched++;
}

const rate = (s) => texts.length / s;
const stats = katexCacheStats();
const summary = {
  node: process.version,
  cores: os.cpus().length,
  catalogue: { objects: catalogue.objects, substituted_equations: texts.length, seed: options.seed },
  equations_per_second: {
    katex_direct: Math.round(rate(directSeconds)),
    shape_cache_cold: Math.round(rate(coldSeconds)),
    shape_cache_warm: Math.round(rate(warmSeconds)),
  },
  speed_up: {
    cold: Number((directSeconds / coldSeconds).toFixed(2)),
    warm: Number((directSeconds / warmSeconds).toFixed(2)),
  },
  rounds: options.rounds,
  seconds: { direct: directTimes, cold: coldSeconds, warm: warmTimes },
  katex_runs_while_learning: learnt.typesets,
  shapes: {
    demo_records: { objects: demo.objects, substituted: shapeCount(demo.substituted), with_general: shapeCount([...demo.general, ...demo.substituted]) },
    catalogue: { objects: catalogue.objects, substituted: shapeCount(catalogue.substituted), with_general: shapeCount([...catalogue.general, ...catalogue.substituted]) },
  },
  cache: {
    spliced_shapes: stats.splicedShapes,
    direct_shapes: stats.directShapes.map((s) => ({ reason: s.reason, skeleton: s.skeleton })),
    whole_strings_held: stats.memoEntries,
  },
  checked: options.check ? { equations: texts.length, mismatched } : "skipped",
};

process.stdout.write(
  [
    `substituted equations of ${catalogue.objects} generated objects: ${texts.length}`,
    `KaTeX directly:          ${summary.equations_per_second.katex_direct} equations/s`,
    `shape cache, first pass: ${summary.equations_per_second.shape_cache_cold} equations/s (${summary.speed_up.cold}× direct; ${learnt.typesets} KaTeX runs to learn ${learnt.splicedShapes + learnt.directShapes.length} shapes)`,
    `shape cache, warm:       ${summary.equations_per_second.shape_cache_warm} equations/s (${summary.speed_up.warm}× direct)`,
    `distinct shapes: demo records ${summary.shapes.demo_records.substituted} substituted (${summary.shapes.demo_records.with_general} with the general forms); ` +
      `catalogue ${summary.shapes.catalogue.substituted} substituted (${summary.shapes.catalogue.with_general} with the general forms)`,
    `shapes typeset directly each time: ${stats.directShapes.length}`,
    options.check ? `byte-identical to KaTeX: ${texts.length - mismatched} of ${texts.length}` : "comparison with KaTeX skipped",
    "",
    JSON.stringify(summary, null, 2),
    "",
  ].join("\n"),
);
if (sink < 0) process.stdout.write("unreachable\n");
if (mismatched > 0) process.exitCode = 1;
