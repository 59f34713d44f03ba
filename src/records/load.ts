/**
 * Loads the folder of YAML records: one object per file, any folder depth,
 * *.yaml and *.yml only; dotfiles and dot-folders are skipped, symbolic links
 * are not followed. Every problem is reported with file, line, column and
 * field path; one bad file never stops the others. Output order depends
 * neither on the order the file system lists files nor on key order inside a
 * record.
 */
import { lstat, readdir, readFile, stat } from "node:fs/promises";
import { join } from "node:path";
import type { Problem } from "../problem.js";
import { compareProblems, compareText, ProblemList, WHOLE_FILE } from "./problem-list.js";
import { RecordContext } from "./record-context.js";
import type { LoadOutcome, Location, ObjectRecord } from "./types.js";
import { firstInvalidUtf8, locateByte } from "./utf8.js";
import { validateRecord } from "./validate-record.js";
import { parseYamlDocument } from "./yaml-document.js";

/** Default largest record file: 1 MiB, far above any real record, small enough to read safely. */
export const DEFAULT_MAX_FILE_BYTES = 1024 * 1024;

export interface LoadOptions {
  /** Largest file accepted, in bytes. Default 1 MiB. */
  readonly maxFileBytes?: number;
}

export interface TextOutcome {
  readonly record?: ObjectRecord;
  readonly problems: Problem[];
}

interface DetailedOutcome extends TextOutcome {
  readonly idLocation: Location;
}

function tooLarge(list: ProblemList, bytes: number, limit: number): void {
  list.add({
    code: "file-too-large",
    path: "",
    location: WHOLE_FILE,
    message: `the file is ${bytes} bytes, over the limit of ${limit} bytes (${(limit / 1024 / 1024).toFixed(2)} MiB) for one record`,
    hint: "a record holds one object; split it, or raise the limit if this one is real",
  });
}

function loadDetailed(text: string | Uint8Array, file: string, options: LoadOptions = {}): DetailedOutcome {
  const limit = options.maxFileBytes ?? DEFAULT_MAX_FILE_BYTES;
  const list = new ProblemList(file);
  const done = (record?: ObjectRecord, idLocation: Location = WHOLE_FILE): DetailedOutcome => {
    list.items.sort(compareProblems);
    return record ? { record, problems: list.items, idLocation } : { problems: list.items, idLocation };
  };

  let source: string;
  if (typeof text === "string") {
    const bytes = Buffer.byteLength(text, "utf8");
    if (bytes > limit) {
      tooLarge(list, bytes, limit);
      return done();
    }
    source = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  } else {
    if (text.byteLength > limit) {
      tooLarge(list, text.byteLength, limit);
      return done();
    }
    const bad = firstInvalidUtf8(text);
    if (bad >= 0) {
      const utf16 = (text[0] === 0xff && text[1] === 0xfe) || (text[0] === 0xfe && text[1] === 0xff);
      list.add({
        code: "not-utf8",
        path: "",
        location: locateByte(text, bad),
        message: `the file is not valid UTF-8 (byte 0x${text[bad].toString(16).padStart(2, "0")} at offset ${bad})`,
        hint: utf16 ? "the file looks like UTF-16; save it as UTF-8" : "save the file as UTF-8 (Latin-1 and other encodings are not read)",
      });
      return done();
    }
    // ignoreBOM false: a leading byte-order mark is dropped
    source = new TextDecoder("utf-8", { fatal: true }).decode(text);
  }

  const parsed = parseYamlDocument(source);
  if (!parsed.ok) {
    for (const p of parsed.problems) list.add(p);
    return done();
  }
  const ctx = new RecordContext(list, parsed.document.positions);
  const outcome = validateRecord(ctx, parsed.document.value, file);
  return done(outcome.record, outcome.idLocation);
}

/**
 * Reads one record file's text (or bytes, checked for UTF-8 first). Pure: the
 * folder loader calls it per file. Never throws for any input.
 */
export function loadRecordText(text: string | Uint8Array, file: string, options: LoadOptions = {}): TextOutcome {
  const { record, problems } = loadDetailed(text, file, options);
  return record ? { record, problems } : { problems };
}

/** What one record file gives: its problems, and its record with where the id sits. */
export interface FileOutcome extends TextOutcome {
  readonly idLocation: Location;
}

/**
 * One file's bytes as loadRecords reads them (for loaders that read and hash
 * the files themselves, such as the build cache). Never throws.
 */
export function loadRecordBytes(bytes: Uint8Array, file: string, options: LoadOptions = {}): FileOutcome {
  return loadDetailed(bytes, file, options);
}

