/**
 * The `trends:` block of targets.yaml: how the control charts on /trends/ are
 * drawn. Shape (docs/formats.md, Targets):
 *   trends:
 *     baseline: { first: 8 }                            # the first 8 wafers by growth date
 *     # or baseline: { from: 2024-01-01, to: 2024-12-31 }  (growth dates, inclusive)
 *     run_length: 8                                     # Western Electric rule 4 run length
 *     production_grades: [qubit]                        # grades whose wafers may form the baseline
 *     max_passes: 3                                     # Phase I revisions (drop beyond-limit points, recompute)
 *     limits_by: reactor                                # separate limits per reactor (or run); default one set
 *     exclude:                                          # points the lab leaves out of the baseline, with a reason
 *       - { wafer: TQ-2403, metric: interface_width_top, reason: "SIMS crater off-centre" }
 * Omitted: the baseline is every eligible wafer, run length 8, production grades = the default
 * grade, 3 passes, one set of limits, nothing excluded.
 */
import { didYouMean, InputError, show } from "../model/problem.ts";
import { isRealDate } from "./dates.ts";
import { METRIC_BY_KEY } from "../model/metrics.ts";

export type TrendBaseline = { kind: "all" } | { kind: "first"; count: number } | { kind: "dates"; from: string; to: string };

/** Which grades count as production (may form the baseline): the default grade, every grade, or a list. */
export type ProductionGrades = { kind: "default" } | { kind: "all" } | { kind: "list"; grades: string[] };

/** A point the lab leaves out of the baseline: one wafer, for one metric or (metric absent) for all. */
export interface TrendExclusion {
  wafer: string;
  metric?: string;
  reason: string;
}

export type LimitsBy = "none" | "reactor" | "run";

export interface TrendSettings {
  baseline: TrendBaseline;
  /** Western Electric rule 4 run length, integer ≥ 2. */
  runLength: number;
  /** Omitted: the default grade only. */
  productionGrades?: ProductionGrades;
  /** Phase I revisions, 0…10; omitted: 3 (src/judge/phaseOne.ts). */
  maxPasses?: number;
  /** Omitted: "none" (one set of limits for all wafers). */
  limitsBy?: LimitsBy;
  exclude?: TrendExclusion[];
}

export const DEFAULT_TREND_SETTINGS: TrendSettings = { baseline: { kind: "all" }, runLength: 8 };

const KEYS = ["baseline", "run_length", "production_grades", "max_passes", "limits_by", "exclude"];
const BASELINE_FIX = "write baseline: { first: 8 }, baseline: { from: 2024-01-01, to: 2024-12-31 } with both dates, or baseline: all";

function isoDate(v: unknown): string | undefined {
  if (v instanceof Date && !Number.isNaN(v.getTime())) return v.toISOString().slice(0, 10);
  if (typeof v === "string" && isRealDate(v.trim())) return v.trim();
  return undefined;
}

/**
 * Validates the `trends:` block; throws InputError (located at `trends.<key>`) for bad shapes.
 * `grades`: the grade names of the targets file, when known (production_grades must name them).
 */
export function readTrendSettings(raw: unknown, file: string, lineOf: (field: string) => number | undefined, grades?: readonly string[]): TrendSettings {
  const where = (field: string) => ({ file, field, line: lineOf(field) });
  if (raw === null || raw === undefined) return DEFAULT_TREND_SETTINGS;
  if (typeof raw !== "object" || Array.isArray(raw)) {
    throw new InputError({
      ...where("trends"),
      message: "trends must be a mapping",
      expected: "baseline and run_length",
      found: show(raw),
      fix: "indent baseline: and run_length: under trends:, or remove the trends: line for the defaults",
    });
  }
  const r = raw as Record<string, unknown>;
  for (const k of Object.keys(r)) {
    if (!KEYS.includes(k)) {
      const hint = didYouMean(k, KEYS);
      throw new InputError({
        ...where(`trends.${k}`),
        message: "unknown key in trends",
        expected: KEYS.join(", "),
        found: JSON.stringify(k),
        fix: hint ? `did you mean "${hint}"?` : "remove it",
      });
    }
  }
  const out: TrendSettings = { ...DEFAULT_TREND_SETTINGS };
  if ("run_length" in r) {
    const n = r.run_length;
    if (typeof n !== "number" || !Number.isInteger(n) || n < 2 || n > 50) {
      throw new InputError({
        ...where("trends.run_length"),
        message: "run length must be a whole number from 2 to 50",
        expected: "e.g. 8 (or 9)",
        found: show(n),
        fix: "write a whole number without quotes or unit, such as run_length: 8",
      });
    }
    out.runLength = n;
  }
  if ("baseline" in r) out.baseline = readBaseline(r.baseline, where("trends.baseline"));
  if ("production_grades" in r) out.productionGrades = readProduction(r.production_grades, where("trends.production_grades"), grades);
  if ("max_passes" in r) {
    const n = r.max_passes;
    if (typeof n !== "number" || !Number.isInteger(n) || n < 0 || n > 10) {
      throw new InputError({
        ...where("trends.max_passes"),
        message: "max_passes must be a whole number from 0 to 10",
        expected: "e.g. 3 (0: keep the trial limits)",
        found: show(n),
        fix: "write a whole number without quotes, such as max_passes: 3",
      });
    }
    out.maxPasses = n;
  }
  if ("limits_by" in r) {
    const v = r.limits_by;
    if (v !== "none" && v !== "reactor" && v !== "run") {
      const hint = typeof v === "string" ? didYouMean(v, ["none", "reactor", "run"]) : undefined;
      throw new InputError({
        ...where("trends.limits_by"),
        message: "unknown grouping for control limits",
        expected: "none, reactor or run",
        found: show(v),
        fix: hint ? `did you mean "${hint}"?` : "write limits_by: reactor, limits_by: run, or remove the line for one set of limits",
      });
    }
    out.limitsBy = v;
  }
  if ("exclude" in r) out.exclude = readExclusions(r.exclude, file, lineOf);
  return out;
}

