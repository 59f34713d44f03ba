import type { BudgetEntry, ComparisonAudit, ResultAudit } from "../audit/types.js";
import { formatPlain, formatShare } from "./display.js";
import { escapeHtml } from "./escape.js";
import { displayScale } from "./unit-display.js";

/**
 * Small inline SVG charts. Every text piece goes through escapeHtml and every
 * number through a fixed-decimal writer, so the returned markup is safe to
 * insert as is. Colours come from the stylesheet (classes), so the charts
 * follow the light, dark and print schemes; shapes and words tell the series
 * apart, never colour alone.
 */

/**
 * A coordinate to one decimal, without a trailing ".0": the text of
 * (Math.round(10x) / 10).toFixed(1) less ".0", written from the integer of tenths.
 */
const n = (x: number): string => {
  const tenths = Math.round(x * 10);
  if (!(Math.abs(tenths) < 1e15)) return (tenths / 10).toFixed(1).replace(/\.0$/, "");
  const whole = Math.trunc(tenths / 10);
  const rest = Math.abs(tenths - whole * 10);
  const sign = tenths < 0 && whole === 0 ? "-" : "";
  return rest === 0 ? `${sign}${whole === 0 ? 0 : whole}` : `${sign}${whole}.${rest}`;
};

/** Horizontal bars: each source's share of the first-order variance, largest first. */
export function budgetChart(entries: readonly BudgetEntry[], idPrefix: string, resultLabel: string): string {
  const rows = [...entries].filter((e) => Number.isFinite(e.share)).sort((a, b) => b.share - a.share);
  const rowHeight = 20;
  const labelWidth = 130;
  const barWidth = 170;
  const width = labelWidth + barWidth + 60;
  const height = Math.max(rows.length, 1) * rowHeight + 4;
  const titleId = `${idPrefix}-title`;
  const parts: string[] = [
    `<svg class="chart budget-chart" id="${escapeHtml(idPrefix)}" viewBox="0 0 ${width} ${height}" role="img" aria-labelledby="${escapeHtml(titleId)}">`,
    `<title id="${escapeHtml(titleId)}">${escapeHtml(`Share of the variance of ${resultLabel}, by source`)}</title>`,
  ];
  if (rows.length === 0) {
    parts.push(`<text class="chart-label" x="0" y="14">no uncertainty to share out</text>`);
  }
  rows.forEach((e, i) => {
    const y = i * rowHeight + 2;
    const share = Math.min(Math.max(e.share, 0), 1);
    const w = share * barWidth;
    parts.push(
      `<g class="budget-row" data-source="${escapeHtml(e.source)}" data-share="${e.share}">`,
      `<text class="chart-label" x="${labelWidth - 6}" y="${n(y + 13)}" text-anchor="end">${escapeHtml(e.label)}</text>`,
      `<rect class="chart-track" x="${labelWidth}" y="${n(y + 3)}" width="${barWidth}" height="12"></rect>`,
      `<rect class="chart-bar" x="${labelWidth}" y="${n(y + 3)}" width="${n(w)}" height="12"></rect>`,
      `<text class="chart-value" x="${labelWidth + barWidth + 6}" y="${n(y + 13)}">${escapeHtml(formatShare(e.share))}</text>`,
      `</g>`,
    );
  });
  parts.push(`</svg>`);
  return parts.join("");
}

/** One series of the comparison chart, in the display unit. */
interface Series {
  readonly label: string;
  readonly shape: "square" | "circle" | "diamond";
  readonly kind: "interval" | "upper-limit" | "lower-limit" | "point";
  readonly value: number;
  readonly low: number;
  readonly high: number;
  readonly cls: string;
}

/**
 * The value range of a chart: the finite values' extent (0 to 1 when there
 * are none), widened when it is a single point, then by `margin` of its span
 * on each side.
 */
function paddedRange(values: readonly number[], margin: number): [number, number] {
  const finite = values.filter(Number.isFinite);
  let lo = finite.length > 0 ? Math.min(...finite) : 0;
  let hi = finite.length > 0 ? Math.max(...finite) : 1;
  if (!(hi > lo)) {
    const pad = Math.abs(lo) * 0.05 || 1;
    lo -= pad;
    hi += pad;
  }
  const span = hi - lo;
  return [lo - span * margin, hi + span * margin];
}

