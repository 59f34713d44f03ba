import path from "node:path";
import { exitCodeFor } from "./audit/audit-records.js";
import { runPipeline } from "./build/pipeline.js";
import { textReport } from "./report/text-report.js";
import { reportJsonChunks } from "./report/json-report.js";
import { VERSION } from "./version.js";
import { DEFAULT_CACHE_DIR } from "./cache/cache-dir.js";

const USAGE = `steelyard ${VERSION}: recompute published dynamical masses and audit them

Usage:
  steelyard check [RECORDS_DIR] [--json] [--draws N] [--tension Z] [--discrepant Z]
  steelyard build [RECORDS_DIR] [--out DIR] [--base-path /prefix/] [--draws N] [--exit-zero]
                  [--compare-to PREVIOUS_AUDIT_JSON] [--cache-dir DIR | --no-cache]
  steelyard help | --help
  steelyard --version

RECORDS_DIR defaults to content/records. Exit codes: 0 when nothing is discrepant and no
record has problems; 1 when a result is discrepant; 2 when any record has problems (the
valid records are still audited and reported). build --exit-zero exits 0 whenever the site
was written, whatever the audit found (the demo table shows every status on purpose).
build --compare-to adds a page of what changed since the previous release, read from
that release's downloads/audit.json (or steelyard check --json); a file that cannot be
used is reported on that page and here, the site is still written, and the exit code is 2.
build keeps a cache in --cache-dir (default .cache/steelyard in the working folder): record
files that have not changed are not read or audited again, and object pages and downloads
that would come out the same are not written again. The site is the same with or without
it; --no-cache builds everything from scratch and leaves the cache alone.
`;

interface Parsed {
  readonly command: string;
  readonly positional: string[];
  readonly flags: Map<string, string | true>;
}

const VALUE_FLAGS = new Set(["--out", "--base-path", "--draws", "--tension", "--discrepant", "--compare-to", "--cache-dir"]);
const BOOLEAN_FLAGS = new Set(["--json", "--help", "--version", "--quiet", "--exit-zero", "--no-cache"]);

function parseArgs(argv: readonly string[]): Parsed | string {
  const positional: string[] = [];
  const flags = new Map<string, string | true>();
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg.startsWith("--")) {
      const eq = arg.indexOf("=");
      const name = eq > 0 ? arg.slice(0, eq) : arg;
      if (VALUE_FLAGS.has(name)) {
        const value = eq > 0 ? arg.slice(eq + 1) : argv[++i];
        if (value === undefined) return `${name} needs a value`;
        flags.set(name, value);
      } else if (BOOLEAN_FLAGS.has(name) && eq < 0) {
        flags.set(name, true);
      } else {
        return `unknown option ${arg}; run "steelyard --help" for the options`;
      }
    } else positional.push(arg);
  }
  const command = positional.shift() ?? (flags.has("--version") ? "version" : "help");
  return { command, positional, flags };
}

function numberFlag(flags: Parsed["flags"], name: string): number | undefined | string {
  const v = flags.get(name);
  if (v === undefined) return undefined;
  const n = Number(v);
  if (typeof v !== "string" || v.trim() === "" || !Number.isFinite(n) || n < 0) return `${name} needs a non-negative number, got "${String(v)}"`;
  return n;
}

export interface Io {
  readonly out: (text: string) => void;
  readonly err: (text: string) => void;
  /** Writes a long output piece by piece (text, or UTF-8 bytes), waiting for the reader (stdout) so it is never held whole. */
  readonly outChunks?: (chunks: Iterable<string | Uint8Array>) => Promise<void>;
}

function writeEach(io: Io): (chunks: Iterable<string | Uint8Array>) => Promise<void> {
  return async (chunks) => {
    for (const c of chunks) io.out(typeof c === "string" ? c : Buffer.from(c.buffer, c.byteOffset, c.byteLength).toString("utf8"));
  };
}

/** Bytes gathered before each write to stdout. */
const OUT_BLOCK = 1 << 20;

/**
 * Writes the chunks to stdout in blocks of about a megabyte: text encoded
 * into the block, bytes copied into it, and a chunk too long for a block
 * written on its own. Waits for stdout to drain whenever it asks to.
 */
async function writeChunksToStdout(chunks: Iterable<string | Uint8Array>): Promise<void> {
  let block = Buffer.allocUnsafe(OUT_BLOCK);
  let used = 0;
  const write = async (piece: string | Uint8Array): Promise<void> => {
    if (!process.stdout.write(piece)) await new Promise<void>((resolve) => process.stdout.once("drain", () => resolve()));
  };
  const flush = async (): Promise<void> => {
    if (used === 0) return;
    // the block goes to the stream as it is, so the next one is a fresh buffer
    const full = block.subarray(0, used);
    block = Buffer.allocUnsafe(OUT_BLOCK);
    used = 0;
    await write(full);
  };
  for (const c of chunks) {
    // at most three bytes per UTF-16 unit
    const most = typeof c === "string" ? 3 * c.length : c.length;
    if (most > OUT_BLOCK - used) await flush();
    if (most > OUT_BLOCK) await write(c);
    else if (typeof c === "string") used += block.write(c, used, "utf8");
    else {
      block.set(c, used);
      used += c.length;
    }
  }
  await flush();
}

