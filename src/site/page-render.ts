import nunjucks from "nunjucks";
import type { AuditReport, ObjectAudit } from "../audit/types.js";
import { METHODS } from "../methods/index.js";
import type { Problem } from "../problem.js";
import { underBase } from "./base-path.js";
import { objectPageView, type DisplayTex, type MethodLookup } from "./object-view.js";
import { compiledTemplateLoader } from "./compiled-templates.js";
import { homeRowRendererIn, type HomeRowRenderer } from "./home-rows.js";
import { PageBytes } from "./page-bytes.js";
import { katexStylesheetPath } from "./katex-compact.js";

/**
 * Renders one object's audit page: object-page.njk inside base.njk, through
 * a Nunjucks environment with the options the plugin gives Eleventy's. Used on
 * this thread and in the page workers alike, so a page is the same bytes
 * wherever it is rendered.
 */
export const NUNJUCKS_OPTIONS = Object.freeze({ autoescape: true, trimBlocks: true, lstripBlocks: true, throwOnUndefined: false });

/**
 * The site-wide part of what an object page reads. It is all the object pages
 * see of the `steelyard` data (the layout's links, footer and navigation);
 * a template that reads more of it must have that added here.
 */
export interface PageSite {
  readonly basePath: string;
  readonly version: string;
  readonly settings: AuditReport["settings"];
  /** Whether the site has a changes page (the navigation links to it). */
  readonly hasChanges: boolean;
}

/** The site-wide part of the object pages, from the site data. */
export function pageSite(data: { readonly basePath: string; readonly version: string; readonly settings: AuditReport["settings"]; readonly changes?: unknown }): PageSite {
  return { basePath: data.basePath, version: data.version, settings: data.settings, hasChanges: data.changes !== undefined };
}

export interface PageInput {
  readonly obj: ObjectAudit;
  /** The problems of the object's record file. */
  readonly problems: readonly Problem[];
}

export interface PageRenderer {
  /** The page as text. */
  text(input: PageInput): string;
  /**
   * The page as UTF-8, the bytes of Buffer.from(text(input)), with its display
   * equations copied in from their encoded templates (see page-bytes.ts); a
   * view that the next call may overwrite.
   */
  bytes(input: PageInput): Uint8Array;
  /** The object's row of the home table (see home-rows.ts). */
  homeRow: HomeRowRenderer;
}

/** A renderer with its own Nunjucks environment over `includesDir` (and its own page assembler, unless given one). */
export function createPageRenderer(includesDir: string, site: PageSite, assembler: PageBytes = new PageBytes()): PageRenderer {
  // no filters or extensions are added to this environment: its templates can come compiled (see compiled-templates.ts)
  const env = new nunjucks.Environment(compiledTemplateLoader(includesDir, NUNJUCKS_OPTIONS), { ...NUNJUCKS_OPTIONS });
  const body = env.getTemplate("object-page.njk", true);
  const layout = env.getTemplate("base.njk", true);
  const byId = new Map(METHODS.map((m) => [m.id, m]));
  const lookup: MethodLookup = (id) => byId.get(id);
  const settings = site.settings;
  const base = site.basePath;
  const deferred: DisplayTex = (tex, repeats) => assembler.displayEquation(tex, repeats);
  const katexStylesheet = katexStylesheetPath();
  const render = ({ obj, problems }: PageInput, displayTex?: DisplayTex): string => {
    const steelyard = {
      basePath: base,
      version: site.version,
      settings,
      ...(site.hasChanges ? { changes: true } : {}),
      objectPage: (o: ObjectAudit) => objectPageView(o, lookup, problems, displayTex),
      link: (sitePath: string) => underBase(base, String(sitePath)),
      katexStylesheet,
    };
    const vars = { steelyard, obj, katex: true, pageKind: "object" };
    const content = body.render(vars);
    return layout.render({ ...vars, content });
  };
  return {
    text: (input) => render(input),
    bytes: (input) => {
      assembler.begin();
      // a page whose text happens to hold a placeholder is rendered as text instead
      return assembler.assemble(render(input, deferred)) ?? Buffer.from(render(input), "utf8");
    },
    homeRow: homeRowRendererIn(env, base),
  };
}
