/**
 * Chart specifications for the browser: plain data the page's own script
 * (templates/assets/charts.js) hands to Chart.js. Traces are downsampled here
 * with LTTB so a page stays light however long the raw sweep; the raw files
 * are linked for full resolution. A wafer page carries its charts packed
 * (chartDataJson: steps of a quarter pixel, delta-coded), not as these specs.
 */
import { lttb } from "../analyse/numeric/lttb.ts";
import { sig6 } from "../model/format.ts";

export interface ChartSeries {
  label: string;
  /** [x, y] pairs. */
  points: [number, number][];
  /** Draw as a line (true) or as markers (false). */
  line: boolean;
  /**
   * Role picks colour, marker shape and dash from the site palette: data, second … fifth for series
   * of equal rank (distinct shapes and colours), fit, reference, "muted" (hollow grey: points shown
   * but not judged); "flag" rings points flagged by a rule.
   */
  role?: "data" | "fit" | "second" | "third" | "fourth" | "fifth" | "reference" | "muted" | "flag";
  /** Per point (same order as `points`): a link opened when the point is clicked (e.g. the wafer's page). */
  links?: string[];
  /** Per point: a tooltip line naming it (e.g. "TQ-2403 · run TQ24-A"). */
  tips?: string[];
  /** "y2": drawn against the right-hand axis of a chart with `y2`. */
  axis?: "y2";
}

/** One of several sets of series a chart switches between (e.g. one per gate voltage). */
export interface ChartView {
  /** The option's text in the page's list. */
  label: string;
  /** A sentence about this view, shown under the chart while it is selected. */
  caption?: string;
  series: ChartSeries[];
}

export interface ChartLimit {
  axis: "x" | "y";
  min?: number;
  max?: number;
  label: string;
}

export interface ChartSpec {
  id: string;
  title: string;
  /** `dates: true`: x values are days since 1970-01-01 (UTC), ticks and tooltips show YYYY-MM-DD. */
  x: { label: string; log?: boolean; dates?: boolean };
  y: { label: string; log?: boolean };
  /** A second value axis on the right, for series with `axis: "y2"` (own unit). */
  y2?: { label: string; log?: boolean };
  /** Series drawn (empty when `views` is given). */
  series: ChartSeries[];
  /** Views chosen with a <select> above the chart (the template writes it; `viewLabel` labels it); `view` is the one drawn first. */
  views?: ChartView[];
  view?: number;
  viewLabel?: string;
  /** Target limits drawn as lines, pass region shaded. */
  limits?: ChartLimit[];
  /** A short text alternative for screen readers. */
  summary: string;
}

/** Roles for series of equal rank (devices, runs, reactors), in order: each its own colour and marker. */
export const SERIES_ROLES = ["data", "second", "third", "fourth", "fifth"] as const;

/** Points kept per trace on a page. */
export const TRACE_POINTS = 300;

export function traceSeries(label: string, x: ArrayLike<number>, y: ArrayLike<number>, role: ChartSeries["role"] = "data", max = TRACE_POINTS): ChartSeries {
  const d = lttb(x, y, max);
  return { label, points: d.x.map((v, i) => [round(v), round(d.y[i])]), line: true, role };
}

export function markerSeries(label: string, pts: [number, number][], role: ChartSeries["role"] = "data"): ChartSeries {
  return { label, points: pts.map(([a, b]) => [round(a), round(b)]), line: false, role };
}

/** Six significant digits (format.ts `sig6`) is plenty on screen and keeps the JSON small; non-finite values become 0. */
export function round(v: number): number {
  return Number.isFinite(v) ? sig6(v) : 0;
}

/** Serialises JSON for a <script type="application/json"> block: `<` is escaped so "</script>" in a string cannot close the tag. */
export function jsonForScript(value: unknown): string {
  // One pass over the (often megabyte-long) text instead of one per character.
  return JSON.stringify(value).replace(/[<>&\u2028\u2029]/g, (c) => SCRIPT_ESCAPES[c]);
}

const SCRIPT_ESCAPES: Record<string, string> = { "<": "\\u003c", ">": "\\u003e", "&": "\\u0026", "\u2028": "\\u2028", "\u2029": "\\u2029" };

/**
 * Levels a series' span is cut into on each axis when the page's chart data
 * are packed (chartDataJson). A wafer page's chart is at most about 1100 px
 * wide (main is 72rem, charts take its width) and 300 px tall (420 px for a
 * tall one): 2200 levels across and 840 up give at least two levels per
 * pixel, so a packed value lies within a quarter of a pixel of the series'
 * own value, a shift no reader can see, while a number costs one to three
 * characters instead of the six to nine of a four- to six-digit decimal.
 * The tooltips show three significant digits (charts.js `sci`), coarser still.
 */
export const PACK_LEVELS = { x: 2200, y: 840 } as const;

/**
 * One coordinate of a series on the page (chartDataJson): [step, first, deltas]
 * or, on a logarithmic axis, [step, first, deltas, 1] with values quantised in
 * log10 (step in decades). Value i is k_i × step (10^(k_i × step) on a log
 * axis) where k_0 = first and k_i = k_(i−1) + delta_i.
 */
export type PackedAxis = [number, number, string] | [number, number, string, 1];

/** A series as the page carries it: `points` replaced by `x` and `y` (PackedAxis); empty series keep `points: []`. */
export type PackedSeries = Omit<ChartSeries, "points"> & ({ x: PackedAxis; y: PackedAxis } | { points: [] });

/** The largest of 1, 2 and 5 × 10ⁿ not above `t` (t > 0), as the exact decimal's double ("2e-3"), so k × step prints cleanly. */
export function niceStep(t: number): number {
  const e = Math.floor(Math.log10(t));
  for (const f of [5, 2, 1]) {
    const s = Number(`${f}e${e}`);
    if (s <= t * (1 + 1e-12)) return s;
  }
  return Number(`5e${e - 1}`);
}

