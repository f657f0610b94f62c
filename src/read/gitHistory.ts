/**
 * Git history of the data folder, read with the `git` command (side-effecting reader).
 *
 * Everything goes through an injectable {@link GitRunner} (src/read/gitRunner.ts: spawn, no output
 * limit; tests use a real temporary repository or a fake). {@link findRepo} returns null only when
 * git answers that the folder is not inside a work tree and no `.git` lies on the way up; any other
 * failure (git missing or refusing the repository, a damaged `.git`) rejects with a GitError, so the
 * caller can say so instead of claiming there is no repository.
 *
 * Paths: git reports paths relative to the repository root (POSIX separators). The data folder may
 * be a subfolder of the repository; {@link GitRepo.prefix} is that subfolder ("" at the root, else
 * ending in "/"). Functions here take paths RELATIVE TO THE DATA FOLDER and return both forms.
 *
 * The log is streamed through the NUL-separated parser of src/read/gitLog.ts (format described
 * there); commits are returned newest first (git's default order).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { dataPathOf, LOG_ARGS, parseGitLogStream, type GitCommit } from "./gitLog.ts";
import { defaultGitRunner, GitError, streamOf, type GitObjectReader, type GitRunner } from "./gitRunner.ts";

export { defaultGitRunner, GitError, makeGitRunner, type GitObjectReader, type GitRunner, type GitRunnerOptions } from "./gitRunner.ts";
export { GitLogError, LOG_ARGS, LOG_FORMAT, parseGitLog, type GitCommit } from "./gitLog.ts";

export interface GitRepo {
  /** Absolute path of the repository's top-level folder, as git reports it. */
  root: string;
  /** Data folder relative to root, POSIX, "" or ending in "/". */
  prefix: string;
  /** Full hash of HEAD, or null in a repository without commits. */
  head: string | null;
  run: GitRunner;
  /** One `git cat-file --batch` process for many reads, while {@link withObjectReader} runs (when the runner can open one). */
  objects?: GitObjectReader;
}

/**
 * Runs `work` with one object reader open on the repository (src/read/gitObjects.ts), so that
 * {@link fileAtCommit} and {@link commitNames} ask a single git process instead of starting two
 * per object; closes it afterwards. Without a runner that can open one, `work` runs as it is.
 */
export async function withObjectReader<T>(repo: GitRepo, work: () => Promise<T>): Promise<T> {
  if (repo.objects || !repo.run.objects) return work();
  repo.objects = repo.run.objects(repo.root);
  try {
    return await work();
  } finally {
    repo.objects.close();
    repo.objects = undefined;
  }
}

/**
 * Finds the git work tree containing `folder` (absolute path of the data folder).
 * Returns null when git says the folder is not inside a work tree and no `.git` is found in it or
 * above it (below GIT_CEILING_DIRECTORIES); rejects with the GitError otherwise (git missing, unsafe
 * ownership, a damaged repository), since then the history exists but cannot be read.
 */
export async function findRepo(folder: string, run: GitRunner = defaultGitRunner): Promise<GitRepo | null> {
  let out: string;
  try {
    out = await run(["rev-parse", "--is-inside-work-tree", "--show-toplevel", "--show-prefix"], folder);
  } catch (err) {
    const notARepo = err instanceof GitError && err.exitCode === 128 && /not a git repository/i.test(err.stderr);
    if (!notARepo) throw err;
    const found = await dotGitAbove(folder, run);
    if (found === null) return null;
    throw new GitError(err.args, err.exitCode, `${err.stderr.trim()} (yet ${found} exists: the repository may be damaged)`);
  }
  const lines = out.split("\n");
  // Inside the .git folder itself, or a bare repository: there is no work tree to read.
  if (lines[0]?.trim() !== "true" || !lines[1]) return null;
  const repo: GitRepo = { root: lines[1].trim(), prefix: (lines[2] ?? "").trim(), head: null, run };
  repo.head = await headCommit(repo);
  return repo;
}

/** The first `.git` entry in `folder` or a folder above it, stopping at GIT_CEILING_DIRECTORIES (as git does); null if none. */
async function dotGitAbove(folder: string, run: GitRunner): Promise<string | null> {
  const ceilings = (run.env?.GIT_CEILING_DIRECTORIES ?? process.env.GIT_CEILING_DIRECTORIES ?? "")
    .split(path.delimiter)
    .filter(Boolean)
    .map((c) => path.resolve(c));
  for (let dir = path.resolve(folder); ; dir = path.dirname(dir)) {
    const candidate = path.join(dir, ".git");
    if (
      await fs.lstat(candidate).then(
        () => true,
        () => false,
      )
    )
      return candidate;
    if (ceilings.includes(path.dirname(dir)) || path.dirname(dir) === dir) return null;
  }
}

