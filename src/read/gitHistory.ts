/**
 * Git history of the data folder, read with the `git` command (side-effecting reader).
 *
 * Everything goes through an injectable {@link GitRunner} (default: `execFile("git", …)`), so tests
 * can use a real temporary repository or a fake. When git is not installed, or the folder is not
 * inside a git work tree, {@link findRepo} returns null and the site builds without history.
 *
 * Paths: git reports paths relative to the repository root (POSIX separators). The data folder may
 * be a subfolder of the repository; {@link GitRepo.prefix} is that subfolder ("" at the root, else
 * ending in "/"). Functions here take paths RELATIVE TO THE DATA FOLDER and return both forms.
 *
 * Log parsing: `git log -z --name-only --format=<RS>%H<US>%h<US>%aI<US>%cI<US>%an<US>%s`, i.e. each
 * commit starts with the record separator U+001E, header fields are split by the unit separator
 * U+001F, and with -z the header and each file name end in NUL (file names are not quoted, so any
 * byte other than NUL is safe). Commits are returned newest first (git's default order).
 */
import { execFile } from "node:child_process";

/** Runs git with `args` in `cwd`; resolves with stdout, rejects when git fails or is missing. */
export type GitRunner = (args: readonly string[], cwd: string) => Promise<string>;

export interface GitRunnerOptions {
  /** Path of the git executable; default "git" (found on PATH). */
  gitPath?: string;
  /** Extra environment variables (merged over process.env). */
  env?: Record<string, string>;
}

/** The default runner: execFile with UTF-8 output, a 64 MiB buffer, no pager, no optional locks. */
export function makeGitRunner(options: GitRunnerOptions = {}): GitRunner {
  const gitPath = options.gitPath ?? "git";
  return (args, cwd) =>
    new Promise((resolve, reject) => {
      execFile(
        gitPath,
        [...args],
        {
          cwd,
          encoding: "utf8",
          maxBuffer: 64 * 1024 * 1024,
          env: { ...process.env, GIT_PAGER: "cat", GIT_OPTIONAL_LOCKS: "0", LC_ALL: "C", ...options.env },
        },
        (error, stdout) => (error ? reject(error) : resolve(stdout)),
      );
    });
}

export const defaultGitRunner: GitRunner = makeGitRunner();

export interface GitRepo {
  /** Absolute path of the repository's top-level folder, as git reports it. */
  root: string;
  /** Data folder relative to root, POSIX, "" or ending in "/". */
  prefix: string;
  /** Full hash of HEAD, or null in a repository without commits. */
  head: string | null;
  run: GitRunner;
}

export interface GitCommit {
  hash: string;
  shortHash: string;
  /** Author date, strict ISO 8601 with offset (git %aI). */
  date: string;
  /** Committer date, strict ISO 8601 (git %cI). */
  committedAt: string;
  author: string;
  subject: string;
  /** Files changed, relative to the repository root (merge commits list none). */
  files: string[];
  /** The subset of `files` inside the data folder, relative to the data folder. */
  dataFiles: string[];
}

/**
 * Finds the git work tree containing `folder` (absolute path of the data folder).
 * Returns null — never throws — when git is missing, the folder is not in a work tree, or git
 * refuses the repository (e.g. unsafe ownership).
 */
export async function findRepo(folder: string, run: GitRunner = defaultGitRunner): Promise<GitRepo | null> {
  let out: string;
  try {
    out = await run(["rev-parse", "--is-inside-work-tree", "--show-toplevel", "--show-prefix"], folder);
  } catch {
    return null;
  }
  const lines = out.split("\n");
  if (lines[0]?.trim() !== "true" || !lines[1]) return null;
  const repo: GitRepo = { root: lines[1].trim(), prefix: (lines[2] ?? "").trim(), head: null, run };
  repo.head = await headCommit(repo);
  return repo;
}

/** Full hash of HEAD for provenance, or null when the repository has no commits yet. */
export async function headCommit(repo: Pick<GitRepo, "root" | "run">): Promise<string | null> {
  try {
    const out = (await repo.run(["rev-parse", "--verify", "--quiet", "HEAD^{commit}"], repo.root)).trim();
    return /^[0-9a-f]{40,64}$/.test(out) ? out : null;
  } catch {
    return null;
  }
}

