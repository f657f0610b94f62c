/**
 * Temporary git repositories for tests: git kept away from the user's
 * configuration and from any repository above the temporary folder, and
 * commits by a fixed fictional identity at a fixed date, so that hashes and
 * history pages do not depend on the machine or the hour.
 */
import { execFile, execFileSync } from "node:child_process";
import { mkdtempSync, realpathSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";

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

/** The fixed author and committer of commitAll (fictional; example.invalid is reserved, RFC 2606). */
const FIXED_COMMITTER = {
  GIT_AUTHOR_NAME: "Test Grower",
  GIT_AUTHOR_EMAIL: "grower@example.invalid",
  GIT_COMMITTER_NAME: "Test Grower",
  GIT_COMMITTER_EMAIL: "grower@example.invalid",
  GIT_AUTHOR_DATE: "2026-05-01T10:00:00Z",
  GIT_COMMITTER_DATE: "2026-05-01T10:00:00Z",
};

/** Commits everything in `dir` as the fixed committer (first `git init` on branch main when `init`). */
export async function commitAll(dir: string, message: string, { init = false }: { init?: boolean } = {}): Promise<void> {
  const run = promisify(execFile);
  const env = { ...process.env, ...GIT_ENV, ...FIXED_COMMITTER };
  if (init) await run("git", ["init", "-q", "-b", "main"], { cwd: dir, env });
  await run("git", ["add", "-A"], { cwd: dir, env });
  await run("git", ["commit", "-q", "-m", message], { cwd: dir, env });
}
