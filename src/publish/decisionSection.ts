/**
 * The lab's decision on a wafer as the wafer page shows it: state, who, when, why, and the
 * conflict with the computed verdict (src/judge/decision.ts). The commit that recorded it comes
 * with the wafer's history (src/validate/load/decisionCommits.ts, decisionCommitModel in history.ts).
 */
import type { WaferOutcome } from "../judge/outcome.ts";
import { decisionConflict } from "../judge/decision.ts";

/** What each state means, for the page. */
export const DECISION_TEXT: Record<string, string> = {
  released: "released for use",
  held: "on hold",
  rejected: "rejected",
};

export function decisionModel(o: WaferOutcome) {
  const d = o.record?.decision;
  if (!d) return null;
  return {
    state: d.state,
    text: DECISION_TEXT[d.state] ?? d.state,
    by: d.by,
    date: d.date,
    reason: d.reason,
    conflict: decisionConflict(d, o.judgement) ?? "",
  };
}

/** The lab's decision in results.json, with its conflict with the computed verdict (null when none recorded). */
export function decisionJson(o: WaferOutcome) {
  const d = o.record?.decision;
  return d ? { state: d.state, by: d.by, date: d.date, reason: d.reason, conflict: decisionConflict(d, o.judgement) ?? null } : null;
}
