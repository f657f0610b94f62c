/**
 * The wafer page's table of checks: what was judged first (metrics the grade
 * sets a limit for, and every finding check), then the other figures
 * (measured without a limit for this grade, or not measured), folded; and the
 * legend of verdict states (src/judge/states.ts) so no state is read by
 * colour or guesswork.
 */
import type { FindingJudgement, WaferJudgement } from "../judge/verdict.ts";
import { VERDICT_STATES, type Verdict } from "../judge/states.ts";
import { metricRow, type MetricRow } from "./waferPage.ts";

export interface CheckRow extends MetricRow {
  /** "metric" or "finding", for the row's id and class. */
  kind: "metric" | "finding";
}

const CONSEQUENCE_WORD = { fail: "fails the wafer", marginal: "makes the wafer marginal", note: "is kept as a note" } as const;

export function findingRow(f: FindingJudgement, grade: string): CheckRow {
  return {
    kind: "finding",
    key: `finding-${f.key}`,
    label: `Finding: ${f.spec.label.toLowerCase()}`,
    value: !f.check.checked ? "not checked" : f.check.raised.length ? "raised" : "not raised",
    target: `if raised, ${CONSEQUENCE_WORD[f.consequence]} (${f.fromGrade ? `set for grade ${grade}` : "default"})`,
    verdict: f.verdict,
    reason: f.reason ?? "",
    perDevice: "",
    description: f.spec.description,
  };
}

export interface CheckTable {
  judged: CheckRow[];
  other: CheckRow[];
  /** Counts for the folded group's summary line. */
  otherCounts: { recorded: number; unmeasured: number };
}

/** Judged rows (metrics with a limit, then findings) first; the rest for the folded "other figures" group. */
export function checkTable(j: WaferJudgement): CheckTable {
  const metrics = j.metrics.map((m) => ({ ...metricRow(m), kind: "metric" as const, judged: m.target !== undefined }));
  const strip = ({ judged: _j, ...row }: CheckRow & { judged: boolean }): CheckRow => row;
  const other = metrics.filter((m) => !m.judged).map(strip);
  return {
    judged: [...metrics.filter((m) => m.judged).map(strip), ...j.findings.map((f) => findingRow(f, j.grade))],
    other,
    otherCounts: { recorded: other.filter((r) => r.verdict === "recorded").length, unmeasured: other.filter((r) => r.verdict === "unmeasured").length },
  };
}

/** Legend order: the judged states from best to worst, then the states that say why nothing was judged. */
const LEGEND_ORDER: readonly Verdict[] = ["pass", "marginal", "waived", "incomplete", "fail", "error", "noted", "recorded", "unmeasured", "unjudged"];

/** The legend: every state's word and meaning (src/judge/states.ts). */
export function verdictLegend(): { key: Verdict; meaning: string }[] {
  const meaning = new Map(VERDICT_STATES.map((s) => [s.key, s.meaning]));
  return LEGEND_ORDER.map((key) => ({ key, meaning: meaning.get(key)! }));
}
