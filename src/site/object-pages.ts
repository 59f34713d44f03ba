import { mkdir, writeFile } from "node:fs/promises";
import path from "node:path";
import nunjucks from "nunjucks";
import type { SiteData } from "./site-data.js";
import { objectPath } from "./table.js";

/**
 * The object pages are rendered here, one at a time, and written at once,
 * instead of as an Eleventy pagination: Eleventy keeps every page it renders
 * in memory until the build ends, which at ten thousand objects of equations
 * runs out of heap. The same layout (base.njk) and includes are used, through
 * a Nunjucks environment with the options the plugin gives Eleventy's.
 */
export const NUNJUCKS_OPTIONS = Object.freeze({ autoescape: true, trimBlocks: true, lstripBlocks: true, throwOnUndefined: false });

export interface ObjectPagesOptions {
  /** The site's _includes folder (layouts and partials). */
  readonly includesDir: string;
  /** The output folder of the build. */
  readonly outDir: string;
}

/** Renders and writes objects/<id>/index.html for every object; resolves to the number written. */
export async function writeObjectPages(data: SiteData, options: ObjectPagesOptions): Promise<number> {
  const env = new nunjucks.Environment(new nunjucks.FileSystemLoader(options.includesDir), { ...NUNJUCKS_OPTIONS });
  const body = env.getTemplate("object-page.njk", true);
  const layout = env.getTemplate("base.njk", true);
  let written = 0;
  for (const obj of data.objects) {
    // objectPath refuses ids that are not slugs, so no page can land outside objects/
    const file = path.join(options.outDir, objectPath(obj.id), "index.html");
    const vars = { steelyard: data, obj, katex: true, pageKind: "object" };
    const content = body.render(vars);
    const html = layout.render({ ...vars, content });
    await mkdir(path.dirname(file), { recursive: true });
    await writeFile(file, html);
    written++;
  }
  return written;
}
