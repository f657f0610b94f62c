/**
 * The verdict states, in one place: their keys (used in pages, CSS classes,
 * results.json and the CSV exports), the word shown beside each shape, what
 * each means (the legend), and their severity rank.
 *
 * A metric or finding check is *judged* when its grade sets a limit or a
 * consequence for it: pass, marginal, fail, waived, incomplete. The other
 * states say why it was not judged:
 *   recorded   — measured, but the grade sets no limit for it, or the analysis
 *                found that a premise of the figure does not hold (the reason
 *                says which: e.g. a valley prediction from a profile that
 *                departs from its model);
 *   unmeasured — no value (not measured, or the analysis could not compute it)
 *                and the grade does not require one;
 *   noted      — an open finding whose consequence for this grade is a note.
 * A wafer is `error` when one of its inputs is broken, and `unjudged` when
 * nothing of its grade could be judged.
 */

export const VERDICT_KEYS = ["unmeasured", "recorded", "unjudged", "noted", "pass", "waived", "marginal", "incomplete", "fail", "error"] as const;

export type Verdict = (typeof VERDICT_KEYS)[number];

export interface VerdictState {
  key: Verdict;
  /** The word printed beside the shape. */
  word: string;
  /** One line for the legend. */
  meaning: string;
  /** Severity rank: higher is worse. Not-judged states rank below pass. */
  rank: number;
  /** True for the states that come from a limit or a finding's consequence. */
  judged: boolean;
}

export const VERDICT_STATES: readonly VerdictState[] = [
  {
    key: "unmeasured",
    word: "unmeasured",
    meaning: "no value: not measured, or the analysis could not compute it; the grade does not require it",
    rank: 0,
    judged: false,
  },
  {
    key: "recorded",
    word: "recorded",
    meaning: "measured, but not judged: the grade sets no limit for it, or a premise of the analysis does not hold (the reason says which)",
    rank: 0,
    judged: false,
  },
  { key: "unjudged", word: "unjudged", meaning: "wafer: nothing its grade sets a limit for could be judged", rank: 0, judged: false },
  { key: "noted", word: "noted", meaning: "an open finding that the grade (or a waiver) lets stand as a note", rank: 0, judged: false },
  { key: "pass", word: "pass", meaning: "within every limit", rank: 1, judged: true },
  { key: "waived", word: "waived", meaning: "not passing, but a recorded waiver covers it", rank: 2, judged: true },
  {
    key: "marginal",
    word: "marginal",
    meaning: "passes, but within the guard band of a limit, or a finding the grade counts as marginal",
    rank: 3,
    judged: true,
  },
  { key: "incomplete", word: "incomplete", meaning: "the grade requires a value that is missing", rank: 4, judged: true },
  { key: "fail", word: "fail", meaning: "outside a limit, or a finding the grade counts as a failure", rank: 5, judged: true },
  { key: "error", word: "error", meaning: "an input file is broken; see Input problems", rank: 6, judged: true },
];

export const VERDICT_BY_KEY: ReadonlyMap<Verdict, VerdictState> = new Map(VERDICT_STATES.map((s) => [s.key, s]));

/** Severity rank: higher is worse. */
export const VERDICT_RANK = Object.fromEntries(VERDICT_STATES.map((s) => [s.key, s.rank])) as Record<Verdict, number>;

/** True when the state comes from a limit or a finding's consequence. */
export function isJudged(v: Verdict): boolean {
  return VERDICT_BY_KEY.get(v)!.judged;
}
