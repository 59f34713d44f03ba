import { rmdirSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { readChunkedFile, writeChunkedFile } from "./chunked-file.js";
import { filesUnder } from "./fingerprint.js";
import type { Segment } from "../site/json-stream.js";

/**
 * What the last cached build wrote into one output folder: per file (a path
 * relative to the folder, forward slashes) the key of what it was made from,
 * and its size and modification time just after writing. A file is reused
 * only when its key matches and it is still that size and time, so a page
 * edited, removed or rewritten by another build is made again.
 */

export interface OutputEntry {
  readonly path: string;
  readonly key: string;
  readonly size: number;
  readonly mtimeMs: number;
  /** For a file assembled from keyed pieces (the full audit JSON): where each piece lies in it. */
  readonly segments?: readonly Segment[];
}

const KIND = "steelyard-output";

/**
 * The key of everything a whole build read (records, settings, templates,
 * tool, previous release) and what it told the user, so that a build whose
 * key matches, into a folder untouched since, need do nothing at all.
 */
export interface BuildStamp {
  readonly key: string;
  /** The state of the records cache after that build (the report is read from it on demand). */
  readonly recordsCache: string;
  readonly outcome: unknown;
}

function sameFile(file: string, size: number, mtimeMs: number): boolean {
  try {
    const info = statSync(file);
    return info.isFile() && info.size === size && info.mtimeMs === mtimeMs;
  } catch {
    return false;
  }
}

export class OutputManifest {
  private readonly before = new Map<string, OutputEntry>();
  private readonly after = new Map<string, OutputEntry>();
  private stampBefore: BuildStamp | undefined;
  private stampAfter: BuildStamp | undefined;

  constructor(
    readonly file: string,
    readonly outDir: string,
  ) {
    for (const v of readChunkedFile(file, KIND) ?? []) {
      const e = v as OutputEntry & { stamp?: BuildStamp };
      if (e && typeof e.path === "string" && typeof e.key === "string") this.before.set(e.path, e);
      else if (e && e.stamp && typeof e.stamp.key === "string") this.stampBefore = e.stamp;
    }
  }

  /** The stamp of the last build, if it left one. */
  get previousStamp(): BuildStamp | undefined {
    return this.stampBefore;
  }

  /** True when the last build left a stamp and every file it made is still as it left it. */
  lastBuildUntouched(): boolean {
    if (!this.stampBefore) return false;
    for (const e of this.before.values()) {
      if (!sameFile(path.join(this.outDir, ...e.path.split("/")), e.size, e.mtimeMs)) return false;
    }
    return true;
  }

  /** Sets the stamp this build leaves (see BuildStamp). */
  setStamp(stamp: BuildStamp): void {
    this.stampAfter = stamp;
  }

  /**
   * Records every file under the output folder, outside `skipTop` (the
   * object pages, already recorded), that this build did not record itself:
   * Eleventy's pages and the copied assets. Their key is empty: they are
   * only checked for being untouched.
   */
  trackRest(skipTop: string): void {
    for (const r of filesUnder(this.outDir, () => true, (rel) => rel === skipTop)) {
      if (this.after.has(r)) continue;
      const info = statSync(path.join(this.outDir, ...r.split("/")));
      this.after.set(r, { path: r, key: "", size: info.size, mtimeMs: info.mtimeMs });
    }
  }

  /** True when `relPath` was made from `key` last time and is untouched since; it is then kept as it is. */
  reuse(relPath: string, key: string): boolean {
    const e = this.before.get(relPath);
    if (!e || e.key !== key || !sameFile(path.join(this.outDir, ...relPath.split("/")), e.size, e.mtimeMs)) return false;
    this.after.set(relPath, e);
    return true;
  }

  /** Records a file just written from `key`, with its pieces' places when it was assembled from keyed pieces. */
  wrote(relPath: string, key: string, size: number, mtimeMs: number, segments?: readonly Segment[]): void {
    this.after.set(relPath, { path: relPath, key, size, mtimeMs, ...(segments ? { segments } : {}) });
  }

  /**
   * The pieces' places in `relPath` as the last build wrote it, when it is
   * still exactly that file (same size and time); undefined otherwise.
   */
  previousSegments(relPath: string): readonly Segment[] | undefined {
    const e = this.before.get(relPath);
    if (!e?.segments) return undefined;
    return sameFile(path.join(this.outDir, ...relPath.split("/")), e.size, e.mtimeMs) ? e.segments : undefined;
  }

  /**
   * Files of the last build under `prefix` that this build did not make:
   * they are deleted (and their folder, when that leaves it empty).
   */
  removeStale(prefix: string, current: ReadonlySet<string>): number {
    let removed = 0;
    for (const p of this.before.keys()) {
      if (!p.startsWith(prefix) || current.has(p) || this.after.has(p)) continue;
      const abs = path.join(this.outDir, ...p.split("/"));
      rmSync(abs, { force: true });
      try {
        rmdirSync(path.dirname(abs));
      } catch {
        // not empty, or already gone
      }
      removed++;
    }
    return removed;
  }

  /** Saves what this build made (written or kept). */
  save(): void {
    const entries: unknown[] = [...this.after.values()].sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
    if (this.stampAfter) entries.push({ stamp: this.stampAfter });
    writeChunkedFile(this.file, KIND, entries);
  }
}
