// Eleventy configuration of the steelyard site. Node cannot import TypeScript,
// so this loads the compiled plugin: run `npm run compile` first.
//   STEELYARD_RECORDS   folder of YAML records (default content/records)
//   STEELYARD_BASE_PATH folder the site is served from (default "/")
// The output folder is Eleventy's own: --output on its command line, the
// folder given to buildSite, or _site by default (STEELYARD_OUT, when set,
// overrides all three).
import path from "node:path";
import { fileURLToPath } from "node:url";

const { steelyardPlugin } = await import("./dist/site/plugin.js").catch((error) => {
  throw new Error(`the compiled site plugin is missing or broken (${error.message}); run "npm run compile" first`);
});

const packageRoot = path.dirname(fileURLToPath(import.meta.url));

export default function (eleventyConfig) {
  const basePath = process.env.STEELYARD_BASE_PATH || "/";
  eleventyConfig.addPlugin(steelyardPlugin, {
    recordsDir: path.resolve(process.env.STEELYARD_RECORDS || path.join(packageRoot, "content", "records")),
    basePath,
  });
  return {
    // the pages and layouts belong to the package, wherever the records are
    dir: {
      input: path.join(packageRoot, "content"),
      includes: "_includes",
      ...(process.env.STEELYARD_OUT ? { output: process.env.STEELYARD_OUT } : {}),
    },
    pathPrefix: basePath,
  };
}
