/**
 * The data repository's history for the site: HEAD commit, the commits that
 * touched the data folder, and every version of targets.yaml (parsed, or the
 * reason it no longer parses). Read with the `git` command through
 * src/read/gitHistory.ts. Never throws: returns null only when the data
 * folder is not inside a git work tree; when git is missing, refuses the
 * repository, fails or writes a log that does not parse, the history comes
 * back empty with `failure` saying why, so that the changes page and the
 * build output can warn instead of silently showing nothing.
 */
import {
  commitsChangingFile,
  fileAtCommit,
  findRepo,
  listCommits,
  withObjectReader,
  defaultGitRunner,
  type GitCommit,
  type GitRunner,
} from "../../read/gitHistory.ts";
import { readYaml } from "../../read/frontMatter.ts";
import { validateTargets, type Targets } from "../targets.ts";
import { formatProblem, InputError } from "../../model/problem.ts";
import type { DecisionCommit } from "./decisionCommits.ts";

export interface TargetsVersion {
  hash: string;
  shortHash: string;
  /** Committer date, ISO 8601 (when this version came into force in the repository). */
  date: string;
  subject: string;
  /** The targets as they stood at this commit, or why that file no longer parses (or was absent). */
  targets?: Targets;
  error?: string;
}

export interface DataHistory {
  /** Full hash of HEAD, or null in a repository without commits. */
  head: string | null;
  /** Commits touching the data folder, newest first. */
  commits: GitCommit[];
  /** Versions of targets.yaml, newest first. */
  targetsVersions: TargetsVersion[];
  /** Why the history could not be read (then commits and targetsVersions are empty): shown as a warning. */
  failure?: string;
  /** Wafer id → the commit that recorded its decision (src/validate/load/decisionCommits.ts), filled by the build. */
  decisions?: Map<string, DecisionCommit>;
}

/** Most commits read; older history is left out of the pages. */
export const MAX_COMMITS = 2000;

/** Parses targets.yaml text as it stood at a commit; the reason in plain words when it does not parse. */
export function parseOldTargets(text: string | null): { targets?: Targets; error?: string } {
  if (text === null) return { error: "targets.yaml did not exist at this commit" };
  try {
    return { targets: validateTargets(readYaml(text, "targets.yaml"), "targets.yaml", text) };
  } catch (err) {
    if (err instanceof InputError) return { error: `no longer parses: ${formatProblem(err.problem)}` };
    return { error: `no longer parses: ${(err as Error).message}` };
  }
}

/** Reads the data folder's git history; null when the folder is not in a git work tree; a `failure` when it could not be read. */
export async function loadDataHistory(dataDir: string, run: GitRunner = defaultGitRunner): Promise<DataHistory | null> {
  let head: string | null = null;
  try {
    const repo = await findRepo(dataDir, run);
    if (!repo) return null;
    head = repo.head;
    const commits = await listCommits(repo, { maxCount: MAX_COMMITS });
    const targetsVersions: TargetsVersion[] = [];
    const changes = await commitsChangingFile(repo, "targets.yaml");
    await withObjectReader(repo, async () => {
      for (const c of changes) {
        const parsed = parseOldTargets(await fileAtCommit(repo, c.hash, "targets.yaml"));
        targetsVersions.push({ hash: c.hash, shortHash: c.shortHash, date: c.committedAt, subject: c.subject, ...parsed });
      }
    });
    return { head: repo.head, commits, targetsVersions };
  } catch (err) {
    return { head, commits: [], targetsVersions: [], failure: (err instanceof Error ? err.message : String(err)).split(dataDir).join("<data folder>") };
  }
}
