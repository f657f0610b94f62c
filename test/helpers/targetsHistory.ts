/**
 * Fixtures for tests of targets over time (verdicts under past targets, what a
 * targets commit changed, the commit that recorded a decision): targets.yaml
 * text with a peak-mobility minimum, a wafer as the history re-judges it, and
 * a temporary git repository to commit them into. Imports nothing from
 * src/analyse (test/helpers are generators, not the code under test).
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, realpathSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

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

/** The temporary folder, resolved (git compares real paths), and the environment that keeps git away from the user's configuration and any repository above it. */
export const GIT_TMP = realpathSync(tmpdir());
export const GIT_ENV = { GIT_CONFIG_GLOBAL: "/dev/null", GIT_CONFIG_NOSYSTEM: "1", GIT_CEILING_DIRECTORIES: GIT_TMP };

/** Whether a git command is available (the history tests are skipped without one). */
export const hasGit = (() => {
  try {
    execFileSync("git", ["--version"]);
    return true;
  } catch {
    return false;
  }
})();

/**
 * A new, empty git repository in a temporary folder: `git` runs a command in it,
 * `commit` adds everything and commits it at `date` (author and committer date)
 * as `committer` (default the fictional "Ada Fictional"), `remove` deletes it.
 */
export function tempRepo(prefix: string) {
  const root = mkdtempSync(join(GIT_TMP, prefix));
  const git = (args: string[], env: Record<string, string> = {}) =>
    execFileSync("git", args, { cwd: root, encoding: "utf8", env: { ...process.env, ...GIT_ENV, ...env } });
  const commit = (msg: string, date: string, committer = "Ada Fictional") => {
    git(["add", "-A"]);
    const email = `${committer.split(" ")[0].toLowerCase()}@example.invalid`;
    git(["-c", `user.name=${committer}`, "-c", `user.email=${email}`, "commit", "-q", "-m", msg], { GIT_AUTHOR_DATE: date, GIT_COMMITTER_DATE: date });
  };
  git(["init", "-q"]);
  return { root, git, commit, remove: () => rmSync(root, { recursive: true, force: true }) };
}
