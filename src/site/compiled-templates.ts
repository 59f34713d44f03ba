import { createRequire } from "node:module";
import nunjucks from "nunjucks";
import { digest } from "../cache/digest.js";

/**
 * The object pages' templates, compiled once and kept between builds.
 *
 * Nunjucks compiles a template to JavaScript source (its lexer, parser and
 * code generator, all of it cold in a new process: about 80 ms for the object
 * page, its layout and partials) and runs that source with `new Function`.
 * The loader here hands Nunjucks the compiled source's result instead of the
 * template text, as Nunjucks's own precompiled loader does, so a page renders
 * from exactly the code the compiler makes. The code is found by a digest of
 * everything it is made from: the Nunjucks version, the template's path (the
 * compiled code names it, for includes and error messages), its text and the
 * environment's options. The render store (render-store.ts) keeps it in the
 * cache folder; worker threads are handed what the main thread knows.
 */

/** One template's compiled code, as kept between runs and sent between threads. */
export interface KeptTemplate {
  readonly key: string;
  readonly code: string;
}

const NUNJUCKS_VERSION = (createRequire(import.meta.url)("nunjucks/package.json") as { version: string }).version;

const LIMIT = 256;
const codes = new Map<string, string>();
const learned = new Set<string>();

type Source = { src: string | { type: "code"; obj: unknown }; path: string; noCache: boolean };

/**
 * A file loader over `dir` whose templates come compiled from the code above
 * (compiled here and remembered when new). `options` are the environment's:
 * an environment with async filters or extensions compiles differently, and
 * must not use this loader.
 */
export function compiledTemplateLoader(dir: string, options: object): nunjucks.ILoader {
  const files = new nunjucks.FileSystemLoader(dir);
  const optionsJson = JSON.stringify(options);
  const compilerOptions = { ...options };
  const loader = files as unknown as { getSource(name: string): Source | null };
  const read = loader.getSource.bind(loader);
  loader.getSource = (name: string): Source | null => {
    const info = read(name);
    if (info === null || typeof info.src !== "string") return info;
    const key = digest([NUNJUCKS_VERSION, info.path, info.src, optionsJson]);
    let code = codes.get(key);
    if (code === undefined) {
      code = (nunjucks as unknown as { compiler: { compile(src: string, asyncFilters: string[], extensions: unknown[], name: string, opts: object): string } }).compiler.compile(
        info.src,
        [],
        [],
        info.path,
        compilerOptions,
      );
      remember(key, code);
      learned.add(key);
    }
    // eslint-disable-next-line @typescript-eslint/no-implied-eval -- what Nunjucks itself does with compiled code
    return { src: { type: "code", obj: new Function(code)() }, path: info.path, noCache: info.noCache };
  };
  return files;
}

function remember(key: string, code: string): void {
  if (codes.size >= LIMIT) {
    const oldest = codes.keys().next().value;
    if (oldest !== undefined) codes.delete(oldest);
  }
  codes.set(key, code);
}

/** Every compiled template this thread knows. */
export function exportTemplates(): KeptTemplate[] {
  return [...codes].map(([key, code]) => ({ key, code }));
}

/** The templates compiled on this thread since the last call, for another thread to know. */
export function takeLearnedTemplates(): KeptTemplate[] {
  const out: KeptTemplate[] = [];
  for (const key of learned) {
    const code = codes.get(key);
    if (code !== undefined) out.push({ key, code });
  }
  learned.clear();
  return out;
}

/** Adds compiled templates from another run or thread; returns how many were new. */
export function importTemplates(kept: readonly KeptTemplate[]): number {
  let added = 0;
  for (const t of kept) {
    if (typeof t.key !== "string" || typeof t.code !== "string" || codes.has(t.key)) continue;
    remember(t.key, t.code);
    added++;
  }
  return added;
}
