import { describe, expect, it } from "vitest";
import type { ComparisonAudit, ResultAudit } from "../../src/audit/types.js";
import { budgetChart, comparisonChart, forestChart } from "../../src/site/charts.js";
import { startTags } from "./helpers/html-scan.js";

const MSUN_KG = 1.988409870698051e30;

function result(value: number, sigma: number, mc?: { median: number; p16: number; p84: number }): ResultAudit {
  return {
    name: "total_mass",
    value_si: value * MSUN_KG,
    sigma_si: sigma * MSUN_KG,
    sigma_plus_si: sigma * MSUN_KG,
    sigma_minus_si: sigma * MSUN_KG,
    unit_si: "kg",
    display_unit: "Msun",
    display_unit_latex: "M_{\\odot}",
    value,
    sigma,
    budget: [],
    ...(mc
      ? { mc: { draws: 1000, rejected: 0, median_si: mc.median * MSUN_KG, p16_si: mc.p16 * MSUN_KG, p84_si: mc.p84 * MSUN_KG, mean_si: mc.median * MSUN_KG, sd_si: sigma * MSUN_KG } }
      : {}),
  };
}

function published(kind: ComparisonAudit["published_kind"], value: number, sigma: number): ComparisonAudit {
  return {
    result: "total_mass",
    published_text: `${value} ± ${sigma} Msun`,
    published_kind: kind,
    published_value: value,
    published_plus: sigma,
    published_minus: sigma,
    published_unit: "Msun",
    published_si: value * MSUN_KG,
    published_plus_si: sigma * MSUN_KG,
    published_minus_si: sigma * MSUN_KG,
    difference_si: 0,
    ratio: 1,
    sigma_used_si: sigma * MSUN_KG,
    sigma_from: "published",
    z: 0,
    status: "consistent",
  };
}

/** x of each series' marker, read from the SVG. */
function markerX(svg: string): Record<string, number> {
  const out: Record<string, number> = {};
  const groups = svg.split('<g class="comparison-row').slice(1);
  for (const g of groups) {
    const series = /data-series="([^"]+)"/.exec(g)![1];
    const tag = startTags(g).find((t) => t.attributes.get("class") === "chart-marker")!;
    const a = tag.attributes;
    if (tag.name === "circle") out[series] = Number(a.get("cx"));
    else if (tag.name === "rect") out[series] = Number(a.get("x")) + Number(a.get("width")) / 2;
    else out[series] = Number(/^M([\d.]+)/.exec(a.get("d")!)![1]);
  }
  return out;
}

function whiskers(svg: string, series: string): number[] {
  const g = svg.split('<g class="comparison-row').find((part) => part.includes(`data-series="${series}"`))!;
  return startTags(g)
    .filter((t) => t.name === "line" && t.attributes.get("class") === "chart-whisker")
    .flatMap((t) => [Number(t.attributes.get("x1")), Number(t.attributes.get("x2"))]);
}

describe("uncertainty budget chart", () => {
  const svg = budgetChart(
    [
      { source: "parallax", label: "parallax", share: 0.25 },
      { source: "semimajor_axis", label: "semimajor <axis> & co", share: 0.75 },
      { source: "G", label: "G (CODATA 2018)", share: 0 },
    ],
    "m1-total_mass-budget",
    "total mass",
  );
  const bars = startTags(svg).filter((t) => t.attributes.get("class") === "chart-bar");

  it("draws one bar per source, largest share first, lengths in proportion to the shares", () => {
    const rows = startTags(svg).filter((t) => t.attributes.get("class") === "budget-row").map((t) => t.attributes.get("data-source"));
    expect(rows).toEqual(["semimajor_axis", "parallax", "G"]);
    const widths = bars.map((b) => Number(b.attributes.get("width")));
    expect(widths[0] / widths[1]).toBeCloseTo(3, 2);
    expect(widths[2]).toBe(0);
    // a full share fills the track
    const track = startTags(svg).find((t) => t.attributes.get("class") === "chart-track")!;
    expect(widths[0] / 0.75).toBeCloseTo(Number(track.attributes.get("width")), 0);
  });

  it("prints each share as text and escapes labels", () => {
    expect(svg).toContain(">75.0\u00a0%</text>");
    expect(svg).toContain(">semimajor &lt;axis&gt; &amp; co</text>");
    expect(svg).not.toContain("<axis>");
    expect(svg).toContain('<title id="m1-total_mass-budget-title">Share of the variance of total mass, by source</title>');
  });

  it("says so when there is no uncertainty to share", () => {
    expect(budgetChart([], "x", "total mass")).toContain("no uncertainty to share out");
  });
});

