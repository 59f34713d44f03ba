// Where the time of one `steelyard build` (or `check`) goes: runs it once on a
// generated catalogue under V8's sampling profiler (node --cpu-prof) and sums
// the self time per function and per module.
//
//   node bench/profile.mjs [--objects 1000] [--step STEP] [--draws N] [--top 25] [--seed S]
//
// STEP is build (into an empty folder, the default), check, rebuild-edit (after
// one unprofiled build, one published value changed) or rebuild-same.
//
// Writes the raw profile (open it in a browser's developer tools) and the
// summary as JSON under bench/results/.
import { spawnSync } from "node:child_process";
import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { editOnePublishedValue } from "./edit-record.mjs";
import { generateCatalogue } from "./generate.mjs";

const PROFILED_STEPS = ["build", "check", "rebuild-edit", "rebuild-same"];

const HERE = path.dirname(fileURLToPath(import.meta.url));
const ROOT = path.resolve(HERE, "..");
const ROOT_URL = pathToFileURL(ROOT).href + "/";

/** Which part of the program a script URL belongs to: a file of ours, a package, or Node itself. */
export function moduleOf(url) {
  if (!url) return "(native or engine)";
  if (url.startsWith("node:")) return "node internals";
  let rel = url.startsWith(ROOT_URL) ? url.slice(ROOT_URL.length) : url.startsWith(ROOT + "/") ? url.slice(ROOT.length + 1) : url;
  const nm = rel.lastIndexOf("node_modules/");
  if (nm >= 0) {
    const parts = rel.slice(nm + "node_modules/".length).split("/");
    return `package ${parts[0].startsWith("@") ? parts.slice(0, 2).join("/") : parts[0]}`;
  }
  rel = rel.replace(/^file:\/\//, "");
  return rel;
}

/** Self time (ms) per function and per module from a V8 .cpuprofile. */
export function summariseProfile(profile) {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const self = new Map();
  for (let i = 0; i < profile.samples.length; i++) {
    const dt = (profile.timeDeltas[i + 1] ?? 0) / 1000;
    self.set(profile.samples[i], (self.get(profile.samples[i]) ?? 0) + dt);
  }
  const functions = new Map();
  const modules = new Map();
  let total = 0;
  let idle = 0;
  for (const [id, ms] of self) {
    const node = byId.get(id);
    const f = node.callFrame;
    // waiting for the disk or a timer is not work: counted apart, left out of the shares
    if (f.functionName === "(idle)") {
      idle += ms;
      continue;
    }
    const where = moduleOf(f.url);
    const name = f.functionName || "(anonymous)";
    const key = `${name} ${where}:${f.lineNumber + 1}`;
    const entry = functions.get(key) ?? { function: name, module: where, line: f.lineNumber + 1, self_ms: 0 };
    entry.self_ms += ms;
    functions.set(key, entry);
    modules.set(where, (modules.get(where) ?? 0) + ms);
    total += ms;
  }
  return summary(functions, modules, total, idle);
}

/** The summary from self times per function and per module, largest first. */
function summary(functions, modules, total, idle) {
  const sort = (a, b) => b.self_ms - a.self_ms;
  return {
    total_ms: total,
    idle_ms: idle,
    functions: [...functions.values()].sort(sort),
    modules: [...modules].map(([module, self_ms]) => ({ module, self_ms })).sort(sort),
  };
}

/** Several threads' summaries as one: self times added per function and per module. */
export function mergeSummaries(summaries) {
  const functions = new Map();
  const modules = new Map();
  let total = 0;
  let idle = 0;
  for (const s of summaries) {
    total += s.total_ms;
    idle += s.idle_ms;
    for (const f of s.functions) {
      const key = `${f.function} ${f.module}:${f.line}`;
      const e = functions.get(key) ?? { ...f, self_ms: 0 };
      e.self_ms += f.self_ms;
      functions.set(key, e);
    }
    for (const m of s.modules) modules.set(m.module, (modules.get(m.module) ?? 0) + m.self_ms);
  }
  return summary(functions, modules, total, idle);
}

function parse(argv) {
  const o = { objects: 1000, step: "build", draws: undefined, top: 25, seed: "1" };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const v = argv[i + 1];
    if (a === "--objects") (o.objects = Number(v)), i++;
    else if (a === "--step") (o.step = v), i++;
    else if (a === "--draws") (o.draws = Number(v)), i++;
    else if (a === "--top") (o.top = Number(v)), i++;
    else if (a === "--seed") (o.seed = String(v)), i++;
    else return `unknown option ${a}`;
  }
  if (!Number.isInteger(o.objects) || o.objects < 1) return "--objects needs a whole number ≥ 1";
  if (!PROFILED_STEPS.includes(o.step)) return `--step is one of ${PROFILED_STEPS.join(", ")}`;
  if (o.draws !== undefined && !(Number.isInteger(o.draws) && o.draws >= 0)) return "--draws needs a whole number ≥ 0";
  if (!Number.isInteger(o.top) || o.top < 1) return "--top needs a whole number ≥ 1";
  return o;
}

