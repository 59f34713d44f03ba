import { auditRecords, auditRecordsParallel, type RunOptions } from "../audit/audit-records.js";
import type { ObjectAudit } from "../audit/types.js";
import type { Problem } from "../problem.js";
import { DEFAULT_MAX_FILE_BYTES, fileTooLargeProblems, fileUnreadableProblems, loadRecordBytes } from "../records/load.js";
import type { Location, ObjectRecord } from "../records/types.js";
import type { PageRenderer } from "../site/page-render.js";
import { renderAndWrite, type WrittenPage } from "../site/page-writer.js";
import { adoptFragments, fragmentsOf, type ObjectFragments } from "../site/fragments.js";
import { lazyAudit, storeAudit, summaryOf, type AuditSummary } from "../cache/lazy-audit.js";
import { readRange, type StoreCodec } from "../cache/record-store.js";
import { closeSync, fstatSync, openSync, readSync, writeSync, type BigIntStats } from "node:fs";
import path from "node:path";
import { digest } from "../cache/digest.js";

/** What the cache keeps of one record file. */
export interface RecordEntry {
  readonly file: string;
  /** Digest of the tool, the audit settings, the path and the bytes; "" when the file could not be read. */
  readonly key: string;
  /** The file's own load problems, as the loader sorts them (a duplicate id is decided per build, not kept). */
  readonly problems: readonly Problem[];
  /** The object id of the file's record, when it has one. */
  readonly id?: string;
  readonly idLocation?: Location;
  /** The parsed record, until it is audited (the cache keeps the audit, not the record). */
  record?: ObjectRecord;
  /** The audit of the record; absent until it has been audited. */
  audit?: { readonly object?: ObjectAudit; readonly problems: readonly Problem[] };
  /** What its object contributes to the shared pages and downloads, made where it was audited for a site build. */
  fragments?: ObjectFragments;
  /** Its object's row of the home table as HTML, and the key of the object pages' site it was rendered for (see home-rows.ts). */
  homeHtml?: { readonly site: string; readonly html: string };
  /** Its object's text in the JSON report of `check` (objectJsonText), made where it was audited when asked for. */
  json?: string;
  /** Where a worker wrote that text instead (UTF-8, in its spill file). */
  jsonAt?: SpillPlace;
}

/** A stretch of a spill file. */
export interface SpillPlace {
  readonly file: string;
  readonly at: number;
  readonly length: number;
}

/** A record file read and keyed (its stats as it was opened), or the entry of one that could not be read or is too large. */
export function readKeyed(absolute: string, file: string, shared: string): { key: string; bytes: Buffer; stats: BigIntStats } | RecordEntry {
  try {
    const read = readWhole(absolute, DEFAULT_MAX_FILE_BYTES);
    if (typeof read === "number") return { file, key: digest([shared, file, `size:${read}`]), problems: fileTooLargeProblems(file, read) };
    return { key: digest([shared, file, read.bytes]), ...read };
  } catch (e) {
    return { file, key: "", problems: fileUnreadableProblems(file, e as Error) };
  }
}

/**
 * The bytes of a file as its size was when opened, with its stats from before
 * the reads, or that size when it is above `limit`: one open, one stat, the
 * reads and one close, one system call fewer than a stat and readFileSync
 * (ten thousand record files are read and keyed on a first build).
 */
function readWhole(file: string, limit: number): { bytes: Buffer; stats: BigIntStats } | number {
  const fd = openSync(file, "r");
  try {
    const stats = fstatSync(fd, { bigint: true });
    const size = Number(stats.size);
    if (size > limit) return size;
    const bytes = Buffer.allocUnsafe(size);
    let used = 0;
    while (used < size) {
      const n = readSync(fd, bytes, used, size - used, used);
      if (n === 0) break;
      used += n;
    }
    return { bytes: used === size ? bytes : bytes.subarray(0, used), stats };
  } finally {
    closeSync(fd);
  }
}

/** A record file read and keyed, to be parsed and audited. */
export interface FileToAudit {
  readonly file: string;
  readonly key: string;
  readonly bytes: Uint8Array;
}

/** A record file for a worker to read and key itself (readKeyed in `dir` with the shared part of the key) before it parses and audits it. */
export interface FileToRead {
  readonly file: string;
  readonly dir: string;
  readonly shared: string;
}

/** Reads and keys files to read, then parses every file: the entries of those that could not be read or are too large come as they are. */
export function readAndParse(items: ReadonlyArray<FileToAudit | FileToRead>): RecordEntry[] {
  const out: RecordEntry[] = [];
  const toParse: FileToAudit[] = [];
  for (const item of items) {
    if ("bytes" in item) {
      toParse.push(item);
      continue;
    }
    const r = readKeyed(path.join(item.dir, ...item.file.split("/")), item.file, item.shared);
    if ("bytes" in r) toParse.push({ file: item.file, key: r.key, bytes: r.bytes });
    else out.push(r);
  }
  return [...out, ...parseFiles(toParse)];
}

