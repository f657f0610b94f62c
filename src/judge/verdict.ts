/**
 * Judges a wafer's metrics against the targets of its grade, and the findings
 * the analysis raised against the consequences its grade sets.
 *
 * Metric verdicts (states.ts): pass; marginal (passes, but within the guard
 * band of a limit); fail; waived (not passing, but a recorded waiver covers
 * it); incomplete (a required metric has no value); recorded (measured, no
 * limit for this grade); unmeasured (no value, none required).
 * Finding checks (findings.ts): pass (checked, not raised); when raised, the
 * grade's consequence — fail, marginal, or noted — or waived when a waiver
 * names the finding; unmeasured when the wafer lacks the data to check.
 * The wafer verdict is the worst judged state, in the order error > fail >
 * incomplete > marginal > waived > pass; `unjudged` when nothing was judged.
 * So a wafer cannot pass beside an open finding unless its grade makes the
 * finding a note or a waiver covers it. Every non-pass verdict carries its
 * reasons in plain words. Verdicts support, and never replace, the lab's own
 * QA sign-off.
 */
import { METRIC_BY_KEY, type MetricSpec } from "../model/metrics.ts";
import type { Aggregate, Target, Targets } from "../validate/targets.ts";
import type { Waiver } from "../validate/wafer.ts";
import { formatValue } from "../model/format.ts";
import { FINDING_BY_KEY, type Consequence, type FindingCheck, type FindingSpec } from "./findings.ts";

import { VERDICT_RANK, type Verdict } from "./states.ts";
export { VERDICT_RANK, type Verdict } from "./states.ts";

/** The worst of the verdicts; `unjudged` when there are none (or only not-judged states). */
export function worst(verdicts: Verdict[]): Verdict {
  return verdicts.reduce<Verdict>((w, v) => (VERDICT_RANK[v] > VERDICT_RANK[w] ? v : w), "unjudged");
}

export interface MetricValues {
  /** Per-device values in the metric's unit. */
  perDevice: Record<string, number>;
  /** A wafer-level value (structure figures measured once per wafer). */
  wafer?: number;
  /** Set when the analysis found a premise of this metric does not hold: shown, not judged, with this reason. */
  notJudged?: string;
}

export interface MetricJudgement {
  key: string;
  spec: MetricSpec;
  /** Aggregated value used for the verdict. */
  value?: number;
  perDevice: Record<string, number>;
  target?: Target;
  verdict: Verdict;
  reason?: string;
  /** The analysis's reason this measured value is not judged (MetricValues.notJudged), with or without a target; exported site-wide. */
  notJudged?: string;
  waiver?: Waiver;
}

export interface FindingJudgement {
  key: string;
  spec: FindingSpec;
  check: FindingCheck;
  /** The consequence in force for this grade, and whether the grade set it (else the default). */
  consequence: Consequence;
  fromGrade: boolean;
  verdict: Verdict;
  reason?: string;
  waiver?: Waiver;
}

export interface WaferJudgement {
  grade: string;
  verdict: Verdict;
  reasons: string[];
  metrics: MetricJudgement[];
  /** One judged check per finding (findings.ts FINDING_KEYS order). */
  findings: FindingJudgement[];
}

/** How devices combine into the wafer's value; `every-device` shows the mean (each device is judged separately). */
function aggregate(values: number[], how: Aggregate): number | undefined {
  if (values.length === 0) return undefined;
  if (how === "min") return Math.min(...values);
  if (how === "max") return Math.max(...values);
  return values.reduce((a, b) => a + b, 0) / values.length;
}

/** Judges one value against one target. */
export function judgeValue(value: number, t: Target): { verdict: "pass" | "marginal" | "fail"; reason?: string } {
  const spec = METRIC_BY_KEY.get(t.metric)!;
  const fmt = (v: number) => formatValue(v, spec);
  if (t.min !== undefined && value < t.min) return { verdict: "fail", reason: `${spec.label} ${fmt(value)} is below the minimum ${fmt(t.min)}` };
  if (t.max !== undefined && value > t.max) return { verdict: "fail", reason: `${spec.label} ${fmt(value)} is above the maximum ${fmt(t.max)}` };
  if (t.guard) {
    if (t.min !== undefined && value < t.min + t.guard)
      return {
        verdict: "marginal",
        reason: `${spec.label} ${fmt(value)} passes but lies within the guard band (${t.guardText}) above the minimum ${fmt(t.min)}`,
      };
    if (t.max !== undefined && value > t.max - t.guard)
      return {
        verdict: "marginal",
        reason: `${spec.label} ${fmt(value)} passes but lies within the guard band (${t.guardText}) below the maximum ${fmt(t.max)}`,
      };
  }
  return { verdict: "pass" };
}