function niceStep(span: number): number {
  const raw = span / 4;
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 2.5 ? 2.5 : f <= 5 ? 5 : 10) * p;
}

/** Tick text with just enough digits to tell neighbouring ticks apart. */
function tickLabel(t: number, step: number, magnitude: number): string {
  const stepExp = Math.floor(Math.log10(step));
  const extra = Math.abs(step / 10 ** stepExp - 2.5) < 1e-9 ? 1 : 0;
  const magExp = Math.floor(Math.log10(magnitude));
  if (magExp >= -3 && magExp <= 4) {
    const decimals = Math.max(0, -stepExp + extra);
    return t.toFixed(decimals).replace(/^-/, "\u2212").replace(/^\u22120(\.0*)?$/, (z) => z.slice(1));
  }
  return formatPlain(t, Math.max(1, magExp - stepExp + 1 + extra));
}

function marker(shape: Series["shape"], x: number, y: number, cls: string): string {
  if (shape === "circle") return `<circle class="${cls}" cx="${n(x)}" cy="${n(y)}" r="4.5"></circle>`;
  if (shape === "square") return `<rect class="${cls}" x="${n(x - 4)}" y="${n(y - 4)}" width="8" height="8"></rect>`;
  return `<path class="${cls}" d="M${n(x)} ${n(y - 5.5)}L${n(x + 5.5)} ${n(y)}L${n(x)} ${n(y + 5.5)}L${n(x - 5.5)} ${n(y)}Z"></path>`;
}

/**
 * Published against recomputed values with their intervals on one axis: the
 * published value (square), the first-order result ± 1σ (circle), and the
 * Monte Carlo median with its 16th–84th percentiles (diamond).
 */
export function comparisonChart(result: ResultAudit, comparison: ComparisonAudit, idPrefix: string, unitSymbol: string): string {
  const scale = displayScale(result);
  const series: Series[] = [];
  const pv = comparison.published_si / scale;
  if (comparison.published_kind === "upper-limit" || comparison.published_kind === "lower-limit") {
    series.push({ label: "published", shape: "square", kind: comparison.published_kind, value: pv, low: pv, high: pv, cls: "series-published" });
  } else {
    series.push({
      label: "published",
      shape: "square",
      kind: comparison.published_kind === "exact" ? "point" : "interval",
      value: pv,
      low: (comparison.published_si - comparison.published_minus_si) / scale,
      high: (comparison.published_si + comparison.published_plus_si) / scale,
      cls: "series-published",
    });
  }
  series.push({
    label: "first order",
    shape: "circle",
    kind: "interval",
    value: result.value_si / scale,
    low: (result.value_si - result.sigma_minus_si) / scale,
    high: (result.value_si + result.sigma_plus_si) / scale,
    cls: "series-first-order",
  });
  if (result.mc) {
    series.push({
      label: "Monte Carlo",
      shape: "diamond",
      kind: "interval",
      value: result.mc.median_si / scale,
      low: result.mc.p16_si / scale,
      high: result.mc.p84_si / scale,
      cls: "series-monte-carlo",
    });
  }
  const [lo, hi] = paddedRange(series.flatMap((s) => [s.low, s.high, s.value]), 0.12);

  const labelWidth = 100;
  const plotWidth = 240;
  const width = labelWidth + plotWidth + 20;
  const rowHeight = 24;
  const top = 6;
  const axisY = top + series.length * rowHeight + 4;
  const height = axisY + 30;
  const xOf = (v: number): number => labelWidth + ((v - lo) / (hi - lo)) * plotWidth;
  const titleId = `${idPrefix}-title`;
  const parts: string[] = [
    `<svg class="chart comparison-chart" id="${escapeHtml(idPrefix)}" viewBox="0 0 ${width} ${height}" role="img" aria-labelledby="${escapeHtml(titleId)}">`,
    `<title id="${escapeHtml(titleId)}">${escapeHtml(`Published and recomputed ${result.name.replace(/_/g, " ")} with 1σ intervals${unitSymbol ? ` (${unitSymbol})` : ""}`)}</title>`,
  ];
  series.forEach((s, i) => {
    const y = top + i * rowHeight + rowHeight / 2;
    parts.push(`<g class="comparison-row ${s.cls}" data-series="${escapeHtml(s.label)}" data-value="${s.value}" data-low="${s.low}" data-high="${s.high}">`);
    parts.push(`<text class="chart-label" x="${labelWidth - 8}" y="${n(y + 4)}" text-anchor="end">${escapeHtml(s.label)}</text>`);
    if (s.kind === "interval") {
      const x1 = xOf(s.low);
      const x2 = xOf(s.high);
      parts.push(
        `<line class="chart-whisker" x1="${n(x1)}" y1="${n(y)}" x2="${n(x2)}" y2="${n(y)}"></line>`,
        `<line class="chart-whisker" x1="${n(x1)}" y1="${n(y - 5)}" x2="${n(x1)}" y2="${n(y + 5)}"></line>`,
        `<line class="chart-whisker" x1="${n(x2)}" y1="${n(y - 5)}" x2="${n(x2)}" y2="${n(y + 5)}"></line>`,
      );
    } else if (s.kind === "upper-limit" || s.kind === "lower-limit") {
      const x = xOf(s.value);
      const end = s.kind === "upper-limit" ? labelWidth + 4 : labelWidth + plotWidth - 4;
      const dir = s.kind === "upper-limit" ? 1 : -1;
      parts.push(
        `<line class="chart-whisker" x1="${n(x)}" y1="${n(y)}" x2="${n(end)}" y2="${n(y)}"></line>`,
        `<path class="chart-whisker" d="M${n(end + dir * 6)} ${n(y - 4)}L${n(end)} ${n(y)}L${n(end + dir * 6)} ${n(y + 4)}"></path>`,
      );
    }
    parts.push(marker(s.shape, xOf(s.value), y, "chart-marker"));
    parts.push(`</g>`);
  });
  parts.push(...valueAxis({ lo, hi, xOf, labelWidth, plotWidth, axisY, unitSymbol }));
  parts.push(`</svg>`);
  return parts.join("");
}

