/**
 * The lab's decision on a wafer (wafer.md `decision:`) set beside the computed verdict. waferbook
 * never overrides the decision; it says when the two disagree, so a QA lead sees it at once:
 *   - released, while the verdict is fail, incomplete or error (a target not met and not waived,
 *     a required figure missing, or broken input);
 *   - rejected, while the verdict is pass or waived (every judged target met).
 * `held` never conflicts, and neither does a verdict with nothing judged. Pure.
 */
import type { Verdict } from "./verdict.ts";
import type { Decision } from "../validate/decision.ts";

/** Verdicts under which releasing a wafer contradicts the targets. */
const NOT_RELEASABLE = new Set<string>(["fail", "incomplete", "error"]);
/** Verdicts under which rejecting a wafer contradicts the targets. */
const ALL_MET = new Set<string>(["pass", "waived"]);

/** Why the decision contradicts the verdict, in plain words, or undefined when it does not. */
export function decisionConflict(d: Decision, j: { verdict: Verdict | string; reasons: readonly string[] }): string | undefined {
  if (d.state === "released" && NOT_RELEASABLE.has(j.verdict)) {
    const why = j.reasons.length ? `: ${j.reasons.slice(0, 3).join("; ")}${j.reasons.length > 3 ? "; …" : ""}` : "";
    return `released by ${d.by} on ${d.date}, but the computed verdict is ${j.verdict}${why} (no waiver covers it)`;
  }
  if (d.state === "rejected" && ALL_MET.has(j.verdict)) {
    return `rejected by ${d.by} on ${d.date}, but the computed verdict is ${j.verdict}: every judged target is met`;
  }
  return undefined;
}