function judgeMetric(key: string, values: MetricValues | undefined, t: Target | undefined, waiver: Waiver | undefined): MetricJudgement {
  const spec = METRIC_BY_KEY.get(key)!;
  const per = values?.perDevice ?? {};
  const devVals = Object.values(per);
  const value = values?.wafer ?? aggregate(devVals, t?.aggregate ?? "mean");
  const j: MetricJudgement = { key, spec, value, perDevice: per, target: t, verdict: value === undefined ? "unmeasured" : "recorded" };
  if (value !== undefined && values?.notJudged) j.notJudged = values.notJudged;
  if (!t) {
    j.reason = value === undefined ? "no value and no target" : "no target for this grade";
    return finishWaiver(j, waiver);
  }
  if (value !== undefined && values?.notJudged) {
    // Measured, but the analysis says its premises fail: shown as recorded with the reason, never judged.
    j.reason = `not judged: ${values.notJudged}`;
    return j;
  }
  if (value === undefined) {
    j.verdict = t.required ? "incomplete" : "unmeasured";
    j.reason = t.required ? `${spec.label} is required but was not measured or could not be computed` : `${spec.label} was not measured`;
    return finishWaiver(j, waiver);
  }
  if (t.aggregate === "every-device" && devVals.length) {
    const results = Object.entries(per).map(([id, v]) => ({ id, ...judgeValue(v, t) }));
    const w = worst(results.map((r) => r.verdict));
    j.verdict = w;
    const bad = results.filter((r) => r.verdict === w && w !== "pass");
    if (bad.length) j.reason = bad.map((r) => `device ${r.id}: ${r.reason}`).join("; ");
  } else {
    const r = judgeValue(value, t);
    j.verdict = r.verdict;
    if (r.reason) j.reason = (t.aggregate !== "mean" && devVals.length > 1 ? `${t.aggregate} over ${devVals.length} devices: ` : "") + r.reason;
  }
  return finishWaiver(j, waiver);
}

const CONSEQUENCE_VERDICT: Record<Consequence, Verdict> = { fail: "fail", marginal: "marginal", note: "noted" };

/** Judges one finding check under the grade's consequence and any waiver naming it. */
export function judgeFinding(check: FindingCheck, consequence: Consequence | undefined, waiver: Waiver | undefined): FindingJudgement {
  const spec = FINDING_BY_KEY.get(check.key)!;
  const c = consequence ?? spec.defaultConsequence;
  const j: FindingJudgement = { key: check.key, spec, check, consequence: c, fromGrade: consequence !== undefined, verdict: "pass", waiver };
  if (!check.checked) {
    j.verdict = "unmeasured";
    j.reason = `not checked: ${check.why}`;
    return j;
  }
  if (check.raised.length === 0) {
    j.reason = spec.clear;
    return j;
  }
  const what = `${spec.label}: ${check.raised.join("; ")}`;
  j.verdict = CONSEQUENCE_VERDICT[c];
  j.reason = c === "note" ? `${what} (a note for this grade)` : what;
  if (waiver && (j.verdict === "fail" || j.verdict === "marginal")) {
    j.reason = `waived by ${waiver.approved_by} on ${waiver.date}: ${waiver.reason} (was ${j.verdict}: ${what})`;
    j.verdict = "waived";
  }
  return j;
}

function finishWaiver(j: MetricJudgement, waiver: Waiver | undefined): MetricJudgement {
  if (!waiver) return j;
  j.waiver = waiver;
  if (j.verdict === "fail" || j.verdict === "marginal" || j.verdict === "incomplete") {
    j.reason = `waived by ${waiver.approved_by} on ${waiver.date}: ${waiver.reason} (was ${j.verdict}: ${j.reason})`;
    j.verdict = "waived";
  }
  return j;
}

export function judgeWafer(
  values: Record<string, MetricValues>,
  grade: string,
  targets: Targets,
  waivers: Waiver[],
  hasErrors: boolean,
  errorReasons: string[] = [],
  checks: FindingCheck[] = [],
): WaferJudgement {
  const limits = targets.grades[grade] ?? {};
  const keys = new Set([...Object.keys(values), ...Object.keys(limits)]);
  const ordered = [...METRIC_BY_KEY.keys()].filter((k) => keys.has(k));
  const metrics = ordered.map((k) =>
    judgeMetric(
      k,
      values[k],
      limits[k],
      waivers.find((w) => w.metric === k),
    ),
  );
  const consequences = targets.findings?.[grade] ?? {};
  const findings = checks.map((c) =>
    judgeFinding(
      c,
      consequences[c.key],
      waivers.find((w) => w.finding === c.key),
    ),
  );
  const judged: { verdict: Verdict; reason?: string }[] = [...metrics.filter((m) => m.target), ...findings];
  let verdict = worst(judged.map((m) => m.verdict));
  // Reasons worst first, so the first line of a summary says why the verdict is what it is; notes last.
  const reasons = judged
    .filter((m) => (m.verdict !== "pass" && VERDICT_RANK[m.verdict] > 0) || m.verdict === "noted")
    .filter((m) => m.reason)
    .sort((a, b) => VERDICT_RANK[b.verdict] - VERDICT_RANK[a.verdict])
    .map((m) => (m.verdict === "noted" ? `note: ${m.reason}` : m.reason!));
  if (hasErrors) {
    verdict = "error";
    reasons.unshift(...errorReasons);
  }
  return { grade, verdict, reasons, metrics, findings };
}
