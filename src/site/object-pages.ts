import { availableParallelism } from "node:os";
import { compiledWorkerUrl, runBatches } from "../workers/batch-pool.js";
import type { ObjectAudit } from "../audit/types.js";
import { realAudit } from "../cache/lazy-audit.js";
import type { OutputManifest } from "../cache/output-manifest.js";
import type { Problem } from "../problem.js";
import type { PageWorkerData, PageWorkerReply, PageWorkerRequest } from "./object-page-worker.js";
import { createPageRenderer, type PageInput, type PageSite } from "./page-render.js";
import { renderAndWrite, type WrittenPage } from "./page-writer.js";
import { adoptRendering, knownRendering } from "./render-store.js";
import { objectPath } from "./table.js";

export { NUNJUCKS_OPTIONS } from "./page-render.js";

/**
 * The object pages are rendered here, one at a time, and each is written as
 * soon as it is rendered, instead of as an Eleventy pagination: Eleventy keeps
 * every page it renders in memory until the build ends, which at ten thousand
 * objects of equations runs out of heap. Large runs are shared among worker
 * threads, each with its own Nunjucks environment, fed a few batches at a time
 * so the queue never holds the catalogue twice. With a manifest, a page whose
 * key (what it is rendered from) is unchanged and whose file is untouched is
 * neither rendered nor written, and pages of objects that are gone are removed.
 */

export interface ObjectPagesOptions {
  /** The site's _includes folder (layouts and partials). */
  readonly includesDir: string;
  /** The output folder of the build. */
  readonly outDir: string;
  readonly site: PageSite;
  readonly objects: readonly ObjectAudit[];
  /** The problems of one record file. */
  readonly problemsOf: (file: string) => readonly Problem[];
  /** Reuse pages: the manifest of the output folder and each page's key by object id (no key: always rendered). */
  readonly cache?: { readonly manifest: OutputManifest; readonly keys: ReadonlyMap<string, string> };
  /** Worker threads; default os.availableParallelism(); 0 renders on this thread. */
  readonly workers?: number;
  /** Fewer pages to render than this stay on this thread. Default 200. */
  readonly minPagesForWorkers?: number;
}

export interface ObjectPagesOutcome {
  readonly pages: number;
  readonly written: number;
  readonly kept: number;
  readonly removed: number;
}

/** The compiled worker beside this module, or undefined when running from the TypeScript sources. */
export function pageWorkerUrl(): URL | undefined {
  return compiledWorkerUrl("object-page-worker.js", import.meta.url);
}

const BATCH = 32;
const IN_FLIGHT = 2;

function renderOnWorkers(url: URL, count: number, data: PageWorkerData, inputs: readonly PageInput[], onWritten: (p: WrittenPage) => void): Promise<void> {
  return runBatches<PageInput, PageWorkerReply>({
    url,
    count,
    workerData: data,
    items: inputs,
    batchSize: BATCH,
    inFlight: IN_FLIGHT,
    request: (batch, pages) => ({ kind: "pages", batch, pages }) satisfies PageWorkerRequest,
    onReply: (reply) => {
      adoptRendering(reply.learned);
      for (const p of reply.pages) onWritten(p);
    },
    name: "object page worker",
    unfinished: "its pages were written",
  });
}

/** Renders and writes objects/<id>/index.html for every object (reusing what the manifest allows). */
export async function writeObjectPages(options: ObjectPagesOptions): Promise<ObjectPagesOutcome> {
  const { outDir, cache } = options;
  const todo: PageInput[] = [];
  const current = new Set<string>();
  let kept = 0;
  for (const obj of options.objects) {
    const rel = `${objectPath(obj.id)}index.html`;
    current.add(rel);
    const key = cache?.keys.get(obj.id);
    if (cache && key !== undefined && cache.manifest.reuse(rel, key)) {
      kept++;
      continue;
    }
    // an audit read lazily from the cache cannot be posted to a worker as it is
    todo.push({ obj: realAudit(obj), problems: options.problemsOf(obj.file) });
  }
  const onWritten = (p: WrittenPage): void => {
    const key = cache?.keys.get(p.id);
    if (cache && key !== undefined) cache.manifest.wrote(`${objectPath(p.id)}index.html`, key, p.size, p.mtimeMs);
  };
  const workers = options.workers ?? Math.max(1, availableParallelism());
  const url = workers > 0 && todo.length >= (options.minPagesForWorkers ?? 200) ? pageWorkerUrl() : undefined;
  if (url) {
    await renderOnWorkers(url, Math.min(workers, Math.ceil(todo.length / BATCH)), { includesDir: options.includesDir, outDir, site: options.site, rendering: knownRendering() }, todo, onWritten);
  } else {
    const render = createPageRenderer(options.includesDir, options.site);
    for (const input of todo) onWritten(renderAndWrite(render, input, outDir));
  }
  const removed = cache ? cache.manifest.removeStale("objects/", current) : 0;
  return { pages: options.objects.length, written: todo.length, kept, removed };
}
