/**
 * The one error reporter: one line per problem, `path:line: what (expected …,
 * found …) — fix`, then a summary. Stack traces only for internal errors.
 */
import type { Problem } from "../model/problem.ts";
import { formatProblem } from "../model/problem.ts";
import { countText } from "../model/format.ts";
import type { BuildResult } from "./build.ts";
import type { Verdict } from "../judge/verdict.ts";

/** The order the summary lists verdict counts in, best first, whatever order the wafers came in. */
export const SUMMARY_ORDER: readonly Verdict[] = ["pass", "marginal", "waived", "fail", "incomplete", "unjudged", "error", "noted", "recorded", "unmeasured"];

export function reportProblems(problems: Problem[], log: (s: string) => void): void {
  for (const p of problems) log(formatProblem(p));
}

export function summary(result: BuildResult, seconds: number): string {
  const counts = new Map<string, number>();
  for (const o of result.outcomes) counts.set(o.judgement.verdict, (counts.get(o.judgement.verdict) ?? 0) + 1);
  const verdicts = SUMMARY_ORDER.filter((v) => counts.has(v))
    .map((v) => `${counts.get(v)} ${v}`)
    .join(", ");
  const errors = result.problems.filter((p) => p.severity === "error").length;
  const warnings = result.problems.filter((p) => p.severity === "warning").length;
  return `${countText(result.outcomes.length, "wafer")} (${verdicts || "none"}); ${countText(errors, "input error")}, ${countText(warnings, "warning")}; ${seconds.toFixed(1)} s`;
}

/** What the build took from the cache and what it did itself: "analysed 0 wafers (14 from the cache); drew 0 pages (14 from the cache, 0 reused)". */
export function cacheLine(stats: NonNullable<BuildResult["stats"]>): string {
  const pages = stats.pagesFromCache !== undefined ? ` (${stats.pagesFromCache} from the cache, ${stats.pagesReused} reused from the previous site)` : "";
  return `analysed ${countText(stats.analysed, "wafer")} (${stats.cacheHits} from the cache)${stats.drawn !== undefined ? `; drew ${countText(stats.drawn, "page")}${pages}` : ""}`;
}

/** Prints an internal error (a bug): what to do, then the stack trace. The caller returns EXIT.internal. */
export function reportInternalError(e: unknown, log: (s: string) => void): void {
  log("waferbook: internal error (please report it with the data that triggered it):");
  log((e as Error)?.stack ?? String(e));
}