describe("published-against-recomputed chart", () => {
  it("places the markers in the order of their values and spans each interval", () => {
    const svg = comparisonChart(result(1.2, 0.05, { median: 1.19, p16: 1.14, p84: 1.25 }), published("measured", 1.0, 0.04), "c", "M☉");
    const x = markerX(svg);
    expect(x.published).toBeLessThan(x["Monte Carlo"]);
    expect(x["Monte Carlo"]).toBeLessThan(x["first order"]);
    // equal σ: equal whisker lengths on screen
    const [p1, p2] = whiskers(svg, "published");
    const [f1, f2] = whiskers(svg, "first order");
    expect((p2 - p1) / (f2 - f1)).toBeCloseTo(0.04 / 0.05, 2);
    // the marker sits in the middle of a symmetric interval
    expect(x.published).toBeCloseTo((p1 + p2) / 2, 0);
    // Monte Carlo whiskers run from the 16th to the 84th percentile around the median
    const [m1, m2] = whiskers(svg, "Monte Carlo");
    expect((x["Monte Carlo"] - m1) / (m2 - x["Monte Carlo"])).toBeCloseTo(0.05 / 0.06, 1);
  });

  it("draws a published upper limit as an arrow, an exact value as a bare marker, and skips Monte Carlo when absent", () => {
    const limit = comparisonChart(result(2, 0.1), published("upper-limit", 3, 0), "c", "M☉");
    expect(limit).toContain('data-series="published"');
    expect(limit).not.toContain('data-series="Monte Carlo"');
    const g = limit.split('<g class="comparison-row')[1];
    expect(g).toMatch(/<path class="chart-whisker"/);
    const exact = comparisonChart(result(2, 0.1), published("exact", 2.05, 0), "c", "M☉");
    expect(whiskers(exact, "published")).toEqual([]);
  });

  it("labels the axis with its unit and ticks that tell neighbours apart", () => {
    const svg = comparisonChart(result(1.2001, 0.0002), published("measured", 1.2, 0.0003), "c", "M☉");
    const ticks = [...svg.matchAll(/<text class="chart-tick"[^>]*>([^<]+)<\/text>/g)].map((m) => m[1]);
    expect(ticks.at(-1)).toBe("M☉");
    const numbers = ticks.slice(0, -1);
    expect(numbers.length).toBeGreaterThanOrEqual(3);
    expect(new Set(numbers).size).toBe(numbers.length);
  });
});

/** The markup of one forest row, from its <g> to its </g>; `key` as it appears escaped in the markup. */
function rowMarkup(svg: string, key: string): string {
  const part = svg.split('<g class="forest-row').find((p) => p.includes(`data-key="${key}"`))!;
  return part.slice(0, part.indexOf("</g>"));
}