function readProduction(v: unknown, at: { file: string; field: string; line?: number }, grades?: readonly string[]): ProductionGrades {
  if (v === "all") return { kind: "all" };
  if (v === "default") return { kind: "default" };
  const list = typeof v === "string" ? [v] : v;
  if (!Array.isArray(list) || list.length === 0 || !list.every((g) => typeof g === "string" && g.trim() !== "")) {
    throw new InputError({
      ...at,
      message: "cannot read production_grades",
      expected: "a list of grade names, such as [qubit], or all, or default",
      found: show(v),
      fix: "write production_grades: [qubit] (the grades whose wafers may form the control-chart baseline)",
    });
  }
  for (const g of list as string[]) {
    if (grades && !grades.includes(g)) {
      const hint = didYouMean(g, [...grades]);
      throw new InputError({
        ...at,
        message: "production grade is not one of the grades",
        expected: grades.join(", "),
        found: JSON.stringify(g),
        fix: hint ? `did you mean "${hint}"?` : "name a grade defined under grades:",
      });
    }
  }
  return { kind: "list", grades: [...new Set(list as string[])] };
}

function readExclusions(v: unknown, file: string, lineOf: (field: string) => number | undefined): TrendExclusion[] {
  const at = (i: number, key?: string) => ({ file, field: `trends.exclude[${i}]${key ? `.${key}` : ""}`, line: lineOf("trends.exclude") });
  if (!Array.isArray(v))
    throw new InputError({
      ...at(0),
      field: "trends.exclude",
      message: "exclude must be a list",
      expected: '- { wafer: TQ-2403, metric: interface_width_top, reason: "…" }',
      found: show(v),
      fix: "write one line per excluded point, each starting with - ",
    });
  return v.map((e, i) => {
    if (!e || typeof e !== "object" || Array.isArray(e))
      throw new InputError({
        ...at(i),
        message: "an exclusion must be a mapping",
        expected: "{ wafer, metric (optional), reason }",
        found: show(e),
        fix: 'write - { wafer: <id>, reason: "why" }',
      });
    const o = e as Record<string, unknown>;
    for (const k of Object.keys(o)) {
      if (!["wafer", "metric", "reason"].includes(k)) {
        const hint = didYouMean(k, ["wafer", "metric", "reason"]);
        throw new InputError({
          ...at(i, k),
          message: "unknown key in an exclusion",
          expected: "wafer, metric, reason",
          found: JSON.stringify(k),
          fix: hint ? `did you mean "${hint}"?` : "remove it",
        });
      }
    }
    const wafer = typeof o.wafer === "number" ? String(o.wafer) : o.wafer;
    if (typeof wafer !== "string" || wafer.trim() === "")
      throw new InputError({
        ...at(i, "wafer"),
        message: "an exclusion needs the wafer id",
        expected: "a wafer id such as TQ-2403",
        found: show(o.wafer),
        fix: "add wafer: <id>",
      });
    if (typeof o.reason !== "string" || o.reason.trim() === "")
      throw new InputError({
        ...at(i, "reason"),
        message: "an exclusion needs a reason",
        expected: "a sentence saying why the point is left out",
        found: show(o.reason),
        fix: 'add reason: "…" — the chart shows it beside the point',
      });
    const out: TrendExclusion = { wafer: wafer.trim(), reason: o.reason.trim() };
    if ("metric" in o) {
      const m = o.metric;
      if (typeof m !== "string" || !METRIC_BY_KEY.has(m)) {
        const hint = typeof m === "string" ? didYouMean(m, [...METRIC_BY_KEY.keys()]) : undefined;
        throw new InputError({
          ...at(i, "metric"),
          message: "unknown metric in an exclusion",
          expected: "a metric key listed in docs/formats.md",
          found: show(m),
          fix: hint ? `did you mean "${hint}"?` : "check the spelling, or leave metric out to exclude the wafer from every chart",
        });
      }
      out.metric = m;
    }
    return out;
  });
}

function readBaseline(b: unknown, at: { file: string; field: string; line?: number }): TrendBaseline {
  const expected = "{ first: N } or { from: YYYY-MM-DD, to: YYYY-MM-DD } (growth dates)";
  if (b === "all") return { kind: "all" };
  if (!b || typeof b !== "object" || Array.isArray(b))
    throw new InputError({ ...at, message: "cannot read the trend baseline", expected, found: show(b), fix: BASELINE_FIX });
  const o = b as Record<string, unknown>;
  if ("first" in o && Object.keys(o).length === 1) {
    const n = o.first;
    if (typeof n !== "number" || !Number.isInteger(n) || n < 2)
      throw new InputError({
        ...at,
        field: `${at.field}.first`,
        message: "baseline needs at least 2 wafers",
        expected: "a whole number ≥ 2",
        found: show(n),
        fix: "write a whole number of wafers, 2 or more, such as baseline: { first: 8 }",
      });
    return { kind: "first", count: n };
  }
  const from = isoDate(o.from);
  const to = isoDate(o.to);
  if (from && to && Object.keys(o).length === 2) {
    if (from > to)
      throw new InputError({ ...at, message: "baseline dates are reversed", expected: "from before to", found: `${from} … ${to}`, fix: "swap them" });
    return { kind: "dates", from, to };
  }
  throw new InputError({ ...at, message: "cannot read the trend baseline", expected, found: show(b), fix: BASELINE_FIX });
}