/** A page written while auditing: its object id, the entry key it came from, its size and time. */
export interface PageWritten extends WrittenPage {
  readonly entryKey: string;
}

/** Problems sorted as the report sorts them: by file, line, column and code, ties kept in order. */
export function sortAsReport(problems: Problem[]): Problem[] {
  return problems.sort(
    (a, b) =>
      (a.file < b.file ? -1 : a.file > b.file ? 1 : 0) ||
      a.line - b.line ||
      a.column - b.column ||
      (a.code < b.code ? -1 : a.code > b.code ? 1 : 0),
  );
}

/** The problems of an entry's file as the report lists them (its object page shows these). */
export function fileProblems(entry: RecordEntry): Problem[] {
  return sortAsReport([...entry.problems, ...(entry.audit?.problems ?? [])]);
}

/** Parses every file into an entry (the loader's own checks, in the same order). */
export function parseFiles(files: readonly FileToAudit[]): RecordEntry[] {
  return files.map(({ file, key, bytes }) => {
    const outcome = loadRecordBytes(bytes, file);
    return outcome.record
      ? { file, key, problems: outcome.problems, id: outcome.record.id, idLocation: outcome.idLocation, record: outcome.record }
      : { file, key, problems: outcome.problems };
  });
}

function attachAudits(entries: readonly RecordEntry[], report: { objects: readonly ObjectAudit[]; problems: readonly Problem[] }): void {
  const objects = new Map(report.objects.map((o) => [o.file, o]));
  const problems = new Map<string, Problem[]>();
  for (const p of report.problems) {
    const list = problems.get(p.file);
    if (list) list.push(p);
    else problems.set(p.file, [p]);
  }
  for (const e of entries) {
    const object = objects.get(e.file);
    e.audit = object ? { object, problems: problems.get(e.file) ?? [] } : { problems: problems.get(e.file) ?? [] };
    delete e.record;
  }
}

function outcomeOf(entries: readonly RecordEntry[]) {
  return { records: entries.map((e) => e.record!), problems: [], files: entries.map((e) => e.file), filesWithErrors: [] };
}

/** Audits the entries that hold a record, on this thread. */
export function auditEntries(entries: readonly RecordEntry[], options: RunOptions): void {
  const withRecord = entries.filter((e) => e.record);
  if (withRecord.length > 0) attachAudits(withRecord, auditRecords(outcomeOf(withRecord), options));
}

/** Audits the entries that hold a record, with the Monte Carlo of large runs on worker threads. */
export async function auditEntriesParallel(entries: readonly RecordEntry[], options: RunOptions): Promise<void> {
  const withRecord = entries.filter((e) => e.record);
  if (withRecord.length > 0) attachAudits(withRecord, await auditRecordsParallel(outcomeOf(withRecord), options));
}

/** Renders and writes the page of every audited entry that has an object. */
export function writeEntryPages(entries: readonly RecordEntry[], render: PageRenderer, outDir: string): PageWritten[] {
  const out: PageWritten[] = [];
  for (const e of entries) {
    const obj = e.audit?.object;
    if (!obj) continue;
    out.push({ ...renderAndWrite(render, { obj, problems: fileProblems(e) }, outDir), entryKey: e.key });
  }
  return out;
}

/**
 * Gives every audited entry with a home row the HTML of that row for the site
 * whose page key is `siteKey`, rendered now unless the entry already carries
 * it (from a worker or the cache); its fragments must be attached. Returns how
 * many were rendered.
 */
export function attachHomeRows(entries: readonly RecordEntry[], render: () => PageRenderer, siteKey: string): number {
  let made = 0;
  for (const e of entries) {
    const home = e.fragments?.home;
    if (!home || e.homeHtml?.site === siteKey) continue;
    e.homeHtml = { site: siteKey, html: render().homeRow(home) };
    made++;
  }
  return made;
}

/**
 * Gives every audited entry with an object its fragments: those it carries
 * (from a worker or the cache) are taken for its object, the others made now.
 */
export function attachFragments(entries: readonly RecordEntry[]): void {
  for (const e of entries) {
    const obj = e.audit?.object;
    if (!obj) continue;
    if (e.fragments) adoptFragments(obj, e.fragments);
    else e.fragments = fragmentsOf(obj);
  }
}

/** An entry as the cache keeps it: its object audit as a summary here and its bytes as the entry's blob (see lazy-audit.ts). */
interface StoredEntry extends Omit<RecordEntry, "audit"> {
  readonly audit?: { readonly problems: readonly Problem[]; readonly summary?: AuditSummary };
}

/**
 * An entry as the cache keeps it, or, with `auditBytes` false, as a worker
 * sends it when the main thread reads nothing of its audit but the summary:
 * the audit is then neither serialised nor sent.
 */
function encodeEntry(whole: RecordEntry, auditBytes: boolean): { value: unknown; blob?: Uint8Array } {
  // the report text of `check` is not kept
  const { json: _json, jsonAt: _jsonAt, ...e } = whole;
  if (!e.audit) return { value: e };
  const { object, problems } = e.audit;
  if (!object) return { value: { ...e, audit: { problems } } };
  if (!auditBytes) return { value: { ...e, audit: { problems, summary: summaryOf(object) } } satisfies StoredEntry };
  const { summary, bytes } = storeAudit(object);
  return { value: { ...e, audit: { problems, summary } } satisfies StoredEntry, blob: bytes };
}

