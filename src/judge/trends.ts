/**
 * Trend of one metric across wafers: an individuals control chart against
 * growth date with the Western Electric rules flagged point by point.
 *
 * Method: points ordered by growth date (ties by wafer id). Phase I limits
 * (src/judge/phaseOne.ts; Montgomery, Introduction to Statistical Quality
 * Control, REFERENCES §13): the baseline is drawn only from eligible wafers —
 * production grade, no input error, not excluded by the lab — within the
 * baseline window; baseline points beyond the trial limits are dropped and the
 * limits estimated again, at most `max_passes` times; CL and σ̂ = MR̄/1.128
 * (src/judge/controlChart.ts, Shewhart individuals chart, NIST/SEMATECH
 * e-Handbook §6.3); limits clipped at the metric's natural bounds. Rules 1–4
 * (src/judge/westernElectric.ts; Western Electric Statistical Quality Control
 * Handbook, 1956) are applied to the eligible points in time order; wafers left
 * out (error, non-production grade, lab exclusion) are plotted, placed against
 * the limits, and not judged by the rules. With `limits_by` set, each group
 * (reactor or run) gets its own baseline, limits and rule sequence.
 * Values carry the metric's own unit. Pure: no I/O. Never throws for data
 * reasons: a chart that cannot be drawn is `{ ok: false, reason }` with the
 * points still listed in order.
 */
import { classifyPoint, type ControlLimits } from "./controlChart.ts";
import { DEFAULT_MAX_PASSES, phaseOneLimits, type DroppedPoint, type NaturalBounds } from "./phaseOne.ts";
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
  /** The wafer's grade (absent: treated as production). */
  grade?: string;
  /** True when the wafer's verdict is error (its figures are not trusted). */
  error?: boolean;
}

/**
 * How a point takes part: `baseline` (limits estimated from it), `dropped` (in the baseline window
 * but beyond the trial limits, Phase I), `monitored` (eligible, outside the baseline window),
 * `left-out` (error wafer, non-production grade, or excluded by the lab: plotted, not judged).
 */
export type PointRole = "baseline" | "dropped" | "monitored" | "left-out";

export interface TrendPoint extends TrendInput {
  /** (value − CL)/σ̂; null when no limits could be drawn. */
  z: number | null;
  inBaseline: boolean;
  role: PointRole;
  /** Why a point is left out or was dropped, in plain words (empty otherwise). */
  note: string;
  rules: WesternElectricRule[];
  /** The rules in plain words, joined with "; " (empty when in control). */
  why: string;
}

interface TrendCommon {
  points: TrendPoint[];
  baselineText: string;
  dropped: DroppedPoint[];
  /** Group name under `limits_by` ("" for a single set of limits). */
  group: string;
}

export type Trend =
  | (TrendCommon & {
      ok: true;
      limits: ControlLimits;
      clipped?: { lcl?: number; ucl?: number };
      passes: number;
      stoppedAtLimit: boolean;
      runLength: number;
      flagged: number;
    })
  | (TrendCommon & { ok: false; reason: string });

export interface TrendContext {
  /** Metric key, to match the lab's exclusions. */
  metric?: string;
  /** Grades whose wafers may form the baseline; null or absent: every grade. */
  productionGrades?: ReadonlySet<string> | null;
  bounds?: NaturalBounds;
  group?: string;
}

/** Orders the inputs by growth date, then wafer id; drops non-finite values. */
export function orderByDate<T extends TrendInput>(inputs: readonly T[]): T[] {
  return inputs.filter((p) => Number.isFinite(p.value)).sort((a, b) => a.date.localeCompare(b.date) || a.id.localeCompare(b.id));
}

/** Plain-words description of the baseline setting. */
export function describeBaseline(s: TrendSettings): string {
  const b = s.baseline;
  if (b.kind === "first") return `the first ${b.count} eligible wafers by growth date`;
  if (b.kind === "dates") return `eligible wafers grown ${b.from} to ${b.to}`;
  return "all eligible wafers";
}

/** Why a point cannot be in the baseline, or "" when it is eligible. */
function leftOutBecause(p: TrendInput, s: TrendSettings, ctx: TrendContext): string {
  const ex = (s.exclude ?? []).find((e) => e.wafer === p.id && (e.metric === undefined || e.metric === ctx.metric));
  if (ex) return `excluded by the lab: ${ex.reason}`;
  if (p.error) return "left out: the wafer has input errors (verdict error)";
  if (ctx.productionGrades && p.grade !== undefined && !ctx.productionGrades.has(p.grade)) return `left out: grade ${p.grade} is not a production grade`;
  return "";
}

