/**
 * Runs the `git` command for the history reader (src/read/gitHistory.ts).
 *
 * A runner is a function (args, cwd) → stdout as text, for the small answers
 * (rev-parse, one file's content), with an optional `stream` that yields the
 * output in chunks as git writes it, for `git log`, whose output has no upper
 * bound (a history of any length is read without a buffer limit; there is no
 * maxBuffer to overflow). Both are made with spawn, never a shell, and reject
 * with a {@link GitError} that carries git's exit code and the start of its
 * error output, so a failure can be shown to the user in git's own words.
 *
 * Tests inject runners: a plain async function (its text is the whole
 * output), or one with a `stream` that yields synthesised bytes.
 */
import { spawn } from "node:child_process";
import { GitError, STDERR_KEEP } from "./gitError.ts";
import { openObjectReader, type GitObjectReader } from "./gitObjects.ts";

export { GitError } from "./gitError.ts";
export type { GitObject, GitObjectReader } from "./gitObjects.ts";

/** Runs git with `args` in `cwd`; resolves with stdout (UTF-8), rejects with a GitError when git fails or cannot be run. */
export interface GitRunner {
  (args: readonly string[], cwd: string): Promise<string>;
  /** The same command's stdout as raw byte chunks, as they come; throws a GitError (after the last chunk) when git fails. */
  stream?: (args: readonly string[], cwd: string) => AsyncIterable<Buffer>;
  /** Environment the runner adds (read for GIT_CEILING_DIRECTORIES). */
  env?: Record<string, string>;
  /** Opens one `git cat-file --batch` process in `cwd` for many object reads (src/read/gitObjects.ts); without it, each object costs its own git calls. */
  objects?: (cwd: string) => GitObjectReader;
}

export interface GitRunnerOptions {
  /** Path of the git executable; default "git" (found on PATH). */
  gitPath?: string;
  /** Extra environment variables (merged over process.env). */
  env?: Record<string, string>;
}

/** The default runner: spawn with no pager, no optional locks, the C locale, and no limit on the output's size. */
export function makeGitRunner(options: GitRunnerOptions = {}): GitRunner {
  const gitPath = options.gitPath ?? "git";
  const env = { ...process.env, GIT_PAGER: "cat", GIT_OPTIONAL_LOCKS: "0", LC_ALL: "C", ...options.env };
  const stream = (args: readonly string[], cwd: string) => spawnStream(gitPath, args, cwd, env);
  const run: GitRunner = async (args, cwd) => {
    const parts: Buffer[] = [];
    for await (const chunk of stream(args, cwd)) parts.push(chunk);
    return Buffer.concat(parts).toString("utf8");
  };
  run.stream = stream;
  run.env = options.env;
  run.objects = (cwd) => openObjectReader(gitPath, cwd, env);
  return run;
}

export const defaultGitRunner: GitRunner = makeGitRunner();

/** The chunks of a runner's output: its stream when it has one, else its whole text as one chunk. */
export async function* streamOf(run: GitRunner, args: readonly string[], cwd: string): AsyncIterable<Buffer> {
  if (run.stream) yield* run.stream(args, cwd);
  else yield Buffer.from(await run(args, cwd), "utf8");
}

/**
 * Spawns a program and yields its stdout chunks; after the last one, throws a
 * GitError if it exited with a code other than 0, was killed, or could not be
 * started. A consumer that stops early kills the process.
 */
async function* spawnStream(file: string, args: readonly string[], cwd: string, env: NodeJS.ProcessEnv): AsyncGenerator<Buffer> {
  const child = spawn(file, [...args], { cwd, env, stdio: ["ignore", "pipe", "pipe"] });
  let stderr = "";
  child.stderr.setEncoding("utf8");
  child.stderr.on("data", (s: string) => {
    if (stderr.length < STDERR_KEEP) stderr += s.slice(0, STDERR_KEEP - stderr.length);
  });
  let startError: Error | undefined;
  const exited = new Promise<number | null>((resolve) => {
    child.on("error", (e) => {
      startError = e;
      resolve(null);
    });
    child.on("close", (code, signal) => resolve(signal ? -1 : code));
  });
  let finished = false;
  try {
    // Errors on stdout itself (EPIPE and the like) end the loop; the exit code then says what happened.
    try {
      for await (const chunk of child.stdout) yield chunk as Buffer;
    } catch {
      // reported below through the exit code
    }
    const code = await exited;
    finished = true;
    if (startError) throw new GitError(args, null, stderr, startError.message);
    if (code !== 0) throw new GitError(args, code, stderr);
  } finally {
    if (!finished && child.exitCode === null) child.kill();
  }
}