/** k × step without binary noise for steps below one: k / (1/step), 1/step being a whole number for 1, 2, 5 × 10⁻ⁿ. */
export function stepValue(k: number, step: number): number {
  return step < 1 ? k / Math.round(1 / step) : k * step;
}

const DIGITS = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";

/**
 * Whole numbers as text, each as a variable-length quantity in base 32
 * (little-endian five-bit groups, a character of the second half of DIGITS
 * meaning "more groups follow") after zigzag mapping (0, −1, 1, −2 … → 0, 1,
 * 2, 3 …), as in Protocol Buffers' varint and sint encodings. No separators:
 * a delta below 16 in size takes one character, below 512 two. The alphabet
 * is RFC 4648's URL-safe base64 one: nothing JSON or HTML would escape.
 */
export function packInts(values: readonly number[]): string {
  let out = "";
  for (const d of values) {
    let z = d < 0 ? -2 * d - 1 : 2 * d;
    while (z >= 32) {
      out += DIGITS[32 + (z % 32)];
      z = Math.floor(z / 32);
    }
    out += DIGITS[z];
  }
  return out;
}

/**
 * The step for values drawn on an axis spanning [lo, hi] (in log10 on a log
 * axis): niceStep(span / levels); an axis with a single value (one marker, a
 * flat line) gets steps of its own size over the levels, so it keeps as many digits.
 */
export function packStep(lo: number, hi: number, levels: number): number {
  const size = hi > lo ? hi - lo : Math.max(Math.abs(lo), Math.abs(hi));
  return size > 0 ? niceStep(size / levels) : 1;
}

/** Non-finite values drawn as 0 (as `round` does); on a log axis, log10 when every value is positive (else drawn linear). */
function axisValues(values: readonly number[], log: boolean | undefined): { v: number[]; log: boolean } {
  const finite = values.map((v) => (Number.isFinite(v) ? v : 0));
  const inLog = !!log && finite.every((v) => v > 0);
  return { v: inLog ? finite.map(Math.log10) : finite, log: inLog };
}

/** One coordinate packed (PackedAxis) to a given step (packStep), in log10 when `log` and every value is positive. */
export function packAxis(values: readonly number[], step: number, log = false): PackedAxis {
  const a = axisValues(values, log);
  const k = a.v.map((x) => Math.round(x / step));
  const deltas = k.slice(1).map((x, i) => x - k[i]);
  return a.log ? [step, k[0], packInts(deltas), 1] : [step, k[0], packInts(deltas)];
}

/**
 * Packs the series drawn together (a chart's series, or one view's): the
 * step of each axis comes from the span of everything drawn on it there, as
 * the chart's pixels do (the axis spans at least that), so a lone marker is
 * as fine as the line beside it.
 */
function packDrawn(series: readonly ChartSeries[], spec: ChartSpec): PackedSeries[] {
  const yLog = (s: ChartSeries) => (s.axis === "y2" ? spec.y2?.log : spec.y.log);
  const steps = new Map<string, number>();
  const stepOf = (key: string, levels: number, pick: (s: ChartSeries) => number[] | undefined): number => {
    let step = steps.get(key);
    if (step !== undefined) return step;
    let lo = Infinity;
    let hi = -Infinity;
    for (const s of series) {
      const vals = pick(s);
      if (!vals) continue;
      for (const x of vals) {
        if (x < lo) lo = x;
        if (x > hi) hi = x;
      }
    }
    step = lo <= hi ? packStep(lo, hi, levels) : 1;
    steps.set(key, step);
    return step;
  };
  return series.map((s) => {
    const { points, ...rest } = s;
    if (points.length === 0) return { ...rest, points: [] };
    const xs = points.map((p) => p[0]);
    const ys = points.map((p) => p[1]);
    const xa = axisValues(xs, spec.x.log);
    const ya = axisValues(ys, yLog(s));
    // Series drawn linear on a log axis (a value ≤ 0) share a step of their own.
    const xStep = stepOf(`x${xa.log}`, PACK_LEVELS.x, (o) => {
      const a = axisValues(
        o.points.map((p) => p[0]),
        spec.x.log,
      );
      return o.points.length && a.log === xa.log ? a.v : undefined;
    });
    const yKey = `${s.axis ?? "y"}${ya.log}`;
    const yStep = stepOf(yKey, PACK_LEVELS.y, (o) => {
      const a = axisValues(
        o.points.map((p) => p[1]),
        yLog(o),
      );
      return o.points.length && `${o.axis ?? "y"}${a.log}` === yKey ? a.v : undefined;
    });
    return { ...rest, x: packAxis(xs, xStep, spec.x.log), y: packAxis(ys, yStep, yLog(s)) };
  });
}

/**
 * The charts as the page's chart script reads them (templates/assets/charts.js
 * unpacks them once on load): every series' points packed (packAxis, to a
 * quarter of a pixel: PACK_LEVELS), and without what the script never reads
 * (the title, summary and view labels are written into the page's HTML by the
 * chart macro, not drawn from the JSON). Only the page's chart data: results.json,
 * the exports and the raw copies keep their full figures.
 */
export function chartDataJson(charts: readonly ChartSpec[]): string {
  return jsonForScript(
    charts.map((c) => {
      const { title: _title, summary: _summary, viewLabel: _viewLabel, views, series, ...rest } = c;
      return {
        ...rest,
        series: packDrawn(series, c),
        ...(views ? { views: views.map((v) => ({ ...(v.caption !== undefined ? { caption: v.caption } : {}), series: packDrawn(v.series, c) })) } : {}),
      };
    }),
  );
}
