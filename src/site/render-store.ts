import { mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { digest } from "../cache/digest.js";
import { toolFingerprint } from "../cache/fingerprint.js";
import { exportTemplates, importTemplates, takeLearnedTemplates, type KeptTemplate } from "./compiled-templates.js";
import { exportShapes, importShapes, takeLearnedShapes, typesetterId, type KeptShape } from "./katex.js";

/**
 * What the object pages are rendered with, kept in the cache folder between
 * builds: the equation shapes (katex.ts) and the compiled templates
 * (compiled-templates.ts). One file for every catalogue and site: a shape
 * depends only on its TeX skeleton, a compiled template only on its text.
 * With them a rebuild splices every equation whose shape it has seen before,
 * loads KaTeX only for a new one, and compiles no template it has compiled
 * before.
 *
 * The file is trusted only under the key it was written with: the tool's
 * fingerprint (its version and code, so the checks that admitted each shape)
 * and the typesetter (KaTeX's version and options); each compiled template
 * carries its own key. A file under another key, or whose contents do not
 * match the digest written beside them, is ignored and written again at the
 * end of the build: reading it can only make a build faster, never change a
 * page. (It holds code that the build runs, as the cache holds pages that it
 * publishes: the cache folder is as much the user's as the tool's own files.)
 */

const FILE_NAME = "render-store.json";

/** What one thread renders object pages with that another thread or run can take: plain data. */
export interface Rendering {
  readonly shapes: readonly KeptShape[];
  readonly templates: readonly KeptTemplate[];
}

/** Every shape and template this thread knows (for a worker about to start). */
export function knownRendering(): Rendering {
  return { shapes: exportShapes(), templates: exportTemplates() };
}

/** What this thread learned since the last call (for a worker's reply to the main thread). */
export function learnedRendering(): Rendering {
  return { shapes: takeLearnedShapes(), templates: takeLearnedTemplates() };
}

/** Takes what another thread or run of this same code learned. */
export function adoptRendering(r: Rendering): void {
  importShapes(r.shapes);
  importTemplates(r.templates);
}

/** What a build read from the store, to tell at the end whether it has anything to add. */
export interface RenderStore {
  readonly file: string;
  /** The keys of the shapes and templates the file held (none when there was no file, or it did not fit). */
  readonly known: ReadonlySet<string>;
}

interface StoreFile extends Rendering {
  readonly key: string;
  readonly digest: string;
}

function storeKey(): string {
  return digest([toolFingerprint(), typesetterId()]);
}

function contentDigest({ shapes, templates }: Rendering): string {
  return digest([JSON.stringify(shapes), JSON.stringify(templates)]);
}

/** Reads the store in `cacheDir` into this thread's KaTeX adapter and template loader. */
export function loadRenderStore(cacheDir: string): RenderStore {
  const file = path.join(path.resolve(cacheDir), FILE_NAME);
  const known = new Set<string>();
  let parsed: StoreFile | undefined;
  try {
    parsed = JSON.parse(readFileSync(file, "utf8")) as StoreFile;
  } catch {
    // none yet, or unreadable: shapes are learned and templates compiled again
  }
  if (
    parsed &&
    parsed.key === storeKey() &&
    Array.isArray(parsed.shapes) &&
    Array.isArray(parsed.templates) &&
    parsed.digest === contentDigest(parsed)
  ) {
    adoptRendering(parsed);
    for (const s of parsed.shapes) known.add(s.key);
    for (const t of parsed.templates) known.add(t.key);
  }
  return { file, known };
}

/**
 * Writes every shape and template this thread knows to the store, unless the
 * file already held each of them. Returns whether it wrote. A store that
 * cannot be written only makes the next build slower.
 */
export function saveRenderStore(store: RenderStore): boolean {
  const rendering = knownRendering();
  if (rendering.shapes.every((s) => store.known.has(s.key)) && rendering.templates.every((t) => store.known.has(t.key))) return false;
  const body: StoreFile = { key: storeKey(), digest: contentDigest(rendering), ...rendering };
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
