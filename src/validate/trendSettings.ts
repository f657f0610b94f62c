/**
 * The `trends:` block of targets.yaml: how the control charts on /trends/ are
 * drawn. Shape (docs/formats.md, Targets):
 *   trends:
 *     baseline: { first: 8 }                            # the first 8 wafers by growth date
 *     # or baseline: { from: 2024-01-01, to: 2024-12-31 }  (growth dates, inclusive)
 *     run_length: 8                                     # Western Electric rule 4 run length
 * Omitted: the baseline is every wafer and the run length 8.
 */
import { didYouMean, InputError, show } from "./problem.ts";
import { isRealDate } from "./dates.ts";

export type TrendBaseline = { kind: "all" } | { kind: "first"; count: number } | { kind: "dates"; from: string; to: string };

export interface TrendSettings {
  baseline: TrendBaseline;
  /** Western Electric rule 4 run length, integer ≥ 2. */
  runLength: number;
}

export const DEFAULT_TREND_SETTINGS: TrendSettings = { baseline: { kind: "all" }, runLength: 8 };

const KEYS = ["baseline", "run_length"];
const BASELINE_FIX = "write baseline: { first: 8 }, baseline: { from: 2024-01-01, to: 2024-12-31 } with both dates, or baseline: all";

function isoDate(v: unknown): string | undefined {
  if (v instanceof Date && !Number.isNaN(v.getTime())) return v.toISOString().slice(0, 10);
  if (typeof v === "string" && isRealDate(v.trim())) return v.trim();
  return undefined;
}

/** Validates the `trends:` block; throws InputError (located at `trends.<key>`) for bad shapes. */
export function readTrendSettings(raw: unknown, file: string, lineOf: (field: string) => number | undefined): TrendSettings {
  const where = (field: string) => ({ file, field, line: lineOf(field) });
  if (raw === null || raw === undefined) return DEFAULT_TREND_SETTINGS;
  if (typeof raw !== "object" || Array.isArray(raw)) {
    throw new InputError({ ...where("trends"), message: "trends must be a mapping", expected: "baseline and run_length", found: show(raw), fix: "indent baseline: and run_length: under trends:, or remove the trends: line for the defaults" });
  }
  const r = raw as Record<string, unknown>;
  for (const k of Object.keys(r)) {
    if (!KEYS.includes(k)) {
      const hint = didYouMean(k, KEYS);
      throw new InputError({ ...where(`trends.${k}`), message: "unknown key in trends", expected: KEYS.join(", "), found: JSON.stringify(k), fix: hint ? `did you mean "${hint}"?` : "remove it" });
    }
  }
  const out: TrendSettings = { ...DEFAULT_TREND_SETTINGS };
  if ("run_length" in r) {
    const n = r.run_length;
    if (typeof n !== "number" || !Number.isInteger(n) || n < 2 || n > 50) {
      throw new InputError({ ...where("trends.run_length"), message: "run length must be a whole number from 2 to 50", expected: "e.g. 8 (or 9)", found: show(n), fix: "write a whole number without quotes or unit, such as run_length: 8" });
    }
    out.runLength = n;
  }
  if ("baseline" in r) out.baseline = readBaseline(r.baseline, where("trends.baseline"));
  return out;
}

function readBaseline(b: unknown, at: { file: string; field: string; line?: number }): TrendBaseline {
  const expected = "{ first: N } or { from: YYYY-MM-DD, to: YYYY-MM-DD } (growth dates)";
  if (b === "all") return { kind: "all" };
  if (!b || typeof b !== "object" || Array.isArray(b)) throw new InputError({ ...at, message: "cannot read the trend baseline", expected, found: show(b), fix: BASELINE_FIX });
  const o = b as Record<string, unknown>;
  if ("first" in o && Object.keys(o).length === 1) {
    const n = o.first;
    if (typeof n !== "number" || !Number.isInteger(n) || n < 2) throw new InputError({ ...at, field: `${at.field}.first`, message: "baseline needs at least 2 wafers", expected: "a whole number ≥ 2", found: show(n), fix: "write a whole number of wafers, 2 or more, such as baseline: { first: 8 }" });
    return { kind: "first", count: n };
  }
  const from = isoDate(o.from);
  const to = isoDate(o.to);
  if (from && to && Object.keys(o).length === 2) {
    if (from > to) throw new InputError({ ...at, message: "baseline dates are reversed", expected: "from before to", found: `${from} … ${to}`, fix: "swap them" });
    return { kind: "dates", from, to };
  }
  throw new InputError({ ...at, message: "cannot read the trend baseline", expected, found: show(b), fix: BASELINE_FIX });
}
