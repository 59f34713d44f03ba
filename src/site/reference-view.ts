import type { Reference } from "../audit/types.js";
import { doiLink, webLink, type SafeLink } from "./links.js";

/** A record field that may be a link: the link when it is a safe one, and always the text as typed. */
export interface MaybeLink {
  readonly text: string;
  readonly link?: SafeLink;
}

export interface ReferenceView {
  readonly cite: string;
  readonly locator?: string;
  readonly bibcode?: string;
  readonly doi?: MaybeLink;
  readonly url?: MaybeLink;
}

export function referenceView(ref: Reference): ReferenceView {
  const out: { -readonly [K in keyof ReferenceView]: ReferenceView[K] } = { cite: ref.cite };
  if (ref.locator) out.locator = ref.locator;
  if (ref.bibcode) out.bibcode = ref.bibcode;
  if (ref.doi) {
    const link = doiLink(ref.doi);
    out.doi = link ? { text: ref.doi, link } : { text: ref.doi };
  }
  if (ref.url) {
    const link = webLink(ref.url);
    out.url = link ? { text: ref.url, link } : { text: ref.url };
  }
  return out;
}
