import { mkdtempSync, rmSync, statSync, type BigIntStats } from "node:fs";
import os, { availableParallelism } from "node:os";
import path from "node:path";
import { compiledWorkerUrl, runBatches } from "../workers/batch-pool.js";
import { DEFAULT_DRAWS, type RunOptions } from "../audit/audit-records.js";
import { DEFAULT_THRESHOLDS } from "../audit/compare.js";
import { runAudit } from "../audit/run.js";
import { STATUSES, type AuditReport, type ObjectAudit, type Status } from "../audit/types.js";
import { cacheFileFor } from "../cache/cache-dir.js";
import { readRecordStore, writeRecordStore } from "../cache/record-store.js";
import { StatIndex } from "../cache/stat-index.js";
import { digest } from "../cache/digest.js";
import { summaryOf } from "../cache/lazy-audit.js";
import { folderDigest, toolFingerprint } from "../cache/fingerprint.js";
import type { OutputManifest } from "../cache/output-manifest.js";
import { DEFAULT_SET } from "../constants/sets.js";
import type { Problem } from "../problem.js";
import { DEFAULT_MAX_FILE_BYTES, duplicateIdProblem, listRecordFiles } from "../records/load.js";
import { compareProblems, compareText } from "../records/problem-list.js";
import { adoptHomeRowHtml } from "../site/home-rows.js";
import { adoptRendering, knownRendering } from "../site/render-store.js";
import { createPageRenderer, type PageRenderer, type PageSite } from "../site/page-render.js";
import { objectPath } from "../site/table.js";
import { VERSION } from "../version.js";
import {
  ENTRY_CODEC,
  entryJsonOrBytes,
  unpackEntry,
  attachFragments,
  attachHomeRows,
  auditEntriesParallel,
  closeSpills,
  fileProblems,
  parseFiles,
  readKeyed,
  sortAsReport,
  writeEntryPages,
  type FileToAudit,
  type FileToRead,
  type PageWritten,
  type RecordEntry,
} from "./record-work.js";
import type { RecordWorkerData, RecordWorkerReply, RecordWorkerRequest } from "./record-worker.js";

export type { RecordEntry } from "./record-work.js";

/**
 * The audit of a records folder, with a content-hashed cache and, when asked,
 * the object pages written as the records are audited.
 *
 * Each record file is keyed by its path, its bytes, the tool (version and
 * code) and the audit settings; the cache keeps its load problems, its parsed
 * record and its audit (results with Monte Carlo, diagnoses, combined values),
 * so an unchanged file is neither parsed nor audited again. The files to audit
 * are shared among worker threads, each parsing, auditing and writing pages
 * for its share. The report is the same, value for value and key for key, as
 * `runAudit` gives.
 *
 * An object page is keyed by its record file's key and the site-wide inputs
 * (see pageSiteKey); with a manifest of the output folder, a page whose key
 * is unchanged and whose file is untouched is not written again.
 */

export interface PipelineOptions {
  readonly audit: RunOptions;
  /** Folder of the cache files; absent: no cache is read or written. */
  readonly cacheDir?: string;
  /** Write the object pages as the records are audited. */
  readonly pages?: {
    readonly includesDir: string;
    readonly outDir: string;
    readonly site: PageSite;
    /** What the last cached build wrote into outDir; absent: every page is written. */
    readonly manifest?: OutputManifest;
  };
  /** Worker threads; default os.availableParallelism(); 0 works on this thread. */
  readonly workers?: number;
  /** Fewer files to audit than this stay on this thread. Default 200. */
  readonly minFilesForWorkers?: number;
  /** Have the workers make each object's text in the JSON report (PipelineOutcome.objectJson). */
  readonly objectJson?: boolean;
  /**
   * The caller reads of each object audit of the report only what its summary
   * holds (id, name, file, status and the measurements' statuses) besides its
   * JSON text (objectJson), as `check --json` does: the workers then neither
   * serialise nor send the rest, and reading more of an audit made on a
   * worker throws. Not with pages or a cache, which need the whole audits.
   */
  readonly summariesOnly?: boolean;
  /** Called with the entries audited in this run as they come in (from the workers, batch by batch, while they go on). */
  readonly onAudited?: (entries: readonly RecordEntry[]) => void;
}

export interface PipelineStats {
  readonly files: number;
  /** Files whose entry was reused: neither parsed nor audited. */
  readonly reused: number;
  /** Record files parsed and audited in this run (when the workers read the files themselves, also those they found unreadable or too large). */
  readonly audited: number;
  readonly pagesWritten: number;
  readonly pagesKept: number;
  readonly pagesRemoved: number;
}