/** Full hash of HEAD for provenance, or null when the repository has no commits yet; rejects when git fails otherwise. */
export async function headCommit(repo: Pick<GitRepo, "root" | "run">): Promise<string | null> {
  let out: string;
  try {
    out = (await repo.run(["rev-parse", "--verify", "--quiet", "HEAD^{commit}"], repo.root)).trim();
  } catch (err) {
    // --quiet: exit code 1 and no message when HEAD names no commit yet (an unborn branch).
    if (err instanceof GitError && err.exitCode === 1) return null;
    throw err;
  }
  if (!/^[0-9a-f]{40}(?:[0-9a-f]{24})?$/.test(out)) throw new GitError(["rev-parse"], 0, `unexpected answer for HEAD: ${JSON.stringify(out.slice(0, 80))}`);
  return out;
}

/** Converts a data-folder-relative path (either separator; a leading "./" is dropped) to a repository-relative POSIX path. */
export function toRepoPath(repo: Pick<GitRepo, "prefix">, dataPath: string): string {
  const clean = dataPath.replace(/\\/g, "/").replace(/^\.\//, "").replace(/^\/+/, "");
  return repo.prefix + clean;
}

/** Converts a repository-relative path to one relative to the data folder, or null if outside it. */
export function toDataPath(repo: Pick<GitRepo, "prefix">, repoPath: string): string | null {
  return dataPathOf(repo.prefix, repoPath);
}

export interface ListCommitsOptions {
  /** Path relative to the data folder (file or folder); default the whole data folder. */
  path?: string;
  /** Newest N commits only. */
  maxCount?: number;
}

/**
 * Commits touching the data folder (or `options.path` inside it), newest first, each with the files
 * it changed. Returns [] for a repository without commits. The log is streamed (no size limit).
 * Rejects with a GitError when git fails, or a GitLogError when its output does not parse.
 */
export async function listCommits(repo: GitRepo, options: ListCommitsOptions = {}): Promise<GitCommit[]> {
  if (repo.head === null) return [];
  const target = options.path === undefined ? repo.prefix : toRepoPath(repo, options.path);
  const args = [...LOG_ARGS];
  if (options.maxCount !== undefined) args.push(`--max-count=${Math.max(1, Math.floor(options.maxCount))}`);
  // Pathspec relative to the top, taken literally (no glob characters in file names can misfire).
  if (target !== "") args.push("--", `:(top,literal)${target}`);
  return parseGitLogStream(streamOf(repo.run, args, repo.root), repo.prefix);
}

/** Commits that changed one file (e.g. "targets.yaml", relative to the data folder), newest first. */
export async function commitsChangingFile(repo: GitRepo, dataPath: string): Promise<GitCommit[]> {
  return listCommits(repo, { path: dataPath });
}

/**
 * Content (UTF-8 text) of a data-folder-relative file at a commit. Returns null when the file does not
 * exist at that commit (`git rev-parse --verify --quiet` answers with exit code 1); rejects with the
 * GitError when git fails otherwise (a damaged repository is not mistaken for an absent file).
 * Throws RangeError for a malformed hash (programming error: hashes come from {@link listCommits}).
 */
export async function fileAtCommit(repo: GitRepo, hash: string, dataPath: string): Promise<string | null> {
  if (!/^[0-9a-f]{4,64}$/i.test(hash)) throw new RangeError(`fileAtCommit: not a commit hash: ${hash}`);
  const name = `${hash}:${toRepoPath(repo, dataPath)}`;
  if (repo.objects && !/[\n\r]/.test(name)) {
    const found = await repo.objects.read(name);
    if (found === null) return null;
    if (found.type !== "blob") throw new GitError(["cat-file", "blob", name], 128, `fatal: ${name} is a ${found.type}, not a file`);
    return found.content.toString("utf8");
  }
  let blob: string;
  try {
    blob = (await repo.run(["rev-parse", "--verify", "--quiet", name], repo.root)).trim();
  } catch (err) {
    if (err instanceof GitError && err.exitCode === 1) return null;
    throw err;
  }
  return repo.run(["cat-file", "blob", blob], repo.root);
}

/**
 * Committer's and author's names of a commit, read from the commit object through the open object
 * reader (the `committer` and `author` header lines, as `%cn` and `%an` print them without a mailmap).
 * Null when no reader is open, the commit is not found, or its text is in an encoding other than
 * UTF-8 (then `git show -s --format=%cn%x00%an` converts it).
 */
export async function commitNames(repo: GitRepo, hash: string): Promise<{ committer: string; author: string } | null> {
  if (!repo.objects || !/^[0-9a-f]{4,64}$/i.test(hash)) return null;
  const found = await repo.objects.read(hash);
  if (found === null || found.type !== "commit") return null;
  const text = found.content.toString("utf8");
  const headers = text.slice(0, text.indexOf("\n\n") < 0 ? text.length : text.indexOf("\n\n")).split("\n");
  const field = (key: string) => headers.find((h) => h.startsWith(`${key} `))?.slice(key.length + 1);
  const encoding = field("encoding");
  if (encoding && !/^utf-?8$/i.test(encoding.trim())) return null;
  const nameOf = (line: string | undefined) => (line === undefined ? undefined : line.slice(0, Math.max(0, line.lastIndexOf(" <"))));
  const committer = nameOf(field("committer"));
  const author = nameOf(field("author"));
  return committer === undefined || author === undefined ? null : { committer, author };
}
