/**
 * Verdicts over time: a wafer's current metric values re-judged under every
 * version of targets.yaml since the wafer was recorded, so an auditor can read
 * "passed under the targets of <date>, fails under today's".
 *
 * Which versions: the version in force when the wafer was first committed
 * (the newest targets commit at or before that date) and every later one. A
 * wafer not yet committed is judged under the newest committed version only.
 * A version that no longer parses is listed with its reason and no verdict.
 * Pure: the history is read elsewhere (src/validate/load/history.ts).
 */
import { judgeWafer, type MetricValues, type Verdict } from "./verdict.ts";
import type { Waiver } from "../validate/wafer.ts";
import type { FindingCheck } from "./findings.ts";
import type { TargetsVersion } from "../validate/load/history.ts";

export interface VerdictAtVersion {
  hash: string;
  shortHash: string;
  /** Date of the targets commit, ISO 8601. */
  date: string;
  subject: string;
  /** Null when the targets did not parse or do not define the wafer's grade. */
  verdict: Verdict | null;
  grade: string | null;
  reasons: string[];
  /** Why there is no verdict, in plain words. */
  note?: string;
}

export interface WaferForHistory {
  values: Record<string, MetricValues>;
  /** The grade named in wafer.md, if any (else each version's default grade). */
  grade?: string;
  waivers: Waiver[];
  hasErrors: boolean;
  /** Today's finding checks, judged under each version's consequences (none: findings are not judged). */
  findings?: FindingCheck[];
}

/** Selects the targets versions that apply since `recordedAt` (ISO date or timestamp; undefined: not committed). Oldest first. */
export function versionsSince(versions: readonly TargetsVersion[], recordedAt: string | undefined): TargetsVersion[] {
  const asc = [...versions].sort((a, b) => Date.parse(a.date) - Date.parse(b.date));
  if (asc.length === 0) return [];
  if (recordedAt === undefined) return asc.slice(-1);
  const t = Date.parse(recordedAt);
  let start = 0;
  asc.forEach((v, i) => {
    if (Date.parse(v.date) <= t) start = i;
  });
  return asc.slice(start);
}

/** Re-judges the wafer's current values under each applicable targets version, oldest first. */
export function verdictsOverTime(w: WaferForHistory, versions: readonly TargetsVersion[], recordedAt: string | undefined): VerdictAtVersion[] {
  return versionsSince(versions, recordedAt).map((v) => {
    const base = { hash: v.hash, shortHash: v.shortHash, date: v.date, subject: v.subject };
    if (!v.targets) return { ...base, verdict: null, grade: null, reasons: [], note: v.error ?? "targets unavailable" };
    const grade = w.grade ?? v.targets.defaultGrade;
    if (!(grade in v.targets.grades)) return { ...base, verdict: null, grade, reasons: [], note: `grade ${grade} was not defined in these targets` };
    const j = judgeWafer(w.values, grade, v.targets, w.waivers, w.hasErrors, w.hasErrors ? ["the wafer has input errors today"] : [], w.findings ?? []);
    return { ...base, verdict: j.verdict, grade, reasons: j.reasons };
  });
}

/** Date (ISO) of the oldest commit in `commits` (newest first) that touched `wafers/<id>/`, or undefined. */
export function firstRecorded(commits: readonly { committedAt: string; dataFiles: string[] }[], waferId: string): string | undefined {
  const prefix = `wafers/${waferId}/`;
  let first: string | undefined;
  for (const c of commits) if (c.dataFiles.some((f) => f.startsWith(prefix))) first = c.committedAt;
  return first;
}
