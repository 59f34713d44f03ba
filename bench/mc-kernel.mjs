// Micro-benchmark of the Monte Carlo: draws per second on one core for the
// original per-draw loop (polar Box–Muller draws, validate() and compute() on a
// plain object for every draw, then a full sort for the percentiles), for the
// per-draw path of runMonteCarlo (new streams, still validate() and compute()
// per draw) and for the batch kernels, all measured in the same run, and the
// speed-up of the kernels as a ratio against the original loop. Then the
// throughput of the worker pool on many measurements, against one thread.
//
//   npx tsc -p . && node bench/mc-kernel.mjs [--draws 20000] [--rounds 5] [--pool-jobs 2000] [--catalogue 2000]
//
// The measurements are invented, with the input combinations and relative
// uncertainties of a typical catalogue; the mix weights each combination by how
// often it occurs there. Times are CPU time of this thread (user + system) for
// the single-thread figures; the pool reports wall clock and CPU time. On a busy
// machine compare the ratios, not the absolute numbers: other processes take
// cores from the workers and inflate CPU time too.
import { availableParallelism, cpus } from "node:os";
import { getMethod } from "../dist/methods/index.js";
import { runMonteCarlo, summarizeSorted } from "../dist/uncertainty/monte-carlo.js";
import { Random } from "../dist/uncertainty/random.js";
import { startMonteCarloPool } from "../dist/uncertainty/monte-carlo-pool.js";
import { catalogueJobs } from "./catalogue-jobs.mjs";

function flag(name, fallback) {
  const i = process.argv.indexOf(name);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
}
const DRAWS = flag("--draws", 20_000);
const ROUNDS = flag("--rounds", 5);
const POOL_JOBS = flag("--pool-jobs", 2000);
const CATALOGUE = flag("--catalogue", 2000);

// SI factors (IAU 2012 au, Julian year, IAU 2015 nominal solar GM)
const DAY = 86400;
const YEAR = 365.25 * DAY;
const AU = 149597870700;
const PC = (648000 / Math.PI) * AU;
const MAS = Math.PI / 648000 / 1000;
const GM_SUN = 1.3271244e20;
const KMS = 1e3;
const DEG = Math.PI / 180;

/** [slot, value, relative σ (or [plus, minus] relative)] */
function inputs(list) {
  return list.map(([slot, value, rel]) => {
    const [plus, minus] = Array.isArray(rel) ? rel : [rel, rel];
    return { slot, value, plus: plus * value, minus: minus * value };
  });
}

// weight = how many of 10 000 typical objects' measurements have this combination (rounded)
const CASES = [
  { label: "relative orbit, angular a + parallax", method: "relative-orbit", weight: 2300, inputs: inputs([
    ["angular_semimajor_axis", 412 * MAS, 0.01], ["parallax", 38.9 * MAS, 0.012], ["period", 33.7 * YEAR, 0.005], ["eccentricity", 0.41, 0.05]]) },
  { label: "single-lined, e + primary mass", method: "single-lined", weight: 1900, inputs: inputs([
    ["period", 5.3 * DAY, 1e-4], ["k1", 47, 0.03], ["eccentricity", 0.27, 0.1], ["primary_mass", 0.96 * GM_SUN, 0.04]]) },
  { label: "single-lined, e", method: "single-lined", weight: 1600, inputs: inputs([
    ["period", 210 * DAY, 0.002], ["k1", 21.4 * KMS, 0.01], ["eccentricity", 0.31, 0.03]]) },
  { label: "relative orbit, linear a", method: "relative-orbit", weight: 1350, inputs: inputs([
    ["semimajor_axis", 6.1 * AU, 0.02], ["period", 12.4 * YEAR, 0.01], ["eccentricity", 0.43, 0.04]]) },
  { label: "double-lined, e + inclination", method: "double-lined", weight: 1450, inputs: inputs([
    ["period", 7.4 * DAY, 1e-5], ["k1", 88.2 * KMS, 0.008], ["k2", 97.5 * KMS, 0.009], ["eccentricity", 0.21, 0.02], ["inclination", 86.9 * DEG, 0.004]]) },
  { label: "single-lined, e + inclination + primary", method: "single-lined", weight: 1300, inputs: inputs([
    ["period", 3.9 * DAY, 1e-5], ["k1", 118, 0.02], ["eccentricity", 0.05, 0.4], ["inclination", 85.2 * DEG, 0.01], ["primary_mass", 1.2 * GM_SUN, 0.05]]) },
  { label: "astrometric orbit, angular a + parallax + primary", method: "astrometric-orbit", weight: 1250, inputs: inputs([
    ["angular_semimajor_axis", 2.9 * MAS, 0.03], ["parallax", 21.5 * MAS, 0.01], ["period", 2.2 * YEAR, 0.01], ["eccentricity", 0.45, 0.05], ["primary_mass", 0.9 * GM_SUN, 0.05]]) },
  { label: "circular velocity, linear radius", method: "circular-velocity", weight: 850, inputs: inputs([
    ["velocity", 231 * KMS, 0.02], ["radius", 8.2e3 * PC, 0.03]]) },
  { label: "circular velocity, angular radius + distance", method: "circular-velocity", weight: 600, inputs: inputs([
    ["velocity", 1030 * KMS, 0.01], ["angular_radius", 4.1 * MAS, 0.02], ["distance", 7.4e6 * PC, [0.06, 0.04]]]) },
];