export interface PipelineOutcome {
  readonly report: AuditReport;
  readonly stats: PipelineStats;
  /** The key of the whole report (every file's path and key, in order); undefined when a file could not be read. */
  readonly reportKey?: string;
  /** The content key of the record file of each object of the report. */
  readonly objectKeys?: ReadonlyMap<ObjectAudit, string>;
  /** Each object's text in the JSON report, where a worker made it (see PipelineOptions.objectJson): a string, or its UTF-8 bytes. */
  readonly objectJson?: (obj: ObjectAudit) => string | Uint8Array | undefined;
}

/** The settings of the report the options give (as auditRecords resolves them). */
export function reportSettings(options: RunOptions): AuditReport["settings"] {
  return {
    thresholds: { ...DEFAULT_THRESHOLDS, ...(options.thresholds ?? {}) },
    draws: options.draws ?? DEFAULT_DRAWS,
    constants: DEFAULT_SET.id,
  };
}

/** The part of a record file's key shared by every file: the tool, the settings, the size limit. */
export function settingsKey(options: RunOptions, maxFileBytes = DEFAULT_MAX_FILE_BYTES): string {
  return digest([toolFingerprint(), JSON.stringify({ ...reportSettings(options), maxFileBytes })]);
}

/** The key of an object page: the site-wide inputs and the key of its record file. */
export function pageKey(siteKey: string, entryKey: string): string {
  return digest([siteKey, entryKey]);
}

function isFolder(dir: string): boolean {
  try {
    return statSync(dir).isDirectory();
  } catch {
    return false;
  }
}

/** The compiled worker beside this module, or undefined when running from the TypeScript sources. */
export function recordWorkerUrl(): URL | undefined {
  return compiledWorkerUrl("record-worker.js", import.meta.url);
}

const BATCH = 16;
const IN_FLIGHT = 2;

function auditOnWorkers(
  url: URL,
  count: number,
  data: RecordWorkerData,
  files: ReadonlyArray<FileToAudit | FileToRead>,
  onDone: (entries: readonly RecordEntry[], pages: readonly PageWritten[]) => void,
): Promise<void> {
  return runBatches<FileToAudit | FileToRead, RecordWorkerReply>({
    url,
    count,
    workerData: data,
    items: files,
    batchSize: BATCH,
    inFlight: IN_FLIGHT,
    request: (batch, items) => ({ kind: "files", batch, files: items }) satisfies RecordWorkerRequest,
    onReply: (reply) => {
      adoptRendering(reply.learned);
      onDone(reply.entries.map(unpackEntry), reply.pages);
    },
    name: "build worker",
    unfinished: "its records were audited",
  });
}

/** Every record file of a folder with its key (read and hashed, not parsed). */
export interface FolderKeys {
  readonly dir: string;
  readonly files: readonly string[];
  readonly shared: string;
  /** Per file, its key, or the entry made without parsing it (over the size limit, unreadable). */
  readonly keys: ReadonlyArray<string | RecordEntry>;
  /** Per file with a key, the bytes it was made from (kept so that a file to audit is not read twice); undefined when the key came from the stat index. */
  readonly bytes: ReadonlyArray<Buffer | undefined>;
  /** The key of the whole report; undefined when a file could not be read. */
  readonly reportKey?: string;
}

/** The record files of a folder, or undefined when it is not a readable folder. */
async function listFolder(dir: string): Promise<string[] | undefined> {
  if (!isFolder(dir)) return undefined;
  try {
    return await listRecordFiles(dir);
  } catch {
    return undefined;
  }
}

/**
 * Reads and keys every record file of `recordsDir`; undefined when it is not a
 * readable folder. With `cacheDir`, a file whose stats are those it had when
 * last keyed takes its key from the stat index there (src/cache/stat-index.ts)
 * without being read; its bytes are then not in FolderKeys.bytes. `listed`:
 * the folder's record files, when they have been listed already.
 */
