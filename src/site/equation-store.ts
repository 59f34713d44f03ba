import { mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { digest } from "../cache/digest.js";
import { toolFingerprint } from "../cache/fingerprint.js";
import { exportShapes, importShapes, typesetterId, type KeptShape } from "./katex.js";

/**
 * The equation shapes of earlier builds, kept in the cache folder (one file
 * for every catalogue and site: a shape depends only on its TeX skeleton).
 * With them a rebuild splices every equation whose shape it has seen before,
 * and loads KaTeX only for a new one.
 *
 * The file is trusted only under the key it was written with: the tool's
 * fingerprint (its version and code, so the checks that admitted each shape)
 * and the typesetter (KaTeX's version and options). A file under another key,
 * or whose shapes do not match the digest written beside them, is ignored and
 * written again at the end of the build; reading it can only make a build
 * faster, never change a page.
 */

const FILE_NAME = "equations.json";

/** What a build read from the store, to tell at the end whether it has anything to add. */
export interface EquationStore {
  readonly file: string;
  /** The keys of the shapes the file held (empty when there was none, or it did not fit). */
  readonly known: ReadonlySet<string>;
}

interface StoreFile {
  readonly key: string;
  readonly digest: string;
  readonly shapes: readonly KeptShape[];
}

function storeKey(): string {
  return digest([toolFingerprint(), typesetterId()]);
}

function shapesDigest(shapes: readonly KeptShape[]): string {
  return digest([JSON.stringify(shapes)]);
}

/** Reads the shapes kept in `cacheDir` into this thread's KaTeX adapter. */
export function loadEquationStore(cacheDir: string): EquationStore {
  const file = path.join(path.resolve(cacheDir), FILE_NAME);
  const known = new Set<string>();
  let parsed: StoreFile | undefined;
  try {
    parsed = JSON.parse(readFileSync(file, "utf8")) as StoreFile;
  } catch {
    // none yet, or unreadable: the shapes are learned again
  }
  if (parsed && parsed.key === storeKey() && Array.isArray(parsed.shapes) && parsed.digest === shapesDigest(parsed.shapes)) {
    importShapes(parsed.shapes);
    for (const s of parsed.shapes) known.add(s.key);
  }
  return { file, known };
}

/**
 * Writes every shape this thread can splice to the store, unless the file
 * already held each of them. Returns whether it wrote. A store that cannot be
 * written only makes the next build slower.
 */
export function saveEquationStore(store: EquationStore): boolean {
  const shapes = exportShapes();
  if (shapes.every((s) => store.known.has(s.key))) return false;
  const body: StoreFile = { key: storeKey(), digest: shapesDigest(shapes), shapes };
  const tmp = `${store.file}.${process.pid}.tmp`;
  try {
    mkdirSync(path.dirname(store.file), { recursive: true });
    writeFileSync(tmp, JSON.stringify(body));
    renameSync(tmp, store.file);
    return true;
  } catch {
    rmSync(tmp, { force: true });
    return false;
  }
}
