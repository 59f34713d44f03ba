import { mkdirSync, readFileSync, renameSync, rmSync, writeFileSync, type BigIntStats } from "node:fs";
import path from "node:path";

/**
 * The key each record file had at the last build, with what the file system
 * said of the file then: its size, modification and change times (in
 * nanoseconds), inode and device. A file that still matches all of them is
 * taken to have the same bytes, so a rebuild stats it instead of reading and
 * hashing it (one system call instead of four, and no SHA-1), as make, rsync
 * and git's index do. The change time cannot be set by a program (`touch`,
 * `cp -p` and `rsync -t` set the others), and any write to the file sets it.
 *
 * A file changed within the file system's timestamp granularity of when it
 * was last stat-ed could keep the times it was stat-ed with. So an entry
 * whose change time is less than RACY_NS before the moment its index was
 * made is not trusted, and that file is read and hashed again each build
 * until it is older (the "racily clean" rule of git's index). An index made
 * under other settings (the shared part of every key) is not used at all.
 */

/** How long before the index was made a file must have last changed for its entry to be trusted. */
export const RACY_NS = 2_000_000_000n;

interface Entry {
  readonly size: bigint;
  readonly mtimeNs: bigint;
  readonly ctimeNs: bigint;
  readonly ino: bigint;
  readonly dev: bigint;
  readonly key: string;
}

type StoredEntry = [file: string, size: string, mtimeNs: string, ctimeNs: string, ino: string, dev: string, key: string];

interface StoredIndex {
  readonly shared: string;
  readonly madeAtNs: string;
  readonly entries: readonly StoredEntry[];
}

export class StatIndex {
  private readonly before = new Map<string, Entry>();
  private readonly now = new Map<string, Entry>();
  /** Taken before any file is stat-ed, so that every entry made now is judged against it next time. */
  private readonly madeAtNs = BigInt(Date.now()) * 1_000_000n;
  private trustBeforeNs = 0n;
  private changed = false;

  /** The index in `file` for keys made with `shared` (an unreadable or other index: empty). */
  constructor(
    private readonly file: string,
    private readonly shared: string,
  ) {
    let stored: StoredIndex | undefined;
    try {
      stored = JSON.parse(readFileSync(file, "utf8")) as StoredIndex;
    } catch {
      return;
    }
    if (stored?.shared !== shared || !Array.isArray(stored.entries) || typeof stored.madeAtNs !== "string") return;
    try {
      this.trustBeforeNs = BigInt(stored.madeAtNs) - RACY_NS;
      for (const e of stored.entries) {
        this.before.set(e[0], { size: BigInt(e[1]), mtimeNs: BigInt(e[2]), ctimeNs: BigInt(e[3]), ino: BigInt(e[4]), dev: BigInt(e[5]), key: e[6] });
      }
    } catch {
      this.before.clear();
    }
  }

  /** Whether the index holds an entry for `file` (trusted or not). */
  holds(file: string): boolean {
    return this.before.has(file);
  }

  /** The key `file` had, if it still has the same stats and its entry can be trusted. */
  keyOf(file: string, st: BigIntStats): string | undefined {
    const e = this.before.get(file);
    if (
      e === undefined ||
      e.ctimeNs >= this.trustBeforeNs ||
      e.size !== st.size ||
      e.mtimeNs !== st.mtimeNs ||
      e.ctimeNs !== st.ctimeNs ||
      e.ino !== st.ino ||
      e.dev !== st.dev
    ) {
      return undefined;
    }
    this.now.set(file, e);
    return e.key;
  }

  /** Records the key made now from `file`'s bytes, with the stats it had before it was read. */
  record(file: string, st: BigIntStats, key: string): void {
    this.now.set(file, { size: st.size, mtimeNs: st.mtimeNs, ctimeNs: st.ctimeNs, ino: st.ino, dev: st.dev, key });
    this.changed = true;
  }

  /** Writes the entries of this build (the files seen now), when any differs from what was read. */
  save(): void {
    if (!this.changed && this.now.size === this.before.size) return;
    const entries: StoredEntry[] = [];
    for (const [f, e] of this.now) entries.push([f, String(e.size), String(e.mtimeNs), String(e.ctimeNs), String(e.ino), String(e.dev), e.key]);
    const body: StoredIndex = { shared: this.shared, madeAtNs: String(this.madeAtNs), entries };
    const tmp = `${this.file}.${process.pid}.tmp`;
    try {
      mkdirSync(path.dirname(this.file), { recursive: true });
      writeFileSync(tmp, JSON.stringify(body));
      renameSync(tmp, this.file);
    } catch {
      // an index that cannot be written only makes the next build read every file
      rmSync(tmp, { force: true });
    }
  }
}
