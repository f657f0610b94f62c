/**
 * Chart specifications for the browser: plain data the page's own script
 * (templates/assets/charts.js) hands to Chart.js. Traces are downsampled here
 * with LTTB so a page stays light however long the raw sweep; the raw files
 * are linked for full resolution.
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