/** The original loop, kept here as the baseline: one object per draw, validate() and compute(), then sort. */
function originalPerDraw(method, list, draws, seed) {
  const random = new Random(seed);
  const si = {};
  for (const input of list) si[input.slot] = input.value;
  const uncertain = list.filter((i) => i.plus > 0 || i.minus > 0);
  const names = Object.keys(method.compute(si)).sort();
  const buffers = {};
  for (const name of names) buffers[name] = new Float64Array(draws);
  let accepted = 0;
  const maxAttempts = draws * 5;
  for (let attempt = 0; accepted < draws && attempt < maxAttempts; attempt++) {
    for (const input of uncertain) si[input.slot] = random.splitNormal(input.value, input.plus, input.minus);
    if (method.validate(si).length > 0) continue;
    const out = method.compute(si);
    let finite = true;
    for (const name of names) if (!Number.isFinite(out[name])) finite = false;
    if (!finite) continue;
    for (const name of names) buffers[name][accepted] = out[name];
    accepted++;
  }
  const summaries = {};
  for (const name of names) summaries[name] = summarizeSorted(buffers[name].subarray(0, accepted).sort());
  return summaries;
}

const PATHS = {
  original: (method, list, draws, seed) => originalPerDraw(method, list, draws, seed),
  "per-draw": (method, list, draws, seed) => runMonteCarlo(method, list, draws, seed, { path: "per-draw" }),
  kernel: (method, list, draws, seed) => runMonteCarlo(method, list, draws, seed),
};

