/**
 * Individuals (X) control chart with limits estimated from the average moving range.
 *
 * Definition (Shewhart individuals chart, moving-range estimate of σ):
 *   CL  = mean of the baseline values x_b … x_e
 *   MR_i = |x_i − x_{i−1}|, for consecutive points i = b+1 … e of the baseline
 *   σ̂   = MR̄ / d₂, with d₂ = 1.128 (the bias constant for ranges of n = 2)
 *   UCL = CL + 3σ̂, LCL = CL − 3σ̂; zone edges at CL ± 1σ̂ and CL ± 2σ̂.
 * References: Shewhart, Economic Control of Quality of Manufactured Product (1931);
 * NIST/SEMATECH e-Handbook of Statistical Methods §6.3; d₂ = 1.128 as tabulated in
 * Montgomery, Introduction to Statistical Quality Control (REFERENCES §13).
 *
 * Units: the limits carry the unit of the input values (the chart is unit-agnostic).
 * Points are taken in the order given, which must be time order (e.g. growth date).
 * A point exactly on an edge is NOT beyond it: zones count edges strictly exceeded.
 */
import { countText } from "../model/format.ts";

/** d₂ for subgroups of n = 2 (moving range of two consecutive points). */
export const D2_MOVING_RANGE = 1.128;

/** One measured value in time order; `date` (ISO) is only used by {@link baselineFromDates}. */
export interface ChartInput {
  id: string;
  value: number;
  date?: string;
}

/**
 * Baseline window over which CL and σ̂ are estimated.
 * - `{ first: N }`: the first N points (N ≥ 2).
 * - `{ from: i, to: j }`: indices i … j inclusive (0-based), e.g. from {@link baselineFromDates}.
 * Default (omitted): all points.
 */
export type BaselineWindow = { first: number } | { from: number; to: number };

export interface ControlLimits {
  centreLine: number;
  /** σ̂ = MR̄ / 1.128, same unit as the values. */
  sigma: number;
  movingRangeMean: number;
  ucl: number;
  lcl: number;
  plus2: number;
  minus2: number;
  plus1: number;
  minus1: number;
  /** Inclusive 0-based index range of the baseline, and its number of points. */
  baseline: { from: number; to: number; count: number };
}

/** Side of the centre line; "on" only when the value equals CL exactly. */
export type ChartSide = "above" | "below" | "on";

export interface ChartPoint {
  id: string;
  index: number;
  value: number;
  /** (value − CL)/σ̂, signed, dimensionless. */
  z: number;
  side: ChartSide;
  /** Number of σ̂ edges strictly exceeded on this side: 0 (within 1σ), 1, 2, or 3 (beyond the control limit). */
  band: 0 | 1 | 2 | 3;
  inBaseline: boolean;
}

export interface ControlChart {
  ok: true;
  limits: ControlLimits;
  points: ChartPoint[];
}

export interface ControlChartFailure {
  ok: false;
  reason: string;
  /** Present when the baseline was usable but σ̂ = 0 (all baseline values equal). */
  centreLine?: number;
}

/**
 * Builds an individuals chart: limits from the baseline window, then every point's side and zone.
 * Returns `{ ok: false, reason }` for: no points, non-finite values, a baseline window outside the
 * series or with fewer than 2 points, or σ̂ = 0 (baseline values all equal: no spread to judge by;
 * `centreLine` is still given). Never throws for data reasons.
 */
