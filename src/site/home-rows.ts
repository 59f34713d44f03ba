import type nunjucks from "nunjucks";
import type { ObjectAudit } from "../audit/types.js";
import { underBase } from "./base-path.js";
import type { HomeRow } from "./home-view.js";

/**
 * The rows of the home table as HTML, one object at a time.
 *
 * The home page lists every object: at 10,000 objects its loop over the rows
 * was the largest part of what Eleventy renders after one record changed. So
 * each row is rendered on its own, from partials/home-row.njk, where the
 * object is audited (on a build worker, beside its page), and kept in the
 * build cache with the object's entry under the key of the object pages'
 * site (the tool, the includes, the base path): a rebuild renders only the
 * rows of the objects that changed. The page then writes the rows' HTML as
 * it is. A row rendered anywhere else (a site built without the cache, a
 * method renamed by the site's own list) goes through the same partial with
 * the same options, so the page is the same bytes either way.
 */

/** The partial of one row, under the includes folder. */
export const HOME_ROW_TEMPLATE = "partials/home-row.njk";

/** Renders one home row as the page shows it, links under `basePath`. */
export type HomeRowRenderer = (row: HomeRow) => string;

/** A row renderer over the templates of `env` (an environment over the includes folder). */
export function homeRowRendererIn(env: nunjucks.Environment, basePath: string): HomeRowRenderer {
  // compiled on first use: a renderer of object pages alone never reads it
  let template: nunjucks.Template | undefined;
  const steelyard = { link: (sitePath: string) => underBase(basePath, String(sitePath)) };
  return (r) => {
    template ??= env.getTemplate(HOME_ROW_TEMPLATE, true);
    return template.render({ steelyard, r });
  };
}

/**
 * Rows rendered for an object and the base path they were rendered under,
 * by object. One map per process (a registered symbol), as for the fragments.
 */
const KNOWN = Symbol.for("steelyard.site.home-rows");
const holder = globalThis as { [KNOWN]?: WeakMap<ObjectAudit, { readonly basePath: string; readonly html: string }> };
const known = (holder[KNOWN] ??= new WeakMap());

/** Takes the HTML of an object's row, rendered from its fragments' row under `basePath`. */
export function adoptHomeRowHtml(obj: ObjectAudit, basePath: string, html: string): void {
  known.set(obj, { basePath, html });
}

/** The HTML of an object's row rendered under `basePath`, when one was adopted. */
export function homeRowHtmlOf(obj: ObjectAudit, basePath: string): string | undefined {
  const k = known.get(obj);
  return k !== undefined && k.basePath === basePath ? k.html : undefined;
}
