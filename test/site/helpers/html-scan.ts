import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";

/** Every file under `dir`, as paths relative to it with forward slashes. */
export function listFiles(dir: string): string[] {
  const out: string[] = [];
  const walk = (sub: string): void => {
    for (const name of readdirSync(path.join(dir, sub))) {
      const rel = sub ? `${sub}/${name}` : name;
      if (statSync(path.join(dir, rel)).isDirectory()) walk(rel);
      else out.push(rel);
    }
  };
  walk("");
  return out.sort();
}

export function readText(dir: string, rel: string): string {
  return readFileSync(path.join(dir, rel), "utf8");
}

/** Decodes the character references the site's templates and escapers write. */
export function decodeEntities(text: string): string {
  return text
    .replace(/&#(\d+);/g, (_m, n: string) => String.fromCodePoint(Number(n)))
    .replace(/&#x([0-9a-f]+);/gi, (_m, n: string) => String.fromCodePoint(parseInt(n, 16)))
    .replace(/&quot;/g, '"')
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");
}

export interface Tag {
  readonly name: string;
  readonly attributes: ReadonlyMap<string, string>;
  readonly source: string;
}

const TAG = /<([a-zA-Z][a-zA-Z0-9-]*)((?:\s+[^\s=>"'\/]+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s>"']+))?)*)\s*\/?>/g;
const ATTRIBUTE = /([^\s=>"'\/]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s>"']+)))?/g;

/** Start tags with their attributes (values decoded). Good enough for the markup our own templates write. */
export function startTags(html: string): Tag[] {
  const tags: Tag[] = [];
  for (const m of html.matchAll(TAG)) {
    const attributes = new Map<string, string>();
    for (const a of (m[2] ?? "").matchAll(ATTRIBUTE)) {
      attributes.set(a[1].toLowerCase(), decodeEntities(a[2] ?? a[3] ?? a[4] ?? ""));
    }
    tags.push({ name: m[1].toLowerCase(), attributes, source: m[0] });
  }
  return tags;
}

/** Text content between tags, decoded, with the tags removed (script and style bodies included). */
export function textContent(html: string): string {
  return decodeEntities(html.replace(/<[^>]*>/g, " "));
}