/** One measurement in a forest chart, in the display unit. */
export interface ForestRow {
  readonly key: string;
  /** Combined into the reference value (drawn filled) or not (hollow, greyed, labelled). */
  readonly used: boolean;
  readonly value: number;
  /** value − σ₋ and value + σ₊; equal to value when there is no uncertainty. */
  readonly low: number;
  readonly high: number;
}

/** The combined value and its 1σ interval, in the display unit. */
export interface ForestBand {
  readonly value: number;
  readonly low: number;
  readonly high: number;
}

const FOREST_LABEL_CHARS = 24;

function shortLabel(text: string): string {
  return text.length > FOREST_LABEL_CHARS ? `${text.slice(0, FOREST_LABEL_CHARS - 1)}\u2026` : text;
}

/**
 * A forest chart: one row per measurement with its recomputed value and its
 * (asymmetric) 1σ error bar, and the combined value as a shaded vertical band
 * (its 1σ interval) with a line at the value. Measurements that were not
 * combined are drawn hollow and greyed, and their label says so.
 */
export function forestChart(rows: readonly ForestRow[], band: ForestBand | null, idPrefix: string, title: string, unitSymbol: string): string {
  const shown = rows.filter((r) => Number.isFinite(r.value));
  const ends = shown.flatMap((r) => [r.low, r.high, r.value]);
  if (band) ends.push(band.low, band.high, band.value);
  const [lo, hi] = paddedRange(ends, 0.08);

  const labelWidth = 150;
  const plotWidth = 240;
  const width = labelWidth + plotWidth + 20;
  const rowHeight = 22;
  const top = 6;
  const plotBottom = top + Math.max(shown.length, 1) * rowHeight;
  const axisY = plotBottom + 4;
  const height = axisY + 30;
  const xOf = (v: number): number => labelWidth + ((v - lo) / (hi - lo)) * plotWidth;
  const titleId = `${idPrefix}-title`;
  const parts: string[] = [
    `<svg class="chart forest-chart" id="${escapeHtml(idPrefix)}" viewBox="0 0 ${width} ${height}" role="img" aria-labelledby="${escapeHtml(titleId)}">`,
    `<title id="${escapeHtml(titleId)}">${escapeHtml(title)}</title>`,
  ];
  if (band) {
    const x1 = xOf(Math.min(band.low, band.high));
    const x2 = xOf(Math.max(band.low, band.high));
    parts.push(
      `<g class="forest-combined" data-value="${band.value}" data-low="${band.low}" data-high="${band.high}">`,
      `<rect class="forest-band" x="${n(x1)}" y="${top}" width="${n(Math.max(x2 - x1, 0.5))}" height="${plotBottom - top}"></rect>`,
      `<line class="forest-centre" x1="${n(xOf(band.value))}" y1="${top}" x2="${n(xOf(band.value))}" y2="${plotBottom}"></line>`,
      `</g>`,
    );
  }
  shown.forEach((r, i) => {
    const y = top + i * rowHeight + rowHeight / 2;
    const label = r.used ? r.key : `${r.key} (not used)`;
    parts.push(
      `<g class="forest-row ${r.used ? "forest-used" : "forest-excluded"}" data-key="${escapeHtml(r.key)}" data-used="${r.used}" data-value="${r.value}" data-low="${r.low}" data-high="${r.high}">`,
      `<title>${escapeHtml(label)}</title>`,
      `<text class="chart-label" x="${labelWidth - 8}" y="${n(y + 4)}" text-anchor="end">${escapeHtml(shortLabel(label))}</text>`,
    );
    if (r.high > r.low) {
      const x1 = xOf(r.low);
      const x2 = xOf(r.high);
      parts.push(
        `<line class="chart-whisker" x1="${n(x1)}" y1="${n(y)}" x2="${n(x2)}" y2="${n(y)}"></line>`,
        `<line class="chart-whisker" x1="${n(x1)}" y1="${n(y - 5)}" x2="${n(x1)}" y2="${n(y + 5)}"></line>`,
        `<line class="chart-whisker" x1="${n(x2)}" y1="${n(y - 5)}" x2="${n(x2)}" y2="${n(y + 5)}"></line>`,
      );
    }
    parts.push(`<circle class="${r.used ? "chart-marker" : "chart-marker-hollow"}" cx="${n(xOf(r.value))}" cy="${n(y)}" r="4.5"></circle>`);
    parts.push(`</g>`);
  });
  parts.push(...valueAxis({ lo, hi, xOf, labelWidth, plotWidth, axisY, unitSymbol }));
  parts.push(`</svg>`);
  return parts.join("");
}

