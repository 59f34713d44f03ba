// Writing over files that are there: emptied first (open with O_TRUNC, as
// fs.writeFileSync does) against written over from the start and then cut to
// length (what src/site/page-writer.ts does), in the same run, alternated.
//
//   node bench/overwrite.mjs [--dir DIR] [--files 2000] [--kb 160] [--big-mb 100] [--rounds 5]
//
// Two shapes: many page-sized files (a rebuild that renders every page again,
// after a tool update or a new base path) and one large file (a download).
// Prints the median wall and system time of each way and their ratio.
import { closeSync, constants, ftruncateSync, mkdirSync, mkdtempSync, openSync, rmSync, writeSync } from "node:fs";
import os from "node:os";
import path from "node:path";

function flag(name, fallback) {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : fallback;
}
const FILES = Number(flag("--files", 2000));
const KB = Number(flag("--kb", 160));
const BIG_MB = Number(flag("--big-mb", 100));
const ROUNDS = Number(flag("--rounds", 5));
const base = flag("--dir", undefined);
const dir = base ? (mkdirSync(base, { recursive: true }), mkdtempSync(path.join(base, "overwrite-"))) : mkdtempSync(path.join(os.tmpdir(), "steelyard-overwrite-"));

const page = Buffer.alloc(KB * 1024, "<span>1</span>");
const block = Buffer.alloc(1 << 20, "0123456789");

function writeOne(file, way, chunks, chunk) {
  const fd = way === "emptied" ? openSync(file, "w") : openSync(file, constants.O_WRONLY | constants.O_CREAT, 0o666);
  let off = 0;
  for (let i = 0; i < chunks; i++) {
    let k = 0;
    while (k < chunk.length) k += writeSync(fd, chunk, k, chunk.length - k);
    off += chunk.length;
  }
  if (way === "over") ftruncateSync(fd, off);
  closeSync(fd);
}

const SHAPES = {
  pages: (way) => {
    for (let i = 0; i < FILES; i++) writeOne(path.join(dir, `p${i}.html`), way, 1, page);
  },
  big: (way) => writeOne(path.join(dir, "big.json"), way, BIG_MB, block),
};

function timed(fn) {
  const c0 = process.cpuUsage();
  const t0 = process.hrtime.bigint();
  fn();
  const c = process.cpuUsage(c0);
  return { wall: Number(process.hrtime.bigint() - t0) / 1e6, sys: c.system / 1e3 };
}
const median = (xs) => [...xs].sort((a, b) => a - b)[xs.length >> 1];

console.log(`writing over files: ${FILES} files of ${KB} KB, one file of ${BIG_MB} MB, median of ${ROUNDS} rounds, in ${dir}`);
try {
  for (const [shape, run] of Object.entries(SHAPES)) {
    run("emptied"); // the files are there before the first timed round
    const got = { emptied: [], over: [] };
    for (let r = 0; r < ROUNDS; r++) for (const way of r % 2 ? ["over", "emptied"] : ["emptied", "over"]) got[way].push(timed(() => run(way)));
    const m = (way, k) => median(got[way].map((x) => x[k]));
    for (const way of ["emptied", "over"]) console.log(`  ${shape.padEnd(5)} ${way.padEnd(8)} ${m(way, "wall").toFixed(1).padStart(8)} ms wall ${m(way, "sys").toFixed(1).padStart(8)} ms system`);
    console.log(`  ${shape.padEnd(5)} written over / emptied first, wall: ${(m("over", "wall") / m("emptied", "wall")).toFixed(2)}×`);
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}
