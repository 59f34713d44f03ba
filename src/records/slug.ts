/**
 * Object ids and measurement keys become file and page names, so they are
 * restricted to lower-case letters, digits and hyphens, starting with a letter
 * or digit. The rule alone keeps "..", "/" and "\" out of every output path.
 */
export const SLUG_PATTERN = /^[a-z0-9][a-z0-9-]*$/;

/** Longest accepted slug: keeps every output file name well under common file-system limits. */
export const SLUG_MAX_LENGTH = 100;

export function isSlug(text: string): boolean {
  return text.length <= SLUG_MAX_LENGTH && SLUG_PATTERN.test(text);
}

/** A slug suggestion for a text that breaks the rule ("LRX 0412 AB" → "lrx-0412-ab"); "" when nothing is left. */
export function slugify(text: string): string {
  return text
    .normalize("NFKD")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, SLUG_MAX_LENGTH)
    .replace(/-+$/, "");
}