export function controlChart(series: readonly ChartInput[], baseline?: BaselineWindow): ControlChart | ControlChartFailure {
  if (series.length === 0) return { ok: false, reason: "no points to chart" };
  const bad = series.filter((p) => !Number.isFinite(p.value)).map((p) => p.id);
  if (bad.length > 0) {
    return { ok: false, reason: `values that are not finite numbers (remove them first): ${bad.join(", ")}` };
  }
  const window = resolveBaseline(series.length, baseline);
  if ("reason" in window) return { ok: false, reason: window.reason };
  const { from, to } = window;
  const count = to - from + 1;
  let sum = 0;
  for (let i = from; i <= to; i++) sum += series[i].value;
  const centreLine = sum / count;
  let mrSum = 0;
  for (let i = from + 1; i <= to; i++) mrSum += Math.abs(series[i].value - series[i - 1].value);
  const movingRangeMean = mrSum / (count - 1);
  const sigma = movingRangeMean / D2_MOVING_RANGE;
  if (!(sigma > 0)) {
    return {
      ok: false,
      reason: `the ${count} baseline values are all equal, so the moving range is 0 and σ̂ = 0: no control limits can be drawn`,
      centreLine,
    };
  }
  const limits: ControlLimits = {
    centreLine,
    sigma,
    movingRangeMean,
    ucl: centreLine + 3 * sigma,
    lcl: centreLine - 3 * sigma,
    plus2: centreLine + 2 * sigma,
    minus2: centreLine - 2 * sigma,
    plus1: centreLine + sigma,
    minus1: centreLine - sigma,
    baseline: { from, to, count },
  };
  const points = series.map((p, index) => classifyPoint(p, index, limits, index >= from && index <= to));
  return { ok: true, limits, points };
}

function resolveBaseline(n: number, baseline: BaselineWindow | undefined): { from: number; to: number } | { reason: string } {
  let from = 0;
  let to = n - 1;
  if (baseline && "first" in baseline) {
    if (!Number.isInteger(baseline.first)) return { reason: `baseline "first" must be a whole number, got ${baseline.first}` };
    if (baseline.first > n) return { reason: `baseline asks for the first ${baseline.first} points but there are only ${n}` };
    to = baseline.first - 1;
  } else if (baseline) {
    if (!Number.isInteger(baseline.from) || !Number.isInteger(baseline.to)) {
      return { reason: `baseline indices must be whole numbers, got ${baseline.from}…${baseline.to}` };
    }
    if (baseline.from < 0 || baseline.to > n - 1 || baseline.from > baseline.to) {
      return { reason: `baseline indices ${baseline.from}…${baseline.to} do not lie within the ${n} points (0…${n - 1})` };
    }
    from = baseline.from;
    to = baseline.to;
  }
  const count = to - from + 1;
  if (count < 2) {
    return { reason: `the baseline has ${countText(Math.max(count, 0), "point")}; at least 2 are needed for a moving range` };
  }
  return { from, to };
}

/** Side and zone of one point against given limits (edges strictly exceeded; see the header). */
export function classifyPoint(p: ChartInput, index: number, l: ControlLimits, inBaseline: boolean): ChartPoint {
  const v = p.value;
  const side: ChartSide = v > l.centreLine ? "above" : v < l.centreLine ? "below" : "on";
  let band: 0 | 1 | 2 | 3 = 0;
  if (side === "above") band = v > l.ucl ? 3 : v > l.plus2 ? 2 : v > l.plus1 ? 1 : 0;
  if (side === "below") band = v < l.lcl ? 3 : v < l.minus2 ? 2 : v < l.minus1 ? 1 : 0;
  return { id: p.id, index, value: v, z: (v - l.centreLine) / l.sigma, side, band, inBaseline };
}

/**
 * Converts a date window into a baseline index window: the first and last index whose `date`
 * (ISO 8601, compared as calendar dates/timestamps) lies within [fromDate, toDate] inclusive.
 * Points without a parseable date are ignored. Returns `{ reason }` when no point falls inside.
 */
export function baselineFromDates(series: readonly ChartInput[], fromDate: string, toDate: string): { from: number; to: number } | { reason: string } {
  const lo = Date.parse(fromDate);
  const hi = Date.parse(toDate);
  if (Number.isNaN(lo) || Number.isNaN(hi)) return { reason: `baseline dates are not valid ISO dates: ${fromDate}, ${toDate}` };
  let from = -1;
  let to = -1;
  series.forEach((p, i) => {
    const t = p.date === undefined ? NaN : Date.parse(p.date);
    if (Number.isNaN(t) || t < lo || t > hi) return;
    if (from < 0) from = i;
    to = i;
  });
  if (from < 0) return { reason: `no point dated between ${fromDate} and ${toDate}` };
  return { from, to };
}