function table(rows, columns) {
  const width = columns.map(([title, get]) => Math.max(title.length, ...rows.map((r) => String(get(r)).length)));
  const line = (cells) => cells.map((c, i) => (i === 0 ? String(c).padStart(width[i]) : String(c).padEnd(width[i]))).join("  ");
  return [line(columns.map(([t]) => t)), ...rows.map((r) => line(columns.map(([, get]) => get(r))))].join("\n");
}

function main(argv) {
  const o = parse(argv);
  if (typeof o === "string") {
    process.stderr.write(`profile: ${o}\n`);
    return 2;
  }
  const work = mkdtempSync(path.join(os.tmpdir(), "steelyard-profile-"));
  try {
    const records = path.join(work, "records");
    const profDir = path.join(work, "prof");
    generateCatalogue(records, o.objects, o.seed);
    const draws = o.draws === undefined ? [] : ["--draws", String(o.draws)];
    const help = spawnSync(process.execPath, [path.join(ROOT, "bin", "steelyard.js"), "--help"], { cwd: ROOT, encoding: "utf8" });
    // the build's cache, if it has one, lives in the work folder: a profiled full build starts cold
    const cache = help.stdout?.includes("--cache-dir") ? ["--cache-dir", path.join(work, "cache")] : [];
    const buildArgs = ["build", records, "--out", path.join(work, "site"), "--exit-zero", "--quiet", ...draws, ...cache];
    const args = o.step === "check" ? ["check", records, "--json", ...draws] : buildArgs;
    if (o.step.startsWith("rebuild")) {
      const first = spawnSync(process.execPath, [path.join(ROOT, "bin", "steelyard.js"), ...buildArgs], { cwd: ROOT, stdio: ["ignore", "ignore", "pipe"], encoding: "utf8" });
      if (first.status !== 0) {
        process.stderr.write(`profile: the first, unprofiled build failed (exit ${first.status}):\n${first.stderr}\n`);
        return 1;
      }
      if (o.step === "rebuild-edit") editOnePublishedValue(records, 1);
    }
    const started = performance.now();
    const r = spawnSync(process.execPath, ["--cpu-prof", `--cpu-prof-dir=${profDir}`, path.join(ROOT, "bin", "steelyard.js"), ...args], {
      cwd: ROOT,
      stdio: ["ignore", "ignore", "pipe"],
      encoding: "utf8",
      maxBuffer: 64 * 1024 * 1024,
    });
    const seconds = (performance.now() - started) / 1000;
    if (r.status !== 0 && !(o.step === "check" && r.status === 1)) {
      process.stderr.write(`profile: ${o.step} failed (exit ${r.status}):\n${r.stderr}\n`);
      return 1;
    }
    // node writes one profile per thread: the main one and each worker's
    const files = readdirSync(profDir).filter((f) => f.endsWith(".cpuprofile")).sort();
    if (files.length === 0) throw new Error("node wrote no .cpuprofile");
    const threads = files.map((f) => ({ file: f, ...summariseProfile(JSON.parse(readFileSync(path.join(profDir, f), "utf8"))) }));
    const summary = mergeSummaries(threads);
    const share = (ms) => `${((100 * ms) / summary.total_ms).toFixed(1)}%`;
    process.stdout.write(`${o.step} of ${o.objects} objects: ${seconds.toFixed(1)} s wall, ${(summary.total_ms / 1000).toFixed(1)} s busy, ${(summary.idle_ms / 1000).toFixed(1)} s idle (shares are of the busy time)\n`);
    process.stdout.write(`${threads.length} thread(s): ${threads.map((t) => `${(t.total_ms / 1000).toFixed(1)} s busy`).join(", ")}\n\n`);
    process.stdout.write("Self time by module\n" + table(summary.modules.slice(0, o.top), [
      ["self ms", (m) => m.self_ms.toFixed(0)],
      ["share", (m) => share(m.self_ms)],
      ["module", (m) => m.module],
    ]) + "\n\n");
    process.stdout.write("Self time by function\n" + table(summary.functions.slice(0, o.top), [
      ["self ms", (f) => f.self_ms.toFixed(0)],
      ["share", (f) => share(f.self_ms)],
      ["function", (f) => f.function],
      ["where", (f) => `${f.module}:${f.line}`],
    ]) + "\n");
    const out = path.join(ROOT, "bench", "results");
    mkdirSync(out, { recursive: true });
    const base = `profile-${o.step}-${o.objects}`;
    files.forEach((f, i) => copyFileSync(path.join(profDir, f), path.join(out, `${base}${files.length > 1 ? `-thread-${i}` : ""}.cpuprofile`)));
    writeFileSync(path.join(out, `${base}.json`), JSON.stringify({
      step: o.step, objects: o.objects, draws: o.draws ?? "default", wall_s: seconds, node: process.version,
      threads: threads.map((t) => ({ busy_ms: t.total_ms, idle_ms: t.idle_ms })),
      total_ms: summary.total_ms, idle_ms: summary.idle_ms, modules: summary.modules, functions: summary.functions.slice(0, 200),
    }, null, 2) + "\n");
    process.stdout.write(`\nprofiles: bench/results/${base}*.cpuprofile, summary: bench/results/${base}.json\n`);
    return 0;
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  process.exitCode = main(process.argv.slice(2));
}
