/**
 * The lab's decision on a wafer, wafer.md `decision:` (docs/formats.md §1):
 *   decision:
 *     state: released          # released | held | rejected
 *     by: "I. Okonkwo-Hale"     # who decided
 *     date: 2025-01-10          # when (a real date, not before growth, not in the future)
 *     reason: "meets the qubit targets; shipped to device team"
 * The shape (keys, types) is checked by the wafer schema; this adds the checks a schema cannot make.
 */
import { InputError } from "../model/problem.ts";
import { isRealDate } from "./dates.ts";

export const DECISION_STATES = ["released", "held", "rejected"] as const;
export type DecisionState = (typeof DECISION_STATES)[number];

export interface Decision {
  state: DecisionState;
  by: string;
  /** ISO date YYYY-MM-DD. */
  date: string;
  reason: string;
}

/** JSON-schema fragment for the wafer schema. */
export const DECISION_SCHEMA = {
  type: "object",
  additionalProperties: false,
  required: ["state", "by", "date", "reason"],
  properties: {
    state: { enum: [...DECISION_STATES] },
    by: { type: "string", minLength: 1 },
    date: { type: "string", pattern: "^\\d{4}-\\d{2}-\\d{2}$" },
    reason: { type: "string", minLength: 1 },
  },
} as const;

/** Checks the dates of a schema-valid decision; throws a located InputError. */
export function readDecision(
  raw: unknown,
  at: { file: string; grown: string; today: string; lineOf: (field: string) => number | undefined },
): Decision | undefined {
  if (raw === undefined || raw === null) return undefined;
  const d = raw as Decision;
  const where = { file: at.file, field: "decision.date", line: at.lineOf("decision.date") };
  if (!isRealDate(d.date))
    throw new InputError({
      ...where,
      message: "not a calendar date",
      expected: "a real date YYYY-MM-DD",
      found: JSON.stringify(d.date),
      fix: "correct the month or day",
    });
  if (d.date > at.today)
    throw new InputError({
      ...where,
      message: "decision date is in the future",
      expected: `a date on or before ${at.today}`,
      found: d.date,
      fix: "write the date the decision was taken",
    });
  if (d.date < at.grown)
    throw new InputError({
      ...where,
      message: "decision date is before the wafer was grown",
      expected: `a date on or after ${at.grown}`,
      found: d.date,
      fix: "correct the decision date (or the growth date)",
    });
  for (const k of ["by", "reason"] as const) {
    if (d[k].trim() === "")
      throw new InputError({
        file: at.file,
        field: `decision.${k}`,
        line: at.lineOf(`decision.${k}`),
        message: `decision.${k} is blank`,
        expected: k === "by" ? "the name of who decided" : "why, in a sentence",
        found: JSON.stringify(d[k]),
        fix: `write decision.${k}`,
      });
  }
  return { state: d.state, by: d.by.trim(), date: d.date, reason: d.reason.trim() };
}