export async function keyRecordFolder(recordsDir: string, audit: RunOptions, cacheDir?: string, listed?: readonly string[]): Promise<FolderKeys | undefined> {
  const dir = path.resolve(recordsDir);
  const files = listed ?? (await listFolder(dir));
  if (files === undefined) return undefined;
  const shared = settingsKey(audit);
  const index = cacheDir !== undefined ? new StatIndex(cacheFileFor(cacheDir, "stats", dir).replace(/\.bin$/, ".json"), shared) : undefined;
  const bytes: Array<Buffer | undefined> = [];
  const keys = files.map((file) => {
    const absolute = path.join(dir, ...file.split("/"));
    // a file the index holds is stat-ed first; any other is read at once, its stats taken as it is opened
    if (index?.holds(file)) {
      let st: BigIntStats | undefined;
      try {
        st = statSync(absolute, { bigint: true });
      } catch {
        // readKeyed says why
      }
      const known = st && index.keyOf(file, st);
      if (known !== undefined) {
        bytes.push(undefined);
        return known;
      }
    }
    const r = readKeyed(absolute, file, shared);
    bytes.push("bytes" in r ? r.bytes : undefined);
    if (index && "bytes" in r) index.record(file, r.stats, r.key);
    return "bytes" in r ? r.key : r;
  });
  index?.save();
  const flat = keys.map((k) => (typeof k === "string" ? k : k.key));
  const out = { dir, files, shared, keys, bytes };
  return flat.includes("") ? out : { ...out, reportKey: digest([shared, ...files.flatMap((f, i) => [f, flat[i]])]) };
}

/** The cache folder of one records folder. */
export function recordCacheFolder(cacheDir: string, recordsDir: string): string {
  return cacheFileFor(cacheDir, "records", path.resolve(recordsDir)).replace(/\.bin$/, "");
}

/** Reads the cache of a records folder: its entries by file. */
export function readRecordCache(cacheDir: string, recordsDir: string): Map<string, RecordEntry> {
  return readRecordStore<RecordEntry>(recordCacheFolder(cacheDir, recordsDir), ENTRY_CODEC);
}

/**
 * A folder for the workers' spill files (see WireEntry), removed when the
 * process ends: the audits in it are read whenever a stand-in is opened,
 * which may be after the build has returned.
 */
function spillFolder(): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), "steelyard-audits-"));
  if (spillFolders.size === 0) {
    process.once("exit", () => {
      closeSpills();
      for (const d of spillFolders) rmSync(d, { recursive: true, force: true });
    });
  }
  spillFolders.add(dir);
  return dir;
}
const spillFolders = new Set<string>();

