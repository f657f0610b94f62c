/**
 * Reads many git objects through one `git cat-file --batch` process instead of
 * starting git twice per object (`rev-parse <commit>:<path>`, then `cat-file
 * blob`): the history reader asks for every version of targets.yaml and of
 * each decided wafer's wafer.md, and a process start costs far more than the
 * object itself.
 *
 * Protocol (git-cat-file(1), "BATCH OUTPUT"): one object name per line on
 * stdin (`<commit>:<path>` or a hash); for each, git writes
 * `<oid> SP <type> SP <size> LF <contents> LF`, or `<name> SP missing LF`
 * (also `ambiguous`) when the name resolves to no object. Answers come in the
 * order asked, so requests are queued and matched first in, first out.
 *
 * A reader is opened per repository and must be closed (the git process lives
 * until its stdin ends). A name holding a line break cannot be sent in this
 * protocol: {@link GitObjectReader.read} rejects it with a RangeError and the
 * caller uses the one-process-per-object route. When git fails or exits early,
 * every pending and later read rejects with a GitError.
 */
import { spawn } from "node:child_process";
import { GitError, STDERR_KEEP } from "./gitError.ts";

export interface GitObject {
  oid: string;
  /** "blob", "commit", "tree" or "tag". */
  type: string;
  content: Buffer;
}

export interface GitObjectReader {
  /** The object named `name` (`<commit>:<path>` or a hash), or null when git finds none. */
  read(name: string): Promise<GitObject | null>;
  /** Ends the git process (idempotent). */
  close(): void;
}

interface Pending {
  name: string;
  resolve: (o: GitObject | null) => void;
  reject: (e: Error) => void;
}

const ARGS = ["cat-file", "--batch"] as const;

/** Starts `git cat-file --batch` in `cwd` (the repository root) with the runner's executable and environment. */
export function openObjectReader(gitPath: string, cwd: string, env: NodeJS.ProcessEnv): GitObjectReader {
  const child = spawn(gitPath, [...ARGS], { cwd, env, stdio: ["pipe", "pipe", "pipe"] });
  const pending: Pending[] = [];
  let buffered: Buffer = Buffer.alloc(0);
  let stderr = "";
  let failure: GitError | undefined;
  let closed = false;

  const fail = (e: GitError) => {
    failure ??= e;
    for (const p of pending.splice(0)) p.reject(failure);
  };
  child.stderr.setEncoding("utf8");
  child.stderr.on("data", (s: string) => {
    if (stderr.length < STDERR_KEEP) stderr += s.slice(0, STDERR_KEEP - stderr.length);
  });
  child.on("error", (e) => fail(new GitError(ARGS, null, stderr, e.message)));
  child.on("close", (code, signal) => fail(new GitError(ARGS, signal ? -1 : (code ?? -1), stderr || (closed ? "closed" : "git cat-file ended early"))));
  // A write after git has gone (EPIPE) is reported through the exit above.
  child.stdin.on("error", () => {});

  /** Takes as many whole answers off the front of the buffer as it holds. */
  const drain = () => {
    while (pending.length > 0) {
      const eol = buffered.indexOf(10);
      if (eol < 0) return;
      const header = buffered.subarray(0, eol).toString("utf8");
      const p = pending[0];
      if (header.endsWith(" missing") || header.endsWith(" ambiguous")) {
        buffered = buffered.subarray(eol + 1);
        pending.shift();
        p.resolve(null);
        continue;
      }
      const m = /^([0-9a-f]{40,64}) (\S+) (\d+)$/.exec(header);
      if (!m) {
        fail(new GitError(ARGS, 0, `unexpected answer for ${p.name}: ${JSON.stringify(header.slice(0, 80))}`));
        return;
      }
      const size = Number(m[3]);
      if (buffered.length < eol + 1 + size + 1) return;
      const content = Buffer.from(buffered.subarray(eol + 1, eol + 1 + size));
      buffered = buffered.subarray(eol + 1 + size + 1);
      pending.shift();
      p.resolve({ oid: m[1], type: m[2], content });
    }
  };
  child.stdout.on("data", (chunk: Buffer) => {
    buffered = buffered.length === 0 ? chunk : Buffer.concat([buffered, chunk]);
    drain();
  });

  return {
    read(name) {
      if (/[\n\r]/.test(name))
        return Promise.reject(new RangeError(`git cat-file --batch cannot be asked for a name with a line break: ${JSON.stringify(name)}`));
      if (failure) return Promise.reject(failure);
      if (closed) return Promise.reject(new GitError(ARGS, null, "", "the object reader was closed"));
      return new Promise((resolve, reject) => {
        pending.push({ name, resolve, reject });
        child.stdin.write(`${name}\n`);
      });
    },
    close() {
      if (closed) return;
      closed = true;
      child.stdin.end();
    },
  };
}