describe("forest chart of the measurements behind a reference value", () => {
  const rows = [
    { key: "orbit-<a>&b", used: true, value: 1.0, low: 0.9, high: 1.2 },
    { key: "orbit-2", used: true, value: 1.1, low: 1.05, high: 1.15 },
    { key: "orbit-old", used: false, value: 1.4, low: 1.2, high: 1.6 },
  ];
  const svg = forestChart(rows, { value: 1.08, low: 1.04, high: 1.12 }, "reference-total_mass-forest", "Total <mass>", "M☉");
  const tags = startTags(svg);
  const groups = (cls: string) => tags.filter((t) => t.name === "g" && (t.attributes.get("class") ?? "").split(" ").includes(cls));
  /** The marker and whisker ends of one row, read from the markup between its <g> and the next. */
  function rowGeometry(key: string): { cx: number; x1: number; x2: number; hollow: boolean } {
    const t = startTags(rowMarkup(svg, key));
    const circle = t.find((x) => x.name === "circle")!;
    const line = t.find((x) => x.name === "line")!;
    return {
      cx: Number(circle.attributes.get("cx")),
      x1: Number(line.attributes.get("x1")),
      x2: Number(line.attributes.get("x2")),
      hollow: circle.attributes.get("class") === "chart-marker-hollow",
    };
  }

  it("draws one row per measurement, in the order given, and marks the ones not combined", () => {
    expect(groups("forest-row").map((g) => g.attributes.get("data-key"))).toEqual(["orbit-<a>&b", "orbit-2", "orbit-old"]);
    expect(groups("forest-excluded").map((g) => g.attributes.get("data-key"))).toEqual(["orbit-old"]);
    expect(rowGeometry("orbit-old").hollow).toBe(true);
    expect(rowGeometry("orbit-2").hollow).toBe(false);
    expect(svg).toContain(">orbit-old (not used)</text>");
  });

  it("draws asymmetric error bars to scale and the band over the combined interval", () => {
    const a = rowGeometry("orbit-&lt;a&gt;&amp;b");
    // σ₊ = 0.2 and σ₋ = 0.1: the bar reaches twice as far to the right of the marker as to the left
    expect((a.x2 - a.cx) / (a.cx - a.x1)).toBeCloseTo(2, 1);
    const b = rowGeometry("orbit-2");
    const band = tags.find((t) => t.attributes.get("class") === "forest-band")!;
    const bx = Number(band.attributes.get("x"));
    const bw = Number(band.attributes.get("width"));
    // the band (1.04 to 1.12, 0.08 wide) against orbit-2's bar (1.05 to 1.15, 0.10 wide) on the same axis
    expect(bw / (b.x2 - b.x1)).toBeCloseTo(0.8, 1);
    expect(bx).toBeLessThan(b.x1);
    const centre = tags.find((t) => t.attributes.get("class") === "forest-centre")!;
    expect(Number(centre.attributes.get("x1"))).toBeCloseTo(bx + bw / 2, 0);
    expect(groups("forest-combined")[0].attributes.get("data-value")).toBe("1.08");
  });

  it("escapes every label and the title", () => {
    expect(svg).not.toContain("<a>");
    expect(svg).not.toContain("<mass>");
    expect(svg).toContain(">orbit-&lt;a&gt;&amp;b</text>");
    expect(svg).toContain('data-key="orbit-&lt;a&gt;&amp;b"');
    expect(svg).toContain("<title id=\"reference-total_mass-forest-title\">Total &lt;mass&gt;</title>");
  });

  it("shortens long labels on the chart and keeps them whole in the row's tooltip", () => {
    const long = "a-very-long-measurement-key-from-a-survey";
    const s = forestChart([{ key: long, used: true, value: 1, low: 0.9, high: 1.1 }, { key: "b", used: true, value: 1, low: 1, high: 1 }], null, "f", "t", "");
    expect(s).toContain(`<title>${long}</title>`);
    expect(s).toContain(">a-very-long-measurement…</text>");
    // no uncertainty: a marker without a bar; no combined value: no band
    expect(startTags(rowMarkup(s, "b")).filter((t) => t.name === "line")).toEqual([]);
    expect(startTags(rowMarkup(s, "b")).filter((t) => t.name === "circle")).toHaveLength(1);
    expect(s).not.toContain("forest-band");
  });
});