/** Audits `recordsDir` (reusing and updating the cache) and, when asked, writes the object pages. */
export async function runPipeline(recordsDir: string, options: PipelineOptions, keyed?: FolderKeys): Promise<PipelineOutcome> {
  const dir = path.resolve(recordsDir);
  const pages = options.pages;
  if (options.summariesOnly && (pages || options.cacheDir !== undefined)) {
    throw new Error("runPipeline: summariesOnly leaves out what pages and the cache need of each audit");
  }
  const workers = options.workers ?? Math.max(1, availableParallelism());
  const minFiles = options.minFilesForWorkers ?? 200;
  // with no cache, no file's key is compared with anything before it is audited: the workers read and key
  // the files themselves, from the start, while this thread would still be reading them
  const listed = keyed === undefined && options.cacheDir === undefined && workers > 0 ? await listFolder(dir) : undefined;
  const readThere = listed !== undefined && listed.length >= minFiles && recordWorkerUrl() !== undefined;
  const folder = readThere ? undefined : (keyed ?? (await keyRecordFolder(dir, options.audit, options.cacheDir, listed)));
  if (folder === undefined && !readThere) {
    // a missing or unreadable folder: one problem, nothing to cache, no object pages
    const report = await runAudit(dir, options.audit);
    return { report, stats: { files: 0, reused: 0, audited: 0, pagesWritten: 0, pagesKept: 0, pagesRemoved: 0 } };
  }
  const files = folder?.files ?? listed!;
  const shared = folder?.shared ?? settingsKey(options.audit);
  const cacheFolder = options.cacheDir !== undefined ? recordCacheFolder(options.cacheDir, dir) : undefined;
  const previous = options.cacheDir !== undefined ? readRecordCache(options.cacheDir, dir) : new Map<string, RecordEntry>();
  const siteKey = pages ? pageSiteKey(pages.includesDir, pages.site) : "";

  // reuse what the cache holds; read the rest again to parse it
  const slots: Array<RecordEntry | undefined> = new Array(files.length);
  const index = new Map<string, number>();
  const toAudit: FileToAudit[] = [];
  // read there: every file goes to the workers by name
  const toRead: FileToRead[] = readThere ? files.map((file) => ({ file, dir, shared })) : [];
  let reused = 0;
  files.forEach((file, i) => index.set(file, i));
  folder?.files.forEach((file, i) => {
    const known = folder.keys[i];
    if (typeof known !== "string") {
      slots[i] = known;
      return;
    }
    const before = previous.get(file);
    // an entry is reused only with its audit (a record read but never audited is read again)
    if (before && before.key === known && (before.audit !== undefined || before.id === undefined)) {
      slots[i] = before;
      reused++;
      return;
    }
    // a file keyed from the stat index was not read: read it now, keyed by what it holds now
    const bytes = folder.bytes[i];
    if (bytes !== undefined) {
      toAudit.push({ file, key: known, bytes });
      return;
    }
    const r = readKeyed(path.join(dir, ...file.split("/")), file, shared);
    if (!("bytes" in r)) {
      slots[i] = r;
      return;
    }
    toAudit.push({ file, key: r.key, bytes: r.bytes });
  });
  const items: ReadonlyArray<FileToAudit | FileToRead> = readThere ? toRead : toAudit;

  // one renderer on this thread for the pages and home rows not made on a worker, made when first needed
  let mainRenderer: PageRenderer | undefined;
  const renderer = (): PageRenderer => (mainRenderer ??= createPageRenderer(pages!.includesDir, pages!.site));
  // parse and audit the rest, writing their pages as they come
  const written = new Map<string, PageWritten>();
  const url = workers > 0 && items.length >= minFiles ? recordWorkerUrl() : undefined;
  if (url) {
    const data: RecordWorkerData = {
      options: options.audit,
      ...(options.objectJson ? { objectJson: true } : {}),
      ...(options.summariesOnly ? { summariesOnly: true } : {}),
      ...(pages ? { pages: { includesDir: pages.includesDir, outDir: pages.outDir, site: pages.site, siteKey }, rendering: knownRendering() } : {}),
      // a site, or the JSON report, needs of each audit its summary, fragments and text: the rest waits in a spill file (with summariesOnly it is not sent)
      ...(pages || options.objectJson ? { spillDir: spillFolder() } : {}),
    };
    await auditOnWorkers(url, Math.min(workers, Math.ceil(items.length / BATCH)), data, items, (entries, done) => {
      for (const e of entries) slots[index.get(e.file)!] = e;
      for (const p of done) written.set(p.id, p);
      options.onAudited?.(entries);
    });
  } else if (toAudit.length > 0) {
    const entries = parseFiles(toAudit);
    await auditEntriesParallel(entries, options.audit);
    for (const e of entries) slots[index.get(e.file)!] = e;
    if (pages) for (const p of writeEntryPages(entries, renderer(), pages.outDir)) written.set(p.id, p);
    options.onAudited?.(entries);
  }
  const entries = slots as RecordEntry[];
  let homeRowsMade = 0;
  if (pages) {
    attachFragments(entries);
    homeRowsMade = attachHomeRows(entries, renderer, siteKey);
  }

  const { report, kept, contested } = reportFromEntries(files, entries, options.audit);

  let pagesWritten = 0;
  let pagesKept = 0;
  let pagesRemoved = 0;
  if (pages) {
    const { manifest } = pages;
    const current = new Set<string>();
    const render = new Map<string, RecordEntry>();
    for (const e of kept) {
      const obj = e.audit?.object;
      if (!obj) continue;
      const rel = `${objectPath(obj.id)}index.html`;
      current.add(rel);
      if (e.homeHtml) adoptHomeRowHtml(obj, pages.site.basePath, e.homeHtml.html);
      const key = pageKey(siteKey, e.key);
      const w = written.get(obj.id);
      // a page written for this entry, unless a duplicate of its id may have written over it
      if (w && w.entryKey === e.key && !contested.has(obj.id)) {
        manifest?.wrote(rel, key, w.size, w.mtimeMs);
        pagesWritten++;
      } else if (manifest && !w && manifest.reuse(rel, key)) {
        pagesKept++;
      } else render.set(obj.id, e);
    }
    if (render.size > 0) {
      for (const p of writeEntryPages([...render.values()], renderer(), pages.outDir)) {
        manifest?.wrote(`${objectPath(p.id)}index.html`, pageKey(siteKey, p.entryKey), p.size, p.mtimeMs);
        pagesWritten++;
      }
    }
    if (manifest) pagesRemoved = manifest.removeStale("objects/", current);
  }

  // a cached entry whose home row was rendered again (for another site) is written back with it
  const unchanged = reused === entries.length && previous.size === entries.length && homeRowsMade === 0;
  if (cacheFolder && !unchanged) {
    try {
      writeRecordStore(cacheFolder, entries.filter((e) => e.key !== ""), previous, ENTRY_CODEC);
    } catch {
      // a cache that cannot be written only makes the next build slower
    }
  }
  const stats = { files: files.length, reused, audited: items.length, pagesWritten, pagesKept, pagesRemoved };
  const objectKeys = new Map<ObjectAudit, string>();
  const withJson = new Map<ObjectAudit, RecordEntry>();
  for (const e of kept) {
    const obj = e.audit?.object;
    if (!obj) continue;
    if (e.key !== "") objectKeys.set(obj, e.key);
    if (e.json !== undefined || e.jsonAt !== undefined) withJson.set(obj, e);
  }
  const objectJson = (obj: ObjectAudit): string | Uint8Array | undefined => {
    const e = withJson.get(obj);
    return e ? entryJsonOrBytes(e) : undefined;
  };
  const out = { report, stats, objectKeys, ...(withJson.size > 0 ? { objectJson } : {}) };
  if (entries.some((e) => e.key === "")) return out;
  return { ...out, reportKey: digest([shared, ...entries.flatMap((e) => [e.file, e.key])]) };
}