export const ENTRY_CODEC: StoreCodec<RecordEntry> = {
  encode: (whole) => encodeEntry(whole, true),
  // an entry's only bytes, its audit's, are its blob
  valuesHoldNoBytes: true,
  decode(v, blob) {
    const s = v as StoredEntry;
    if (!s || !s.audit) return s as RecordEntry;
    const { summary, problems } = s.audit;
    return { ...s, audit: summary && blob ? { problems, object: lazyAudit(summary, blob) } : { problems } };
  },
};

/**
 * An entry as a build worker sends it: as the cache keeps it, with its
 * audit's bytes written to the worker's spill file (their place sent along),
 * so that the main thread holds each audit as a summary and a file offset
 * rather than as a tree of objects or even as bytes.
 */
export interface WireEntry {
  readonly value: unknown;
  readonly spill?: SpillPlace;
  /** Where its object's JSON report text is, when the worker made it. */
  readonly json?: SpillPlace;
  /** Its audit was not sent, only the summary (see packEntry). */
  readonly summaryOnly?: true;
}

/** A file that one worker appends audits to; it stays until the process ends. */
export class SpillFile {
  private fd: number | undefined;
  private size = 0;
  constructor(readonly file: string) {}

  append(bytes: Uint8Array): { at: number; length: number } {
    this.fd ??= openSync(this.file, "w");
    const at = this.size;
    let off = 0;
    while (off < bytes.length) off += writeSync(this.fd, bytes, off, bytes.length - off, at + off);
    this.size += bytes.length;
    return { at, length: bytes.length };
  }

  close(): void {
    if (this.fd !== undefined) closeSync(this.fd);
    this.fd = undefined;
  }
}

/**
 * An entry for the main thread. With `auditBytes` false, that thread reads of
 * its audit nothing but the summary (id, name, file and statuses, as the
 * JSON report of `check` needs besides the text made here): the audit is
 * neither serialised nor spilled, and the stand-in made of it on the other
 * side throws when anything else is read.
 */
export function packEntry(e: RecordEntry, spill: SpillFile, auditBytes = true): WireEntry {
  const { value, blob } = encodeEntry(e, auditBytes);
  const json = e.json !== undefined ? { json: { file: spill.file, ...spill.append(Buffer.from(e.json, "utf8")) } } : {};
  if (blob !== undefined) return { value, spill: { file: spill.file, ...spill.append(blob) }, ...json };
  return !auditBytes && e.audit?.object ? { value, summaryOnly: true, ...json } : { value, ...json };
}

function notSent(file: string): () => Uint8Array {
  return () => {
    throw new Error(`build pipeline: the audit of ${file} was asked for, but only its summary was sent from its worker (summariesOnly)`);
  };
}

export function unpackEntry(w: WireEntry | RecordEntry): RecordEntry {
  if (!("value" in w)) return w;
  const s = w.value as StoredEntry;
  const spill = w.spill;
  const json = w.json ? { jsonAt: w.json } : {};
  const summary = s?.audit?.summary;
  if (summary && w.summaryOnly) return { ...s, audit: { problems: s.audit!.problems, object: lazyAudit(summary, notSent(s.file), true) }, ...json };
  if (!spill || !summary) return { ...ENTRY_CODEC.decode(w.value), ...json };
  const { file, at, length } = spill;
  return { ...s, audit: { problems: s.audit!.problems, object: lazyAudit(summary, () => readSpill({ file, at, length }), true) }, ...json };
}

/** An entry's JSON report text: made on this thread, or its UTF-8 bytes read back from where a worker wrote them. */
export function entryJsonOrBytes(e: RecordEntry): string | Uint8Array | undefined {
  if (e.json !== undefined) return e.json;
  const at = e.jsonAt;
  return at ? readSpill(at) : undefined;
}

/**
 * Spill files open for reading, the most recent few: a build reads back each
 * of ten thousand audits and texts from two of them, and an open and a close
 * for each read cost a fifth of a second of the build's serial end. A spill
 * file's name is never used again in a process, and it stays until the end.
 */
const openSpills = new Map<string, number>();
const OPEN_SPILLS = 8;

function readSpill(place: SpillPlace): Uint8Array {
  let fd = openSpills.get(place.file);
  if (fd === undefined) {
    if (openSpills.size >= OPEN_SPILLS) {
      const [oldest, oldFd] = openSpills.entries().next().value as [string, number];
      openSpills.delete(oldest);
      closeSync(oldFd);
    }
    fd = openSync(place.file, "r");
    openSpills.set(place.file, fd);
  }
  return readRange(fd, place.file, place.at, place.length);
}

/** Closes the spill files open for reading (before their folder goes). */
export function closeSpills(): void {
  for (const fd of openSpills.values()) closeSync(fd);
  openSpills.clear();
}
