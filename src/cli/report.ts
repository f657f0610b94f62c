/**
 * The one error reporter: one line per problem, `path:line: what (expected …,
 * found …) — fix`, then a summary. Stack traces only for internal errors.
 */
import type { Problem } from "../validate/problem.ts";
import { formatProblem } from "../validate/problem.ts";
import type { BuildResult } from "./build.ts";

export function reportProblems(problems: Problem[], log: (s: string) => void): void {
  for (const p of problems) log(formatProblem(p));
}

export function summary(result: BuildResult, seconds: number): string {
  const counts = new Map<string, number>();
  for (const o of result.outcomes) counts.set(o.judgement.verdict, (counts.get(o.judgement.verdict) ?? 0) + 1);
  const verdicts = [...counts.entries()].map(([v, n]) => `${n} ${v}`).join(", ");
  const errors = result.problems.filter((p) => p.severity === "error").length;
  const warnings = result.problems.filter((p) => p.severity === "warning").length;
  return `${result.outcomes.length} wafers (${verdicts || "none"}); ${errors} input error${errors === 1 ? "" : "s"}, ${warnings} warning${warnings === 1 ? "" : "s"}; ${seconds.toFixed(1)} s`;
}
