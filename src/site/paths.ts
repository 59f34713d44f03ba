import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";
import path from "node:path";

/**
 * Folders of the steelyard package itself. This file sits two levels below
 * the package root both as source (src/site/) and compiled (dist/site/).
 */
export const PACKAGE_ROOT: string = fileURLToPath(new URL("../../", import.meta.url));

/** Pages, layouts and static assets of the site. */
export const CONTENT_DIR: string = path.join(PACKAGE_ROOT, "content");

/** The Eleventy configuration file. */
export const CONFIG_FILE: string = path.join(PACKAGE_ROOT, ".eleventy.js");

/** The KaTeX stylesheet and its fonts, copied into every site. */
export const KATEX_DIST: string = path.dirname(createRequire(import.meta.url).resolve("katex/dist/katex.min.css"));

/** The demo records shipped with the package. */
export const DEMO_RECORDS: string = path.join(CONTENT_DIR, "records");
