/**
 * Names the site writes for itself (docs/formats.md, section Output): wafer
 * and run ids become folders beside them (wafers/<id>/, runs/<id>/), so an id
 * equal to one of them, in any letter case (case-insensitive file systems and
 * servers), would overwrite or shadow a page: `run: index.html` would make
 * runs/index.html both the runs page and a folder. Such ids are refused.
 *
 * test/reliability/siteNames.test.ts builds a site and checks that every name
 * it writes at its top level, in wafers/ and in runs/ (other than the ids) is
 * in this list, so the list follows what the site writes.
 */
import type { Problem } from "../model/problem.ts";

export const SITE_NAMES: readonly string[] = [
  "index.html",
  "assets",
  "raw",
  "wafers",
  "runs",
  "trends",
  "targets",
  "changes",
  "search",
  "compare",
  "relation",
  "search-index.json",
  "results.json",
  "results.csv",
];

const RESERVED = new Set(SITE_NAMES.map((n) => n.toLowerCase()));

/** True when `id` equals a name the site writes, ignoring letter case. */
export function isSiteName(id: string): boolean {
  return RESERVED.has(id.toLowerCase());
}

/** The located problem of a wafer or run id that collides with a site name, or undefined when it does not. */
export function siteNameProblem(
  id: string,
  what: "wafer" | "run",
  where: { file: string; line?: number; field?: string; rename: string },
): Problem | undefined {
  if (!isSiteName(id)) return undefined;
  return {
    severity: "error",
    file: where.file,
    line: where.line,
    field: where.field,
    message: `${what} id is a name the site uses for its own pages and files`,
    expected: `an id other than ${SITE_NAMES.join(", ")} (in any letter case)`,
    found: JSON.stringify(id),
    fix: `rename the ${where.rename}`,
  };
}
