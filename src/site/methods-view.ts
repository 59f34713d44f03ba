import type { MethodDefinition } from "../methods/method.js";
import { describeDimension } from "../units/dimension.js";
import { constantAnchor } from "./constants-view.js";
import { renderTex } from "./katex.js";
import { doiLink, webLink, type SafeLink } from "./links.js";
import { plainName } from "./object-view.js";
import { unitSymbol } from "./unit-display.js";

export interface MethodView {
  readonly id: string;
  readonly anchor: string;
  readonly title: string;
  readonly summary: string;
  readonly source: { readonly cite: string; readonly links: readonly SafeLink[] };
  readonly inputs: ReadonlyArray<{
    readonly field: string;
    readonly slot: string;
    readonly symbolHtml: string;
    readonly description: string;
    readonly dimension: string;
    readonly optional: boolean;
  }>;
  readonly results: ReadonlyArray<{
    readonly name: string;
    readonly label: string;
    readonly symbolHtml: string;
    readonly description: string;
    readonly dimension: string;
    readonly unit: string;
  }>;
  readonly equations: ReadonlyArray<{ readonly results: string; readonly html: string }>;
  readonly assumptions: readonly string[];
  readonly constants: ReadonlyArray<{ readonly key: string; readonly anchor: string }>;
}

export function methodAnchor(id: string): string {
  return `method-${id}`;
}

export function methodView(m: MethodDefinition): MethodView {
  const links: SafeLink[] = [];
  if (m.source.doi) {
    const d = doiLink(m.source.doi);
    if (d) links.push(d);
  }
  if (m.source.url) {
    const u = webLink(m.source.url);
    if (u) links.push(u);
  }
  return {
    id: m.id,
    anchor: methodAnchor(m.id),
    title: m.title,
    summary: m.summary,
    source: { cite: m.source.cite, links },
    inputs: m.inputs.map((i) => ({
      field: i.field,
      slot: i.slot,
      symbolHtml: renderTex(i.symbol, false),
      description: i.description,
      dimension: describeDimension(i.dimension),
      optional: i.optional,
    })),
    results: m.results.map((r) => ({
      name: r.name,
      label: plainName(r.name),
      symbolHtml: renderTex(r.symbol, false),
      description: r.description,
      dimension: describeDimension(r.dimension),
      unit: unitSymbol(r.displayUnit),
    })),
    equations: m.equations.map((eq) => ({ results: eq.results.map(plainName).join(", "), html: renderTex(eq.latex, true) })),
    assumptions: m.assumptions,
    constants: m.constants.map((key) => ({ key, anchor: constantAnchor(key) })),
  };
}

export function methodsView(methods: readonly MethodDefinition[]): MethodView[] {
  return methods.map(methodView);
}