/** Converts a data-folder-relative path (either separator; a leading "./" is dropped) to a repository-relative POSIX path. */
export function toRepoPath(repo: Pick<GitRepo, "prefix">, dataPath: string): string {
  const clean = dataPath.replace(/\\/g, "/").replace(/^\.\//, "").replace(/^\/+/, "");
  return repo.prefix + clean;
}

/** Converts a repository-relative path to one relative to the data folder, or null if outside it. */
export function toDataPath(repo: Pick<GitRepo, "prefix">, repoPath: string): string | null {
  if (!repo.prefix) return repoPath;
  return repoPath.startsWith(repo.prefix) ? repoPath.slice(repo.prefix.length) : null;
}

export const LOG_FORMAT = "%x1e%H%x1f%h%x1f%aI%x1f%cI%x1f%an%x1f%s";

/** Parses the output of `git log -z --name-only --format=LOG_FORMAT` (exported for tests). */
export function parseGitLog(stdout: string, prefix = ""): GitCommit[] {
  const commits: GitCommit[] = [];
  for (const record of stdout.split("\x1e")) {
    if (record.trim() === "") continue;
    const nul = record.indexOf("\0");
    const header = nul < 0 ? record : record.slice(0, nul);
    const fields = header.split("\x1f");
    if (fields.length < 6) continue;
    const [hash, shortHash, date, committedAt, author, ...subjectParts] = fields;
    // After the header's NUL, git writes one "\n" before the NUL-terminated file names.
    const files = nul < 0 ? [] : record.slice(nul + 1).replace(/^\n/, "").split("\0").filter((f) => f !== "");
    const dataFiles = files.map((f) => toDataPath({ prefix }, f)).filter((f): f is string => f !== null);
    commits.push({ hash, shortHash, date, committedAt, author, subject: subjectParts.join("\x1f").trim(), files, dataFiles });
  }
  return commits;
}

export interface ListCommitsOptions {
  /** Path relative to the data folder (file or folder); default the whole data folder. */
  path?: string;
  /** Newest N commits only. */
  maxCount?: number;
}

/**
 * Commits touching the data folder (or `options.path` inside it), newest first, each with the files
 * it changed. Returns [] for a repository without commits. Rejects (GitError from the runner) on
 * unexpected git failures; callers building the site may catch and go on without history.
 */
export async function listCommits(repo: GitRepo, options: ListCommitsOptions = {}): Promise<GitCommit[]> {
  if (repo.head === null) return [];
  const target = options.path === undefined ? repo.prefix : toRepoPath(repo, options.path);
  const args = ["log", "-z", "--name-only", `--format=${LOG_FORMAT}`, "--no-color"];
  if (options.maxCount !== undefined) args.push(`--max-count=${Math.max(1, Math.floor(options.maxCount))}`);
  // Pathspec relative to the top, taken literally (no glob characters in file names can misfire).
  if (target !== "") args.push("--", `:(top,literal)${target}`);
  return parseGitLog(await repo.run(args, repo.root), repo.prefix);
}

/** Commits that changed one file (e.g. "targets.yaml", relative to the data folder), newest first. */
export async function commitsChangingFile(repo: GitRepo, dataPath: string): Promise<GitCommit[]> {
  return listCommits(repo, { path: dataPath });
}

/**
 * Content (UTF-8 text) of a data-folder-relative file at a commit, via `git show <hash>:<path>`.
 * Returns null when the file does not exist at that commit (or git fails). Throws RangeError for a malformed hash
 * (programming error: hashes come from {@link listCommits}).
 */
export async function fileAtCommit(repo: GitRepo, hash: string, dataPath: string): Promise<string | null> {
  if (!/^[0-9a-f]{4,64}$/i.test(hash)) throw new RangeError(`fileAtCommit: not a commit hash: ${hash}`);
  try {
    return await repo.run(["show", "--no-textconv", `${hash}:${toRepoPath(repo, dataPath)}`], repo.root);
  } catch {
    return null;
  }
}