/** The problems loadRecords gives a file over the size limit (it is not read). */
export function fileTooLargeProblems(file: string, bytes: number, options: LoadOptions = {}): Problem[] {
  const list = new ProblemList(file);
  tooLarge(list, bytes, options.maxFileBytes ?? DEFAULT_MAX_FILE_BYTES);
  return list.items;
}

/** The problems loadRecords gives a file it cannot read. */
export function fileUnreadableProblems(file: string, error: Error): Problem[] {
  const list = new ProblemList(file);
  list.add({
    code: "file-unreadable",
    path: "",
    location: WHOLE_FILE,
    message: `the file could not be read: ${error.message}`,
    hint: "check the file's permissions",
  });
  return list.items;
}

/** The problem loadRecords gives the second file that uses an object id. */
export function duplicateIdProblem(file: string, idLocation: Location, id: string, firstFile: string): Problem {
  return {
    code: "duplicate-id",
    severity: "error",
    file,
    line: idLocation.line,
    column: idLocation.column,
    path: "id",
    message: `object id '${id}' is already used by ${firstFile}; this file is left out`,
    hint: `give one of ${firstFile} and ${file} another id`,
  };
}

function isRecordFile(name: string): boolean {
  return /\.ya?ml$/i.test(name);
}

/** Relative paths (forward slashes) of every record file under `dir`, sorted. */
export async function listRecordFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  const walk = async (absolute: string, relative: string) => {
    const entries = await readdir(absolute, { withFileTypes: true });
    for (const entry of entries) {
      if (entry.name.startsWith(".")) continue;
      const rel = relative === "" ? entry.name : `${relative}/${entry.name}`;
      if (entry.isDirectory()) await walk(join(absolute, entry.name), rel);
      else if (entry.isFile() && isRecordFile(entry.name)) out.push(rel);
    }
  };
  await walk(dir, "");
  return out.sort(compareText);
}

/** Loads every record under `dir`. A missing folder is one problem, not a crash. */
export async function loadRecords(dir: string, options: LoadOptions = {}): Promise<LoadOutcome> {
  const limit = options.maxFileBytes ?? DEFAULT_MAX_FILE_BYTES;
  const problems: Problem[] = [];

  let isFolder = false;
  try {
    isFolder = (await stat(dir)).isDirectory();
  } catch {
    isFolder = false;
  }
  if (!isFolder) {
    return {
      records: [],
      problems: [{
        code: "no-records-folder",
        severity: "error",
        file: "",
        line: 0,
        column: 0,
        path: "",
        message: `records folder '${dir}' does not exist or is not a folder`,
        hint: "create it, or point to the folder that holds the *.yaml records",
      }],
      files: [],
      filesWithErrors: [],
    };
  }

  let files: string[];
  try {
    files = await listRecordFiles(dir);
  } catch (e) {
    return {
      records: [],
      problems: [{
        code: "records-folder-unreadable",
        severity: "error",
        file: "",
        line: 0,
        column: 0,
        path: "",
        message: `records folder '${dir}' could not be read: ${(e as Error).message}`,
        hint: "check the folder's permissions",
      }],
      files: [],
      filesWithErrors: [],
    };
  }

  const byId = new Map<string, ObjectRecord>();
  for (const file of files) {
    const absolute = join(dir, ...file.split("/"));
    const list = new ProblemList(file);
    let outcome: DetailedOutcome | undefined;
    try {
      const info = await lstat(absolute);
      if (info.size > limit) tooLarge(list, info.size, limit);
      else outcome = loadDetailed(await readFile(absolute), file, options);
    } catch (e) {
      list.add({
        code: "file-unreadable",
        path: "",
        location: WHOLE_FILE,
        message: `the file could not be read: ${(e as Error).message}`,
        hint: "check the file's permissions",
      });
    }
    problems.push(...list.items);
    if (!outcome) continue;
    problems.push(...outcome.problems);
    const record = outcome.record;
    if (!record) continue;
    const first = byId.get(record.id);
    if (first) {
      problems.push({
        code: "duplicate-id",
        severity: "error",
        file,
        line: outcome.idLocation.line,
        column: outcome.idLocation.column,
        path: "id",
        message: `object id '${record.id}' is already used by ${first.file}; this file is left out`,
        hint: `give one of ${first.file} and ${file} another id`,
      });
      continue;
    }
    byId.set(record.id, record);
  }

  problems.sort(compareProblems);
  const records = [...byId.values()].sort((a, b) => compareText(a.id, b.id));
  const withErrors = new Set(problems.filter((p) => p.severity === "error").map((p) => p.file));
  return {
    records,
    problems,
    files,
    filesWithErrors: files.filter((f) => withErrors.has(f)),
  };
}
