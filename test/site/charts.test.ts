import { describe, expect, it } from "vitest";
import type { ComparisonAudit, ResultAudit } from "../../src/audit/types.js";
import { budgetChart, comparisonChart } from "../../src/site/charts.js";
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