/** The horizontal value axis shared by the comparison and forest charts: a line, a few round ticks, the unit. */
function valueAxis(a: {
  lo: number;
  hi: number;
  xOf: (v: number) => number;
  labelWidth: number;
  plotWidth: number;
  axisY: number;
  unitSymbol?: string;
}): string[] {
  const { lo, hi, xOf, labelWidth, plotWidth, axisY, unitSymbol } = a;
  const parts = [`<line class="chart-axis" x1="${labelWidth}" y1="${axisY}" x2="${labelWidth + plotWidth}" y2="${axisY}"></line>`];
  const step = niceStep(hi - lo);
  if (Number.isFinite(step) && step > 0) {
    for (let t = Math.ceil(lo / step) * step, k = 0; t <= hi && k < 12; t += step, k++) {
      const x = xOf(t);
      const label = tickLabel(Math.abs(t) < step * 1e-9 ? 0 : t, step, Math.max(Math.abs(lo), Math.abs(hi)));
      parts.push(
        `<line class="chart-axis" x1="${n(x)}" y1="${axisY}" x2="${n(x)}" y2="${axisY + 4}"></line>`,
        `<text class="chart-tick" x="${n(x)}" y="${axisY + 16}" text-anchor="middle">${escapeHtml(label)}</text>`,
      );
    }
  }
  if (unitSymbol) {
    parts.push(`<text class="chart-tick" x="${labelWidth + plotWidth}" y="${axisY + 28}" text-anchor="end">${escapeHtml(unitSymbol)}</text>`);
  }
  return parts;
}
