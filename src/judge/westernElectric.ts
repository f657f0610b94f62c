/**
 * Western Electric run rules on an individuals chart, flagged point by point.
 *
 * Rules (Western Electric Co., Statistical Quality Control Handbook, 1956, as quoted in
 * Montgomery & Runger; REFERENCES §13). Rules 2–4 are applied one side of the centre line at a time.
 *   1. One point beyond 3σ (outside UCL/LCL).
 *   2. Two of three consecutive points beyond 2σ, on the same side.
 *   3. Four of five consecutive points beyond 1σ, on the same side.
 *   4. Eight consecutive points on one side of the centre line (run length configurable;
 *      some implementations use 9).
 *
 * Exactly which points are flagged:
 *   - Rule 1: the point itself (band 3).
 *   - Rule 2: every window of 3 consecutive points (indices i−2…i, complete windows only) that holds
 *     ≥ 2 points beyond 2σ on one side flags THOSE beyond-2σ points of that side; the third point
 *     of the window is not flagged. A point beyond 3σ also counts as beyond 2σ.
 *   - Rule 3: likewise, windows of 5 with ≥ 4 points beyond 1σ on one side flag those points.
 *   - Rule 4: every point of a maximal run of ≥ runLength consecutive points strictly on one side
 *     flags (all of them, not only the runLength-th onward). A point exactly on CL breaks a run.
 * "Beyond" is strict: a point exactly on a zone edge is not beyond it (see controlChart.ts).
 */
import type { ChartPoint, ControlChart } from "./controlChart.ts";

export type WesternElectricRule = 1 | 2 | 3 | 4;

export interface WesternElectricOptions {
  /** Rule 4 run length; default 8 (some use 9). Integer ≥ 2. */
  runLength?: number;
}

export interface PointFlags {
  id: string;
  index: number;
  /** Rules violated by this point, ascending, no duplicates; empty when in control. */
  rules: WesternElectricRule[];
}

export interface WesternElectricResult {
  runLength: number;
  /** One entry per chart point, in chart order. */
  points: PointFlags[];
  /** Only the points with at least one rule, in chart order. */
  flagged: PointFlags[];
}

/** Plain-words description of each rule, for tooltips and reasons. */
export function describeRule(rule: WesternElectricRule, runLength = 8): string {
  switch (rule) {
    case 1:
      return "beyond the 3σ control limit";
    case 2:
      return "2 of 3 consecutive points beyond 2σ on the same side";
    case 3:
      return "4 of 5 consecutive points beyond 1σ on the same side";
    case 4:
      return `${runLength} or more consecutive points on one side of the centre line`;
  }
}

/**
 * Applies the four rules to a chart from {@link controlChart}. Throws RangeError for a run length
 * that is not an integer ≥ 2 (a programming/configuration error caught at settings validation).
 */
export function westernElectric(chart: ControlChart, options: WesternElectricOptions = {}): WesternElectricResult {
  const runLength = options.runLength ?? 8;
  if (!Number.isInteger(runLength) || runLength < 2) {
    throw new RangeError(`westernElectric: runLength must be an integer ≥ 2, got ${runLength}`);
  }
  const pts = chart.points;
  const sets: Set<WesternElectricRule>[] = pts.map(() => new Set());
  pts.forEach((p, i) => {
    if (p.band === 3) sets[i].add(1);
  });
  markKOfM(pts, sets, 2, 3, 2, 2);
  markKOfM(pts, sets, 4, 5, 1, 3);
  markRuns(pts, sets, runLength);
  const points = pts.map((p, i) => ({
    id: p.id,
    index: p.index,
    rules: [...sets[i]].sort((a, b) => a - b),
  }));
  return { runLength, points, flagged: points.filter((p) => p.rules.length > 0) };
}

/** Windows of m consecutive points with ≥ k beyond `minBand` on one side flag those points with `rule`. */
function markKOfM(pts: readonly ChartPoint[], sets: Set<WesternElectricRule>[], k: number, m: number, minBand: number, rule: WesternElectricRule): void {
  for (let end = m - 1; end < pts.length; end++) {
    for (const side of ["above", "below"] as const) {
      const hits: number[] = [];
      for (let i = end - m + 1; i <= end; i++) {
        if (pts[i].side === side && pts[i].band >= minBand) hits.push(i);
      }
      if (hits.length >= k) for (const i of hits) sets[i].add(rule);
    }
  }
}

/** Maximal runs of ≥ runLength points strictly on one side flag every point with rule 4. */
function markRuns(pts: readonly ChartPoint[], sets: Set<WesternElectricRule>[], runLength: number): void {
  let start = 0;
  for (let i = 1; i <= pts.length; i++) {
    const continues = i < pts.length && pts[i].side !== "on" && pts[i].side === pts[start].side;
    if (continues) continue;
    if (pts[start].side !== "on" && i - start >= runLength) {
      for (let j = start; j < i; j++) sets[j].add(4);
    }
    start = i;
  }
}
