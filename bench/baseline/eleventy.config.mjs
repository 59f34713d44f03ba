// A bare Eleventy project: the yardstick for our build. One Nunjucks template
// paginates a data array of N small items into N pages through a layout of
// about 5 KB, with no plugin, no filters and no KaTeX.
//
// The data file (_data/items.json) is written by bench/run.mjs into a copy of
// bench/baseline/input/ before each size; --input and --output come from the
// command line.
export default function (eleventyConfig) {
  return {
    dir: { includes: "_includes", data: "_data" },
    templateFormats: ["njk"],
    htmlTemplateEngine: "njk",
  };
}