/**
 * Control chart and rule flags for one metric's values across wafers (one group).
 * `settings` come from the `trends:` block of targets.yaml (defaults: baseline all eligible wafers,
 * run length 8, 3 Phase I passes).
 */
export function trendChart(inputs: readonly TrendInput[], settings: TrendSettings = DEFAULT_TREND_SETTINGS, ctx: TrendContext = {}): Trend {
  const ordered = orderByDate(inputs);
  const baselineText = describeBaseline(settings);
  const group = ctx.group ?? "";
  const notes = ordered.map((p) => leftOutBecause(p, settings, ctx));
  const eligible = ordered.filter((_, i) => notes[i] === "");
  const window = baselineWindow(eligible, settings);
  const plain = (reason: string, dropped: DroppedPoint[] = []): Trend => ({
    ok: false,
    reason,
    baselineText,
    group,
    dropped,
    points: ordered.map((p, i) => ({ ...p, z: null, inBaseline: false, role: notes[i] ? "left-out" : "monitored", note: notes[i], rules: [], why: "" })),
  });
  if ("reason" in window) return plain(window.reason);
  const phase = phaseOneLimits(
    window.points.map((p) => ({ id: p.id, value: p.value, date: p.date })),
    settings.maxPasses ?? DEFAULT_MAX_PASSES,
    ctx.bounds,
  );
  if (!phase.ok) return plain(phase.reason, phase.dropped);
  const kept = new Set(phase.kept);
  const droppedIds = new Map(phase.dropped.map((d) => [d.id, d]));
  const limits = phase.limits;
  // Rules run over the eligible points only, in time order.
  const chartPoints = eligible.map((p, i) => classifyPoint(p, i, limits, kept.has(p.id)));
  const flags = westernElectric({ ok: true, limits, points: chartPoints }, { runLength: settings.runLength });
  const rulesById = new Map(flags.points.map((f) => [f.id, f.rules]));
  const points: TrendPoint[] = ordered.map((p, i) => {
    const left = notes[i] !== "";
    const rules = left ? [] : (rulesById.get(p.id) ?? []);
    const d = droppedIds.get(p.id);
    const role: PointRole = left ? "left-out" : kept.has(p.id) ? "baseline" : d ? "dropped" : "monitored";
    const note = left ? notes[i] : d ? `dropped from the baseline in pass ${d.pass}: beyond the trial ${d.side === "above" ? "upper" : "lower"} limit` : "";
    return {
      ...p,
      z: (p.value - limits.centreLine) / limits.sigma,
      inBaseline: role === "baseline",
      role,
      note,
      rules,
      why: rules.map((r) => `rule ${r}: ${describeRule(r, flags.runLength)}`).join("; "),
    };
  });
  return {
    ok: true,
    points,
    limits,
    clipped: phase.clipped,
    passes: phase.passes,
    stoppedAtLimit: phase.stoppedAtLimit,
    dropped: phase.dropped,
    runLength: flags.runLength,
    flagged: points.filter((p) => p.rules.length).length,
    baselineText,
    group,
  };
}

/** The eligible points inside the baseline window (first N, or growth dates), or why there are none. */
function baselineWindow(eligible: readonly TrendInput[], s: TrendSettings): { points: TrendInput[] } | { reason: string } {
  const b = s.baseline;
  if (b.kind === "first") {
    if (eligible.length < b.count) return { reason: `the baseline asks for the first ${b.count} eligible wafers but there are only ${eligible.length}` };
    return { points: eligible.slice(0, b.count) };
  }
  if (b.kind === "dates") {
    const inside = eligible.filter((p) => p.date.slice(0, 10) >= b.from && p.date.slice(0, 10) <= b.to);
    if (inside.length === 0) return { reason: `no eligible wafer was grown between ${b.from} and ${b.to}` };
    return { points: inside };
  }
  return { points: [...eligible] };
}

/**
 * The trend of one metric, one chart per group when `limits_by` names reactor or run (wafers with
 * no value for it form the group ""), else a single group. Groups sorted by name.
 */
export function trendGroups(inputs: readonly TrendInput[], settings: TrendSettings = DEFAULT_TREND_SETTINGS, ctx: TrendContext = {}): Trend[] {
  const by = settings.limitsBy ?? "none";
  if (by === "none") return [trendChart(inputs, settings, { ...ctx, group: "" })];
  const keyOf = (p: TrendInput) => (by === "reactor" ? p.reactor : p.run) ?? "";
  const names = [...new Set(inputs.map(keyOf))].sort();
  return names.map((g) =>
    trendChart(
      inputs.filter((p) => keyOf(p) === g),
      settings,
      { ...ctx, group: g },
    ),
  );
}
