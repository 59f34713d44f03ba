// Catalogue-scale benchmark of `steelyard check` and `steelyard build`, side by
// side with a bare Eleventy build of the same number of pages.
//
//   npm run bench -- --objects 1000,10000          (compiles first)
//   node bench/run.mjs --objects 1000 --runs 3 --steps check,build
//
// Every measurement is its own child process, so time and peak memory (max RSS)
// belong to that step alone. Results go to bench/results/ as JSON (git-ignored).
import { spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, lstatSync, mkdirSync, mkdtempSync, openSync, closeSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { generateCatalogue } from "./generate.mjs";
import { editOnePublishedValue } from "./edit-record.mjs";
import { BASELINE_CONFIG, prepareBaselineInput } from "./baseline/items.mjs";

const HERE = path.dirname(fileURLToPath(import.meta.url));
const ROOT = path.resolve(HERE, "..");
const CLI = path.join(ROOT, "bin", "steelyard.js");
const ELEVENTY = path.join(ROOT, "node_modules", "@11ty", "eleventy", "cmd.cjs");

export const STEPS = Object.freeze(["check", "build", "rebuild-edit", "rebuild-same", "baseline"]);

const STEP_TEXT = {
  check: "check --json, default draws unless --draws",
  build: "full build into an empty folder, with an empty cache",
  "rebuild-edit": "rebuild into the same folder and cache after one published value changed",
  "rebuild-same": "rebuild into the same folder and cache, nothing changed",
  baseline: "bare Eleventy, same page count, empty folder",
};

const USAGE = `usage: node bench/run.mjs [options]
  --objects N,N,...   catalogue sizes (default 1000,10000)
  --runs N            repetitions of each step; medians are reported (default 3)
  --steps a,b,...     any of ${STEPS.join(", ")} (default all)
  --skip-baseline     leave out the bare Eleventy build
  --draws N           Monte Carlo draws for check and build (default: the tool's own)
  --seed S            catalogue seed (default 1)
  --keep              keep the generated catalogues and sites (paths are printed)
  --out FILE          results file (default bench/results/<time>.json, copied to latest.json)
`;

// ---------------------------------------------------------------------------
// Options

export function parseOptions(argv) {
  const o = { objects: [1000, 10000], runs: 3, steps: [...STEPS], draws: undefined, seed: "1", keep: false, out: undefined };
  const problems = [];
  const value = (i, name) => {
    const v = argv[i + 1];
    if (v === undefined || v.startsWith("--")) problems.push(`${name} needs a value`);
    return v;
  };
  for (let i = 0; i < argv.length; i++) {
    let arg = argv[i];
    let inline;
    if (arg.startsWith("--") && arg.includes("=")) [arg, inline] = [arg.slice(0, arg.indexOf("=")), arg.slice(arg.indexOf("=") + 1)];
    const take = () => (inline !== undefined ? inline : value(i++, arg));
    switch (arg) {
      case "--objects": {
        const list = String(take() ?? "").split(",").map((s) => Number(s.trim()));
        if (list.length === 0 || list.some((n) => !Number.isInteger(n) || n < 1)) problems.push("--objects needs whole numbers ≥ 1, e.g. 1000,10000");
        else o.objects = list;
        break;
      }
      case "--runs": {
        const n = Number(take());
        if (!Number.isInteger(n) || n < 1) problems.push("--runs needs a whole number ≥ 1");
        else o.runs = n;
        break;
      }
      case "--steps": {
        const list = String(take() ?? "").split(",").map((s) => s.trim()).filter(Boolean);
        const bad = list.filter((s) => !STEPS.includes(s));
        if (bad.length || list.length === 0) problems.push(`--steps takes ${STEPS.join(", ")}; got ${bad.join(", ") || "nothing"}`);
        else o.steps = STEPS.filter((s) => list.includes(s));
        break;
      }
      case "--draws": {
        const n = Number(take());
        if (!Number.isInteger(n) || n < 0) problems.push("--draws needs a whole number ≥ 0");
        else o.draws = n;
        break;
      }
      case "--seed":
        o.seed = String(take());
        break;
      case "--out":
        o.out = path.resolve(String(take()));
        break;
      case "--skip-baseline":
        o.skipBaseline = true;
        break;
      case "--keep":
        o.keep = true;
        break;
      case "--help":
        o.help = true;
        break;
      default:
        problems.push(`unknown option ${argv[i]}`);
    }
  }
  if (o.skipBaseline) o.steps = o.steps.filter((s) => s !== "baseline");
  if (o.steps.length === 0) problems.push("no step left to run");
  return problems.length ? { ok: false, problems } : { ok: true, value: o };
}

// ---------------------------------------------------------------------------
// Peak memory of a child: GNU time's %M where it works, else VmHWM polled from /proc

function gnuTimeWorks() {
  if (!existsSync("/usr/bin/time")) return false;
  const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-probe-"));
  try {
    const file = path.join(dir, "rss");
    const r = spawnSync("/usr/bin/time", ["-f", "%M", "-o", file, process.execPath, "-e", "0"], { stdio: "ignore" });
    return r.status === 0 && /^\d+\s*$/.test(readFileSync(file, "utf8"));
  } catch {
    return false;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function readHighWater(pid) {
  try {
    const m = /VmHWM:\s+(\d+)\s*kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Runs `node args...` in ROOT with stdout to `stdoutFile` (or /dev/null) and
 * stderr to `stderrFile`; resolves to { seconds, peakKB, code, signal }.
 */
/**
 * Flushes the files earlier steps wrote to disk before a step starts, so that
 * a step does not pay for the write-back of the one before it (a build at
 * 10,000 objects writes about 1.7 GB).
 */
function settleDisk() {
  spawnSync("sync", [], { stdio: "ignore" });
}

function measure(args, { probe, stdoutFile, stderrFile, nodeFlags = [] }) {
  settleDisk();
  return new Promise((resolve) => {
    const out = openSync(stdoutFile ?? "/dev/null", "w");
    const err = openSync(stderrFile, "w");
    const rssFile = `${stderrFile}.rss`;
    const command = probe === "gnu-time" ? "/usr/bin/time" : process.execPath;
    const argv = probe === "gnu-time"
      ? ["-f", "%M", "-o", rssFile, process.execPath, ...nodeFlags, ...args]
      : [...nodeFlags, ...args];
    const started = performance.now();
    const child = spawn(command, argv, { cwd: ROOT, stdio: ["ignore", out, err] });
    let polled = 0;
    const timer = probe === "proc-status"
      ? setInterval(() => {
          const kb = readHighWater(child.pid);
          if (kb !== undefined && kb > polled) polled = kb;
        }, 25)
      : undefined;
    child.on("exit", (code, signal) => {
      const seconds = (performance.now() - started) / 1000;
      if (timer) clearInterval(timer);
      closeSync(out);
      closeSync(err);
      let peakKB = polled || undefined;
      if (probe === "gnu-time") {
        try {
          // GNU time writes "Command exited with non-zero status N" before the number when the child fails
          const m = /(\d+)\s*$/.exec(readFileSync(rssFile, "utf8"));
          peakKB = m ? Number(m[1]) : undefined;
        } catch {
          peakKB = undefined;
        }
      }
      resolve({ seconds, peakKB, code, signal });
    });
  });
}

// ---------------------------------------------------------------------------
// Which code ran: a hash of every file under dist/ and of the site's templates,
// taken around every run, so that a run straddling a recompile says so.

/** Full paths of the files under `dir`, in name order within each folder; links are not followed. */
function* filesIn(dir) {
  if (!existsSync(dir)) return;
  const entries = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  for (const e of entries) {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) yield* filesIn(full);
    else if (e.isFile()) yield full;
  }
}

function hashTree(hash, dir, base) {
  for (const full of filesIn(dir)) {
    hash.update(path.relative(base, full) + "\0");
    hash.update(readFileSync(full));
  }
}

export function codeFingerprint() {
  const hash = createHash("sha256");
  for (const sub of ["dist", "content/_includes", "bin"]) hashTree(hash, path.join(ROOT, sub), ROOT);
  for (const file of readdirSync(path.join(ROOT, "content")).filter((f) => f.endsWith(".njk")).sort()) {
    hash.update(file + "\0");
    hash.update(readFileSync(path.join(ROOT, "content", file)));
  }
  return hash.digest("hex").slice(0, 16);
}

// ---------------------------------------------------------------------------
// Statistics

export function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  if (n === 0) return NaN;
  return n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

/** Least-squares line y = intercept + slope x. */
export function linearFit(points) {
  const n = points.length;
  if (n < 2) return undefined;
  const mx = points.reduce((s, p) => s + p.x, 0) / n;
  const my = points.reduce((s, p) => s + p.y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.x - mx) ** 2;
    sxy += (p.x - mx) * (p.y - my);
  }
  if (sxx === 0) return undefined;
  const slope = sxy / sxx;
  return { slope, intercept: my - slope * mx };
}

// ---------------------------------------------------------------------------
// One size

/** Whether this build has a cache of its own (`--cache-dir`); older ones always build from scratch. */
function buildHasCache() {
  const r = spawnSync(process.execPath, [CLI, "--help"], { cwd: ROOT, encoding: "utf8" });
  return r.status === 0 && r.stdout.includes("--cache-dir");
}

function stepArgs(step, { records, site, cache, baselineIn, baselineOut, draws }) {
  const drawArgs = draws === undefined ? [] : ["--draws", String(draws)];
  // the cache lives in the work folder, never in the checkout's own .cache/
  const cacheArgs = cache ? ["--cache-dir", cache] : [];
  switch (step) {
    case "check":
      return [CLI, "check", records, "--json", ...drawArgs];
    case "build":
    case "rebuild-edit":
    case "rebuild-same":
      return [CLI, "build", records, "--out", site, "--exit-zero", "--quiet", ...drawArgs, ...cacheArgs];
    case "baseline":
      return [ELEVENTY, `--config=${BASELINE_CONFIG}`, `--input=${baselineIn}`, `--output=${baselineOut}`, "--quiet"];
    default:
      throw new Error(`no step ${step}`);
  }
}

/** Exit codes that mean the step did its work: check exits 1 when something is discrepant, by design. */
const GOOD_CODES = { check: [0, 1] };

async function runSize(n, options, probe, cached, log) {
  const work = mkdtempSync(path.join(os.tmpdir(), `steelyard-bench-${n}-`));
  const records = path.join(work, "records");
  const site = path.join(work, "site");
  const baselineIn = path.join(work, "baseline-input");
  const baselineOut = path.join(work, "baseline-site");
  const logs = path.join(work, "logs");
  const cache = cached ? path.join(work, "cache") : undefined;
  mkdirSync(logs);
  const paths = { records, site, cache, baselineIn, baselineOut, draws: options.draws };
  // Outputs a step needs gone are moved aside, never deleted while runs are measured: on a disk
  // mounted with online discard (this machine's ext4), deleting ten thousand files slows the
  // runs after it, more with every deletion (bench/README.md). The work folder goes at the end.
  const trash = path.join(work, "set-aside");
  mkdirSync(trash);
  let setAside = 0;
  const moveAside = (dir) => {
    if (existsSync(dir)) renameSync(dir, path.join(trash, `${path.basename(dir)}-${++setAside}`));
  };
  const clearSite = () => {
    moveAside(site);
    if (cache) moveAside(cache);
  };

  const t0 = performance.now();
  const catalogue = generateCatalogue(records, n, options.seed);
  log(`  generated ${n} records (${catalogue.measurements} measurements, ${(catalogue.bytes / 1024).toFixed(0)} KB) in ${((performance.now() - t0) / 1000).toFixed(1)} s: ${records}`);
  if (options.steps.includes("baseline")) prepareBaselineInput(baselineIn, n);

  let counter = 0;
  const once = async (step, prepare) => {
    if (prepare) prepare();
    const name = `${step}-${++counter}`;
    // the baseline runs none of our code
    const ours = step !== "baseline";
    const codeBefore = ours ? codeFingerprint() : "n/a";
    const r = await measure(stepArgs(step, paths), {
      probe,
      stderrFile: path.join(logs, `${name}.err`),
      stdoutFile: step === "check" ? undefined : path.join(logs, `${name}.out`),
    });
    const good = (GOOD_CODES[step] ?? [0]).includes(r.code);
    if (!good) {
      const tail = readFileSync(path.join(logs, `${name}.err`), "utf8").split("\n").slice(-30).join("\n");
      const why = r.code === 2 ? " (exit 2: some records have problems; `node bin/steelyard.js check DIR` lists them)" : "";
      throw new Error(`${step} at ${n} objects failed (exit ${r.code}${r.signal ? `, signal ${r.signal}` : ""})${why}; ` +
        `the catalogue and logs are kept in ${work}; its error output ends:\n${tail}`);
    }
    const codeAfter = ours ? codeFingerprint() : "n/a";
    if (codeAfter !== codeBefore) log(`  warning: the compiled code or the templates changed during this ${step} run; it mixes two versions`);
    return { ...r, code_version: codeBefore === codeAfter ? codeBefore : `${codeBefore}→${codeAfter}` };
  };

  // Rounds: run k of every step, in the order of the steps, then run k + 1. The machine's speed
  // drifts over minutes; in rounds each step's runs spread over the same minutes as the
  // baseline's, so the ratios compare runs made under the same conditions.
  let siteBytes;
  const runsOf = Object.fromEntries(options.steps.map((step) => [step, []]));
  for (const { step, run: k } of roundOrder(options.steps, options.runs)) {
    // a rebuild needs a site in place: build one, unmeasured, when no full build ran before
    if ((step === "rebuild-edit" || step === "rebuild-same") && !existsSync(path.join(site, "index.html"))) {
      log(`  (building once, unmeasured, so that ${step} has a site to rebuild)`);
      await once("build", clearSite);
    }
    let before;
    let edit;
    // a full build starts from nothing: no site and no cache
    if (step === "build") before = clearSite;
    if (step === "baseline") before = () => moveAside(baselineOut);
    if (step === "rebuild-edit") before = () => { edit = editOnePublishedValue(records, 1); };
    const r = await once(step, before);
    runsOf[step].push({ seconds: r.seconds, peak_kb: r.peakKB ?? null, exit_code: r.code, code_version: r.code_version, ...(edit ? { edited: path.relative(records, edit.file) } : {}) });
    log(`  ${step.padEnd(12)} run ${k + 1}/${options.runs}: ${r.seconds.toFixed(2)} s, ${r.peakKB ? (r.peakKB / 1024).toFixed(0) + " MB" : "memory unknown"}`);
    // the site of the first full build, before a rebuild step changes it (later ones differ only in the edited values)
    if (step === "build" && siteBytes === undefined) siteBytes = siteSize(site);
  }
  const steps = {};
  for (const step of options.steps) {
    const runs = runsOf[step];
    const versions = new Set(runs.map((r) => r.code_version));
    if (versions.size > 1) log(`  warning: the ${step} runs ran ${versions.size} versions of the code (${[...versions].join(", ")}); their spread is not noise alone`);
    const secs = runs.map((r) => r.seconds);
    const peaks = runs.map((r) => r.peak_kb).filter((x) => typeof x === "number");
    steps[step] = {
      what: STEP_TEXT[step],
      runs,
      median_s: median(secs),
      min_s: Math.min(...secs),
      max_s: Math.max(...secs),
      peak_mb: peaks.length ? Math.max(...peaks) / 1024 : null,
      code_versions: [...versions],
    };
  }

  if (options.keep) log(`  kept: ${work}`);
  return { work, objects: n, measurements: catalogue.measurements, record_bytes: catalogue.bytes, scenarios: catalogue.scenarios, intended: catalogue.intended, steps, ...(siteBytes ? { site: siteBytes } : {}), ...(options.keep ? { work_dir: work } : {}) };
}

/** The order of the measured runs: run 0 of every step in the order given, then run 1, and so on. */
export function roundOrder(steps, runs) {
  const out = [];
  for (let run = 0; run < runs; run++) for (const step of steps) out.push({ step, run });
  return out;
}

// ---------------------------------------------------------------------------
// Report

function tableRows(results) {
  const rows = [];
  for (const size of results.sizes) {
    const base = size.steps.baseline?.median_s;
    for (const [step, s] of Object.entries(size.steps)) {
      rows.push({
        size: String(size.objects),
        step,
        median: s.median_s.toFixed(2),
        min: s.min_s.toFixed(2),
        max: s.max_s.toFixed(2),
        peak: s.peak_mb === null ? "?" : s.peak_mb.toFixed(0),
        msPerObject: ((s.median_s * 1000) / size.objects).toFixed(2),
        kbPerObject: s.peak_mb === null ? "?" : ((s.peak_mb * 1024) / size.objects).toFixed(1),
        ratio: base ? (s.median_s / base).toFixed(2) : "-",
      });
    }
  }
  return rows;
}

/** Bytes and count of the files under `dir` (links are not followed), and of those under its objects/ folder. */
export function siteSize(dir) {
  const objects = path.join(dir, "objects") + path.sep;
  const out = { bytes: 0, files: 0, object_page_bytes: 0, object_pages: 0 };
  for (const full of filesIn(dir)) {
    const size = lstatSync(full).size;
    out.bytes += size;
    out.files++;
    if (full.startsWith(objects)) {
      out.object_page_bytes += size;
      out.object_pages++;
    }
  }
  return out;
}

export function formatTable(results) {
  const head = { size: "objects", step: "step", median: "median s", min: "min s", max: "max s", peak: "peak MB", msPerObject: "ms/object", kbPerObject: "KB/object", ratio: "÷ baseline" };
  const rows = [head, ...tableRows(results)];
  const keys = Object.keys(head);
  const width = Object.fromEntries(keys.map((k) => [k, Math.max(...rows.map((r) => r[k].length))]));
  const line = (r) => keys.map((k, i) => (i < 2 ? r[k].padEnd(width[k]) : r[k].padStart(width[k]))).join("  ");
  const out = [line(head), keys.map((k) => "-".repeat(width[k])).join("  "), ...rows.slice(1).map(line)];
  if (results.fits && Object.keys(results.fits).length) {
    out.push("", "Linear fit of median time against objects, across sizes:");
    for (const [step, f] of Object.entries(results.fits)) {
      const sign = f.intercept_s < 0 ? "−" : "+";
      out.push(`  ${step.padEnd(12)} ${f.slope_ms_per_object.toFixed(3)} ms/object ${sign} ${Math.abs(f.intercept_s).toFixed(2)} s`);
    }
  }
  const sized = results.sizes.filter((s) => s.site);
  if (sized.length) {
    out.push("", "Site written by the full build (bytes, so a change in page size shows):");
    for (const s of sized) {
      const { bytes, files, object_page_bytes: pageBytes, object_pages: pages } = s.site;
      out.push(`  ${String(s.objects).padEnd(7)} ${(bytes / 1e6).toFixed(1)} MB in ${files} files; object pages ${(pageBytes / 1e6).toFixed(1)} MB, ${pages ? (pageBytes / pages / 1000).toFixed(1) : "-"} KB each`);
    }
  }
  return out.join("\n");
}

function fits(sizes) {
  const out = {};
  if (sizes.length < 2) return out;
  for (const step of STEPS) {
    const points = sizes.filter((s) => s.steps[step]).map((s) => ({ x: s.objects, y: s.steps[step].median_s }));
    const f = linearFit(points);
    if (f) out[step] = { slope_ms_per_object: f.slope * 1000, intercept_s: f.intercept, sizes: points.map((p) => p.x) };
  }
  return out;
}

function machine() {
  const cpus = os.cpus();
  return {
    cpus: cpus.length,
    cpu_model: cpus[0]?.model ?? "unknown",
    total_memory_mb: Math.round(os.totalmem() / 1024 / 1024),
    node: process.version,
    platform: `${os.platform()} ${os.release()} ${os.arch()}`,
  };
}

function gitCommit() {
  const r = spawnSync("git", ["rev-parse", "--short", "HEAD"], { cwd: ROOT, encoding: "utf8" });
  if (r.status !== 0) return null;
  const dirty = spawnSync("git", ["status", "--porcelain", "--untracked-files=no"], { cwd: ROOT, encoding: "utf8" });
  return r.stdout.trim() + (dirty.stdout?.trim() ? " (with uncommitted changes)" : "");
}

// ---------------------------------------------------------------------------
// Main

async function main(argv) {
  const parsed = parseOptions(argv);
  if (!parsed.ok) {
    process.stderr.write(parsed.problems.map((p) => `bench: ${p}\n`).join("") + USAGE);
    return 2;
  }
  const options = parsed.value;
  if (options.help) {
    process.stdout.write(USAGE);
    return 0;
  }
  if (!existsSync(path.join(ROOT, "dist", "cli.js"))) {
    process.stderr.write("bench: dist/ is missing; run `npm run compile` (or `npm run bench`, which compiles first)\n");
    return 2;
  }
  const probe = gnuTimeWorks() ? "gnu-time" : existsSync("/proc/self/status") ? "proc-status" : "none";
  const cached = buildHasCache();
  const log = (t) => process.stdout.write(t + "\n");
  const started = new Date();
  const codeAtStart = codeFingerprint();
  log(`steelyard benchmark: sizes ${options.objects.join(", ")}; ${options.runs} run(s) per step; steps ${options.steps.join(", ")}; memory from ${probe}; ${cached ? "build cache per size, emptied before each full build" : "no build cache"}`);
  const sizes = [];
  const works = [];
  try {
    for (const n of options.objects) {
      log(`\n${n} objects`);
      const { work, ...size } = await runSize(n, options, probe, cached, log);
      works.push(work);
      sizes.push(size);
    }
  } finally {
    // deleted only now, after every size's runs (see moveAside in runSize), and also when a later size
    // fails: its own folder, named in the error, is kept, but the finished sizes' gigabytes are not
    if (!options.keep) for (const work of works) rmSync(work, { recursive: true, force: true });
  }
  const results = {
    started: started.toISOString(),
    finished: new Date().toISOString(),
    commit: gitCommit(),
    code_version: { at_start: codeAtStart, at_end: codeFingerprint(), hashes: "dist/, bin/ and the site templates" },
    machine: machine(),
    settings: {
      objects: options.objects,
      runs: options.runs,
      steps: options.steps,
      seed: options.seed,
      draws: options.draws ?? "default",
      memory_probe: probe,
      build_cache: cached ? "own cache folder per size; emptied before each full build, kept for the rebuilds" : "the build has no cache",
      time: "wall clock of the child process, spawn to exit",
    },
    sizes,
    fits: fits(sizes),
  };
  log("\n" + formatTable(results));
  const dir = path.join(ROOT, "bench", "results");
  mkdirSync(dir, { recursive: true });
  const file = options.out ?? path.join(dir, `${started.toISOString().replace(/[:.]/g, "-")}.json`);
  const text = JSON.stringify(results, null, 2) + "\n";
  writeFileSync(file, text);
  if (!options.out) writeFileSync(path.join(dir, "latest.json"), text);
  log(`\nresults: ${path.relative(process.cwd(), file)}${options.out ? "" : " (and bench/results/latest.json)"}`);
  return 0;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main(process.argv.slice(2)).then(
    (code) => { process.exitCode = code; },
    (error) => {
      process.stderr.write(`bench: ${error.message}\n`);
      process.exitCode = 1;
    },
  );
}
