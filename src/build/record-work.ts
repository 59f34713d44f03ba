import { auditRecords, auditRecordsParallel, type RunOptions } from "../audit/audit-records.js";
import type { ObjectAudit } from "../audit/types.js";
import type { Problem } from "../problem.js";
import { loadRecordBytes } from "../records/load.js";
import type { Location, ObjectRecord } from "../records/types.js";
import type { PageRenderer } from "../site/page-render.js";
import { renderAndWrite, type WrittenPage } from "../site/page-writer.js";
import { adoptFragments, fragmentsOf, type ObjectFragments } from "../site/fragments.js";
import { lazyAudit, storeAudit, summaryOf, type AuditSummary } from "../cache/lazy-audit.js";
import { readRange, type StoreCodec } from "../cache/record-store.js";
import { closeSync, openSync, writeSync } from "node:fs";

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

/** A record file read and keyed, to be parsed and audited. */
export interface FileToAudit {
  readonly file: string;
  readonly key: string;
  readonly bytes: Uint8Array;
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