const STD_IO: Io = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
  outChunks: writeChunksToStdout,
};

export async function main(argv: readonly string[], io: Io = STD_IO): Promise<number> {
  const parsed = parseArgs(argv);
  if (typeof parsed === "string") {
    io.err(`steelyard: ${parsed}\n`);
    return 2;
  }
  const { command, positional, flags } = parsed;
  if (flags.has("--help") || command === "help") {
    io.out(USAGE);
    return 0;
  }
  if (command === "version" || flags.has("--version")) {
    io.out(`${VERSION}\n`);
    return 0;
  }
  if (command !== "check" && command !== "build") {
    io.err(`steelyard: unknown command "${command}"; the commands are check and build\n`);
    return 2;
  }
  if (positional.length > 1) {
    io.err(`steelyard: ${command} takes one records folder, got ${positional.length}\n`);
    return 2;
  }
  const draws = numberFlag(flags, "--draws");
  const tension = numberFlag(flags, "--tension");
  const discrepant = numberFlag(flags, "--discrepant");
  for (const v of [draws, tension, discrepant]) {
    if (typeof v === "string") {
      io.err(`steelyard: ${v}\n`);
      return 2;
    }
  }
  if (typeof draws === "number" && !Number.isInteger(draws)) {
    io.err(`steelyard: --draws needs a whole number\n`);
    return 2;
  }
  const thresholds: { tension?: number; discrepant?: number } = {};
  if (typeof tension === "number") thresholds.tension = tension;
  if (typeof discrepant === "number") thresholds.discrepant = discrepant;
  if ((thresholds.tension ?? 1) > (thresholds.discrepant ?? 3)) {
    io.err(`steelyard: --tension must not exceed --discrepant\n`);
    return 2;
  }
  const recordsDir = path.resolve(positional[0] ?? "content/records");
  const options = { ...(typeof draws === "number" ? { draws } : {}), thresholds };

  if (command === "check") {
    if (flags.has("--compare-to")) {
      io.err(`steelyard: --compare-to is an option of build (the changes page of the site)\n`);
      return 2;
    }
    for (const f of ["--cache-dir", "--no-cache"]) {
      if (flags.has(f)) {
        io.err(`steelyard: ${f} is an option of build (its cache of audits and pages)\n`);
        return 2;
      }
    }
    // parsed and audited on worker threads (each object's JSON text too), the same report as runAudit gives;
    // with --json this thread reads of each audit only its summary, and the text
    const json = flags.has("--json");
    const { report, objectJson } = await runPipeline(recordsDir, { audit: options, ...(json ? { objectJson: true, summariesOnly: true } : {}) });
    if (json) await (io.outChunks ?? writeEach(io))(reportJsonChunks(report, (o) => objectJson?.(o)));
    else io.out(textReport(report));
    return exitCodeFor(report);
  }

  const outDir = path.resolve(String(flags.get("--out") ?? "_site"));
  const basePath = String(flags.get("--base-path") ?? "/");
  const compareTo = flags.get("--compare-to");
  if (flags.has("--no-cache") && flags.has("--cache-dir")) {
    io.err(`steelyard: --no-cache and --cache-dir contradict each other; give one\n`);
    return 2;
  }
  const cacheDir = flags.has("--no-cache") ? undefined : path.resolve(String(flags.get("--cache-dir") ?? DEFAULT_CACHE_DIR));
  const { buildSite } = await import("./site/build.js");
  const { summary: s, problemCount, exitCode, pages, compareProblems } = await buildSite({
    recordsDir,
    outDir,
    basePath,
    quiet: flags.has("--quiet"),
    audit: options,
    ...(typeof compareTo === "string" ? { compareTo: path.resolve(compareTo) } : {}),
    ...(cacheDir !== undefined ? { cacheDir } : {}),
  });
  io.out(
    `Wrote ${pages} pages to ${outDir}: ${s.objects} objects, ${s.measurements} measurements, ` +
      `${problemCount} problems in ${s.files_with_problems} files.\n`,
  );
  for (const p of compareProblems) io.err(`steelyard: --compare-to: ${p.message}${p.hint ? ` (${p.hint})` : ""}\n`);
  if (compareProblems.length > 0) return 2;
  return flags.has("--exit-zero") ? 0 : exitCode;
}
