/**
 * Every class name a style sheet's selectors mention (comments and strings
 * taken out first). Any sheet, nested at-rules included: the text before each
 * "{" is read as a selector, and at-rule preludes are skipped.
 */
export function classesIn(css: string): Set<string> {
  const bare = css.replace(/\/\*[^]*?\*\//g, "").replace(/"[^"]*"|'[^']*'/g, '""');
  const out = new Set<string>();
  for (const part of bare.split("}")) {
    for (const selector of part.split("{").slice(0, -1)) {
      if (selector.trim().startsWith("@")) continue;
      // what follows the last ";" of a block is the next selector
      const text = selector.slice(selector.lastIndexOf(";") + 1);
      for (const m of text.matchAll(/\.(-?[A-Za-z_][\w-]*)/g)) out.add(m[1]);
    }
  }
  return out;
}
