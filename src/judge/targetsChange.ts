/**
 * What a commit to targets.yaml changed, limit by limit, and which wafers' verdicts it changed.
 *
 * Limits are compared grade by grade and metric by metric on everything that decides a verdict:
 * the limits (min, max), the guard band, `required` and `aggregate`. A grade or a limit that
 * appears or disappears is a change from or to "none". Wafer verdicts are today's figures judged
 * under the version before and the version of the commit (src/judge/verdict.ts), so the list shows
 * exactly the wafers the commit moved, whatever else changed since. Pure.
 */
import type { Target, Targets } from "../validate/targets.ts";
import { judgeWafer, type Verdict } from "./verdict.ts";
import type { WaferForHistory } from "./verdictHistory.ts";

export interface LimitChange {
  grade: string;
  metric: string;
  /** The limit before and after (undefined when absent); publish/history.ts puts it in words. */
  before?: Target;
  after?: Target;
}

export interface VerdictFlip {
  id: string;
  before: Verdict;
  after: Verdict;
  grade: string;
}

export interface TargetsChange {
  limits: LimitChange[];
  /** Other changes in plain words (default grade, trend settings). */
  other: string[];
  flips: VerdictFlip[];
  /** Set when either version does not parse: nothing can be compared. */
  note?: string;
}

const same = (a: Target | undefined, b: Target | undefined) =>
  a?.min === b?.min && a?.max === b?.max && a?.guard === b?.guard && a?.required === b?.required && a?.aggregate === b?.aggregate;

/** Limit-by-limit differences between two parsed versions, grades and metrics sorted by name. */
export function diffLimits(before: Targets | undefined, after: Targets | undefined): LimitChange[] {
  const out: LimitChange[] = [];
  const grades = [...new Set([...Object.keys(before?.grades ?? {}), ...Object.keys(after?.grades ?? {})])].sort();
  for (const g of grades) {
    const a = before?.grades[g] ?? {};
    const b = after?.grades[g] ?? {};
    const metrics = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
    for (const m of metrics) if (!same(a[m], b[m])) out.push({ grade: g, metric: m, before: a[m], after: b[m] });
  }
  return out;
}

/** The change a targets commit made, with the wafers whose verdict it changed (sorted by id). */
export function targetsChange(
  before: { targets?: Targets; error?: string } | undefined,
  after: { targets?: Targets; error?: string },
  wafers: readonly (WaferForHistory & { id: string })[],
): TargetsChange {
  if (!after.targets) return { limits: [], other: [], flips: [], note: after.error ?? "targets.yaml does not parse at this commit" };
  if (before && !before.targets)
    return {
      limits: diffLimits(undefined, after.targets),
      other: [],
      flips: [],
      note: `the previous version did not parse (${before.error ?? "unknown reason"}), so verdicts cannot be compared`,
    };
  const old = before?.targets;
  const other: string[] = [];
  if (old && old.defaultGrade !== after.targets.defaultGrade) other.push(`default grade ${old.defaultGrade} → ${after.targets.defaultGrade}`);
  if (old && JSON.stringify(old.trends ?? null) !== JSON.stringify(after.targets.trends ?? null)) other.push("trend settings changed");
  const flips: VerdictFlip[] = [];
  if (old) {
    for (const w of wafers) {
      const v0 = verdictUnder(w, old);
      const v1 = verdictUnder(w, after.targets);
      if (v0 && v1 && v0.verdict !== v1.verdict) flips.push({ id: w.id, before: v0.verdict, after: v1.verdict, grade: v1.grade });
    }
  }
  return { limits: diffLimits(old, after.targets), other, flips: flips.sort((a, b) => a.id.localeCompare(b.id)) };
}

function verdictUnder(w: WaferForHistory, t: Targets): { verdict: Verdict; grade: string } | undefined {
  const grade = w.grade ?? t.defaultGrade;
  if (!(grade in t.grades)) return undefined;
  return { verdict: judgeWafer(w.values, grade, t, w.waivers, w.hasErrors, [], w.findings ?? []).verdict, grade };
}
