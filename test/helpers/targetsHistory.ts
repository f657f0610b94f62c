/**
 * Fixtures for tests of targets over time (verdicts under past targets, what a
 * targets commit changed, the commit that recorded a decision): targets.yaml
 * text with a peak-mobility minimum and a wafer as the history re-judges it;
 * the temporary git repository to commit them into is test/helpers/gitRepo.ts. Imports nothing from
 * src/analyse (test/helpers are generators, not the code under test).
 */
export { GIT_ENV, GIT_TMP, hasGit, tempRepo } from "./gitRepo.ts";

/**
 * targets.yaml text: default grade qubit, whose peak_mobility minimum is `min` cm²/(V s);
 * `qubit` adds lines under that grade, `grades` adds more grades (indented text, two spaces).
 */
export function mobilityTargets(min: string, more: { qubit?: string[]; grades?: string } = {}): string {
  const qubit = (more.qubit ?? []).map((l) => `    ${l}\n`).join("");
  return `default_grade: qubit\ngrades:\n  qubit:\n    peak_mobility: { min: "${min} cm^2/(V s)" }\n${qubit}${more.grades ?? ""}`;
}

/** A wafer as the history re-judges it: one device HB1 with these metric values (metric units), no waivers, no input errors. */
export function historyWafer(values: Record<string, number>, more: { grade?: string } = {}) {
  return {
    values: Object.fromEntries(Object.entries(values).map(([k, v]) => [k, { perDevice: { HB1: v } }])),
    ...(more.grade !== undefined ? { grade: more.grade } : {}),
    waivers: [] as never[],
    hasErrors: false,
  };
}