/**
 * The report from every file's entry (each with a record audited): the first
 * file in path order that uses an id keeps it, as loadRecords decides, and the
 * report is assembled as auditRecords assembles it. Also gives the entries
 * kept and the ids more than one file used.
 */
export function reportFromEntries(
  files: readonly string[],
  entries: readonly RecordEntry[],
  audit: RunOptions,
): { report: AuditReport; kept: RecordEntry[]; contested: Set<string> } {
  const loadProblems: Problem[] = [];
  const chosen = new Map<string, RecordEntry>();
  const contested = new Set<string>();
  for (const e of entries) {
    loadProblems.push(...e.problems);
    if (e.id === undefined) continue;
    const first = chosen.get(e.id);
    if (first) {
      loadProblems.push(duplicateIdProblem(e.file, e.idLocation ?? { line: 0, column: 0 }, e.id, first.file));
      contested.add(e.id);
    } else chosen.set(e.id, e);
  }
  loadProblems.sort(compareProblems);
  const kept = [...chosen.values()].sort((a, b) => compareText(a.id!, b.id!));
  // every entry with a record is audited before this, duplicates included
  const unaudited = kept.filter((e) => e.audit === undefined);
  if (unaudited.length > 0) throw new Error(`build pipeline: ${unaudited.length} records were not audited`);
  return { report: assemble(files, kept, loadProblems, audit), kept, contested };
}

/** The site-wide key of object pages: the tool, the layouts and includes, and what the pages read of the site. */
export function pageSiteKey(includesDir: string, site: PageSite): string {
  return digest([toolFingerprint(), includesDigest(includesDir), JSON.stringify(site)]);
}

function includesDigest(includesDir: string): string {
  return folderDigest(includesDir, (n) => n.endsWith(".njk"));
}

/** The report from the entries, as auditRecords assembles it from a loaded folder. */
function assemble(files: readonly string[], kept: readonly RecordEntry[], loadProblems: readonly Problem[], options: RunOptions): AuditReport {
  const problems: Problem[] = [...loadProblems];
  const objects: ObjectAudit[] = [];
  const counts = Object.fromEntries(STATUSES.map((s) => [s, 0])) as Record<Status, number>;
  let measurements = 0;
  for (const e of kept) {
    const audit = e.audit!;
    problems.push(...audit.problems);
    if (!audit.object) continue;
    objects.push(audit.object);
    // from the summary, so that an audit read from the cache stays unopened
    const { statuses } = summaryOf(audit.object);
    for (const st of statuses) counts[st]++;
    measurements += statuses.length;
  }
  sortAsReport(problems);
  const withErrors = new Set<string>();
  for (const p of problems) if (p.severity === "error") withErrors.add(p.file);
  return {
    tool: { name: "steelyard", version: VERSION },
    settings: reportSettings(options),
    summary: {
      files: files.length,
      files_audited: new Set(objects.map((o) => o.file)).size,
      files_with_problems: withErrors.size,
      objects: objects.length,
      measurements,
      status_counts: counts,
    },
    objects,
    problems,
  };
}

export { fileProblems };
