/**
 * Phase I control limits: estimate the individuals-chart limits from a baseline, drop the
 * baseline points beyond them, and estimate again, until no baseline point lies beyond the
 * limits or the pass limit is reached; then clip the limits at the quantity's natural bounds.
 *
 * Method (Montgomery, Introduction to Statistical Quality Control, Phase I use of control charts:
 * "trial control limits", points beyond them with an assignable cause removed and the limits
 * revised; REFERENCES §13): each pass is an individuals chart on the baseline points that are left,
 * in time order (src/judge/controlChart.ts: CL = mean, σ̂ = MR̄/1.128, moving ranges between
 * consecutive remaining baseline points), and every point beyond CL ± 3σ̂ (rule 1) is dropped at
 * once. Only rule 1 drops points; the other run rules are left to the reader of the chart.
 * At most `maxPasses` revisions are made (0: the trial limits are final). The points dropped are
 * listed with the pass that dropped them, so the page can say what left the baseline and why.
 *
 * Natural bounds: a quantity that cannot be negative (a width, a density, a concentration) gets
 * LCL = max(LCL, 0), and a fraction LCL/UCL within [0, 1] — common practice for individuals charts
 * of non-negative data (Montgomery discusses setting a negative LCL to zero). The unclipped values
 * are kept so the page can say the limit was clipped, and from what.
 * Pure; never throws for data reasons.
 */
import { controlChart, type ChartInput, type ControlLimits } from "./controlChart.ts";

/** Phase I revisions allowed by default (trend settings `max_passes`). */
export const DEFAULT_MAX_PASSES = 3;

/** Baseline sizes below this give rough limits (Montgomery suggests 20–25 points for Phase I; from memory). */
export const ROUGH_BASELINE_BELOW = 20;

export interface NaturalBounds {
  min?: number;
  max?: number;
}

export interface DroppedPoint {
  id: string;
  value: number;
  /** 1 for the first revision, 2 for the second… */
  pass: number;
  side: "above" | "below";
}

export interface PhaseOneLimits {
  ok: true;
  /** Final limits, clipped at the natural bounds; `baseline.count` is the number of points kept. */
  limits: ControlLimits;
  /** The limits before clipping, when clipping changed them. */
  clipped?: { lcl?: number; ucl?: number };
  dropped: DroppedPoint[];
  /** Number of revisions made (0 when the trial limits held). */
  passes: number;
  /** Ids of the baseline points the final limits were estimated from. */
  kept: string[];
  /** True when points still lay beyond the limits after the last allowed revision. */
  stoppedAtLimit: boolean;
}

export type PhaseOneResult = PhaseOneLimits | { ok: false; reason: string; dropped: DroppedPoint[] };

/** Phase I limits from `baseline` (time order), revising at most `maxPasses` times, clipped at `bounds`. */
export function phaseOneLimits(baseline: readonly ChartInput[], maxPasses = DEFAULT_MAX_PASSES, bounds: NaturalBounds = {}): PhaseOneResult {
  let points = [...baseline];
  const dropped: DroppedPoint[] = [];
  for (let pass = 0; ; pass++) {
    const chart = controlChart(points);
    if (!chart.ok) {
      const after = dropped.length ? ` (after dropping ${dropped.map((d) => d.id).join(", ")} as beyond the trial limits)` : "";
      return { ok: false, reason: chart.reason + after, dropped };
    }
    const beyond = chart.points.filter((p) => p.band === 3);
    if (beyond.length === 0 || pass >= maxPasses) {
      return { ok: true, ...clip(chart.limits, bounds), dropped, passes: pass, kept: points.map((p) => p.id), stoppedAtLimit: beyond.length > 0 };
    }
    for (const p of beyond) dropped.push({ id: p.id, value: p.value, pass: pass + 1, side: p.side === "below" ? "below" : "above" });
    const gone = new Set(beyond.map((p) => p.id));
    points = points.filter((p) => !gone.has(p.id));
  }
}

function clip(l: ControlLimits, b: NaturalBounds): { limits: ControlLimits; clipped?: { lcl?: number; ucl?: number } } {
  const clipped: { lcl?: number; ucl?: number } = {};
  const limits = { ...l, baseline: { ...l.baseline } };
  if (b.min !== undefined && limits.lcl < b.min) {
    clipped.lcl = limits.lcl;
    limits.lcl = b.min;
  }
  if (b.max !== undefined && limits.ucl > b.max) {
    clipped.ucl = limits.ucl;
    limits.ucl = b.max;
  }
  return Object.keys(clipped).length ? { limits, clipped } : { limits };
}
