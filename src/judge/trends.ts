/**
 * Trend of one metric across wafers: an individuals control chart against
 * growth date with the Western Electric rules flagged point by point.
 *
 * Method: points ordered by growth date (ties by wafer id); centre line and
 * σ̂ = MR̄/1.128 from the baseline window (src/judge/controlChart.ts, Shewhart
 * individuals chart, NIST/SEMATECH e-Handbook §6.3); rules 1–4 as in
 * src/judge/westernElectric.ts (Western Electric Statistical Quality Control
 * Handbook, 1956; REFERENCES §13). Values carry the metric's own unit.
 * Pure: no I/O. Never throws for data reasons: a chart that cannot be drawn
 * is `{ ok: false, reason }` with the points still listed in order.
 */
import { baselineFromDates, controlChart, type BaselineWindow, type ControlLimits } from "./controlChart.ts";
import { describeRule, westernElectric, type WesternElectricRule } from "./westernElectric.ts";
import { DEFAULT_TREND_SETTINGS, type TrendSettings } from "../validate/trendSettings.ts";

export interface TrendInput {
  /** Wafer id. */
  id: string;
  /** Growth date, ISO YYYY-MM-DD. */
  date: string;
  run?: string;
  reactor?: string;
  /** Value in the metric's unit. */
  value: number;
}

export interface TrendPoint extends TrendInput {
  /** (value − CL)/σ̂; null when no limits could be drawn. */
  z: number | null;
  inBaseline: boolean;
  rules: WesternElectricRule[];
  /** The rules in plain words, joined with "; " (empty when in control). */
  why: string;
}

export type Trend =
  | { ok: true; points: TrendPoint[]; limits: ControlLimits; runLength: number; flagged: number; baselineText: string }
  | { ok: false; points: TrendPoint[]; reason: string; baselineText: string };

/** Orders the inputs by growth date, then wafer id; drops non-finite values. */
export function orderByDate(inputs: readonly TrendInput[]): TrendInput[] {
  return inputs.filter((p) => Number.isFinite(p.value)).sort((a, b) => a.date.localeCompare(b.date) || a.id.localeCompare(b.id));
}

/** Plain-words description of the baseline setting. */
export function describeBaseline(s: TrendSettings): string {
  const b = s.baseline;
  if (b.kind === "first") return `the first ${b.count} wafers by growth date`;
  if (b.kind === "dates") return `wafers grown ${b.from} to ${b.to}`;
  return "all wafers";
}

/**
 * Control chart and rule flags for one metric's values across wafers.
 * `settings` come from the `trends:` block of targets.yaml (defaults: baseline all wafers, run length 8).
 */
export function trendChart(inputs: readonly TrendInput[], settings: TrendSettings = DEFAULT_TREND_SETTINGS): Trend {
  const ordered = orderByDate(inputs);
  const baselineText = describeBaseline(settings);
  const plain = (reason: string): Trend => ({ ok: false, reason, baselineText, points: ordered.map((p) => ({ ...p, z: null, inBaseline: false, rules: [], why: "" })) });
  const series = ordered.map((p) => ({ id: p.id, value: p.value, date: p.date }));
  let window: BaselineWindow | undefined;
  const b = settings.baseline;
  if (b.kind === "first") window = { first: b.count };
  if (b.kind === "dates") {
    const w = baselineFromDates(series, b.from, b.to);
    if ("reason" in w) return plain(w.reason);
    window = w;
  }
  const chart = controlChart(series, window);
  if (!chart.ok) return plain(chart.reason);
  const flags = westernElectric(chart, { runLength: settings.runLength });
  const points = ordered.map((p, i) => {
    const rules = flags.points[i].rules;
    return { ...p, z: chart.points[i].z, inBaseline: chart.points[i].inBaseline, rules, why: rules.map((r) => `rule ${r}: ${describeRule(r, flags.runLength)}`).join("; ") };
  });
  return { ok: true, points, limits: chart.limits, runLength: flags.runLength, flagged: flags.flagged.length, baselineText };
}