function cpuSeconds() {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/** Draws per CPU second of one path on one case: the best of ROUNDS rounds of enough runs for about 0.2 s. */
function measure(path, c) {
  const method = getMethod(c.method);
  const run = PATHS[path];
  const draws = path === "original" ? Math.min(DRAWS, 20_000) : DRAWS;
  let seed = 1;
  run(method, c.inputs, draws, seed++); // warm up
  const t0 = cpuSeconds();
  run(method, c.inputs, draws, seed++);
  const once = Math.max(cpuSeconds() - t0, 1e-4);
  const reps = Math.max(1, Math.round(0.2 / once));
  let best = 0;
  for (let r = 0; r < ROUNDS; r++) {
    const start = cpuSeconds();
    for (let k = 0; k < reps; k++) run(method, c.inputs, draws, seed++);
    const rate = (reps * draws) / Math.max(cpuSeconds() - start, 1e-6);
    best = Math.max(best, rate);
  }
  return best;
}

const fmt = (x) => (x / 1e6).toFixed(2).padStart(7);
console.log(`Monte Carlo kernel benchmark: ${DRAWS} draws per measurement, best of ${ROUNDS} rounds`);
console.log(`node ${process.version}, ${cpus()[0]?.model ?? "unknown cpu"}, ${availableParallelism()} cores\n`);
console.log("M draws / CPU second        original  per-draw    kernel   kernel/original");
const totals = { original: 0, "per-draw": 0, kernel: 0 };
let weights = 0;
for (const c of CASES) {
  const rate = {};
  for (const path of Object.keys(PATHS)) rate[path] = measure(path, c);
  // the mix: time per draw weighted by how often the combination occurs
  for (const path of Object.keys(PATHS)) totals[path] += c.weight / rate[path];
  weights += c.weight;
  console.log(`${c.label.padEnd(50).slice(0, 26)} ${fmt(rate.original)}   ${fmt(rate["per-draw"])}   ${fmt(rate.kernel)}   ${(rate.kernel / rate.original).toFixed(1).padStart(8)}×`);
}
const mix = Object.fromEntries(Object.entries(totals).map(([k, t]) => [k, weights / t]));
console.log(`${"catalogue mix".padEnd(26)} ${fmt(mix.original)}   ${fmt(mix["per-draw"])}   ${fmt(mix.kernel)}   ${(mix.kernel / mix.original).toFixed(1).padStart(8)}×`);

// The pool: the same jobs on this thread and on the workers, wall clock and CPU time of
// the whole process (all threads), and the runs compared
const jobs = [];
for (let k = 0; k < POOL_JOBS; k++) {
  const c = CASES[k % CASES.length];
  jobs.push({ method: c.method, inputs: c.inputs, draws: DRAWS, seed: 1000 + k });
}
const clock = () => ({ wall: performance.now() / 1000, cpu: cpuSeconds() });
const since = (t) => ({ wall: performance.now() / 1000 - t.wall, cpu: cpuSeconds() - t.cpu });
let t = clock();
const serial = jobs.map((j) => runMonteCarlo(getMethod(j.method), j.inputs, j.draws, j.seed));
const one = since(t);
t = clock();
const pool = startMonteCarloPool(jobs);
if (!pool) {
  console.log("\nno compiled worker found: run `npx tsc -p .` first");
} else {
  const parallel = await pool;
  const many = since(t);
  const same = JSON.stringify(serial) === JSON.stringify(parallel);
  const total = POOL_JOBS * DRAWS;
  const line = (label, m) =>
    `  ${label.padEnd(14)} ${m.wall.toFixed(2).padStart(6)} s wall ${m.cpu.toFixed(2).padStart(6)} s CPU   ` +
    `${fmt(total / m.wall)} M draws/s   ${fmt(total / m.cpu)} M draws per CPU second`;
  console.log(`\n${POOL_JOBS} measurements × ${DRAWS} draws (the cases above in turn):`);
  console.log(line("one thread", one));
  console.log(line(`${availableParallelism()} workers`, many));
  console.log(`  workers / one thread, wall clock: ${(one.wall / many.wall).toFixed(2)}×`);
  console.log(`  runs identical to one thread: ${same ? "yes" : "NO"}`);
  if (!same) process.exitCode = 1;
}

// The generated catalogue's own measurements (bench/generate.mjs, objects 1..CATALOGUE, seed 1),
// each run once on this thread as check runs it: the mix above is a guess at a catalogue, this is
// one, with every combination of inputs and uncertainty form the generator writes.
if (CATALOGUE > 0) {
  const list = catalogueJobs(CATALOGUE, 1, DRAWS);
  const per = new Map();
  for (const { method, job } of list) {
    const t0 = cpuSeconds();
    const r = runMonteCarlo(method, job.inputs, job.draws, job.seed);
    const dt = cpuSeconds() - t0;
    const e = per.get(method.id) ?? { jobs: 0, draws: 0, attempts: 0, seconds: 0 };
    e.jobs++;
    e.draws += r.draws;
    e.attempts += r.draws + r.rejected;
    e.seconds += dt;
    per.set(method.id, e);
  }
  console.log(`\nthe generated catalogue, objects 1–${CATALOGUE}: ${list.length} measurements × ${DRAWS} draws, one thread`);
  console.log("method                 measurements  M draws / CPU second  ns per draw  rejected");
  const all = { jobs: 0, draws: 0, attempts: 0, seconds: 0 };
  const row = (label, e) =>
    `${label.padEnd(22)} ${String(e.jobs).padStart(12)}  ${fmt(e.draws / e.seconds).padStart(20)}  ${((e.seconds * 1e9) / e.draws).toFixed(1).padStart(11)}  ${((100 * (e.attempts - e.draws)) / e.attempts).toFixed(1).padStart(7)} %`;
  for (const [id, e] of [...per].sort((a, b) => a[0].localeCompare(b[0]))) {
    console.log(row(id, e));
    for (const k of Object.keys(all)) all[k] += e[k];
  }
  console.log(row("all", all));
}
