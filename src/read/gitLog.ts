/**
 * Parser of `git log` output in a form no byte of a message, author name or
 * path can confuse (format documented in git-log(1), "PRETTY FORMATS" and
 * "-z"; checked against git 2.39).
 *
 * The log is read with
 *   git log -z --name-status --no-renames --format=%H%x00%h%x00%aI%x00%cI%x00%an%x00%s
 * so every field and every path is terminated by a NUL byte, and NUL is the
 * one byte none of them can hold (git stores names and messages as C
 * strings: a message is cut at its first NUL; paths and idents cannot hold
 * one). The stream is therefore a sequence of NUL-terminated tokens:
 *
 *   commit  = H h aI cI an s [ "\n"status path… ] [ status path… ]…
 *
 * six header tokens, then for each changed file a status token (A, C…, D, M,
 * R…, T, U, X, B; C and R carry two paths, the others one), the first one
 * preceded by the newline git writes after a commit's header. Tokens are read
 * by position only; nothing inside a message or a path is ever searched for a
 * separator. A status token (upper-case letters and digits) can never be
 * taken for a commit hash (40 or 64 lower-case hex digits), so where a commit
 * ends is never in doubt, and a header is accepted only if its hash, short
 * hash and dates have the shapes git writes. Anything else is an error (a
 * {@link GitLogError} with its byte offset), never a guess: a log that does
 * not parse is reported, not partly shown.
 *
 * The parser takes the bytes in chunks of any size (it never holds more than
 * the token being read), so a log of any length streams through it.
 */

export interface GitCommit {
  hash: string;
  shortHash: string;
  /** Author date, strict ISO 8601 with offset (git %aI). */
  date: string;
  /** Committer date, strict ISO 8601 (git %cI). */
  committedAt: string;
  author: string;
  subject: string;
  /** Files changed, relative to the repository root (a merge commit lists what it changed against its first parent: what it brought into the line it joined). */
  files: string[];
  /** The subset of `files` inside the data folder, relative to the data folder. */
  dataFiles: string[];
}

export const LOG_FORMAT = "%H%x00%h%x00%aI%x00%cI%x00%an%x00%s";
/** The arguments of `git log` that produce what {@link GitLogParser} reads (options that user configuration could otherwise change are pinned). */
export const LOG_ARGS = [
  "log",
  "-z",
  "--name-status",
  "--no-renames",
  "--diff-merges=first-parent",
  `--format=${LOG_FORMAT}`,
  "--no-color",
  "--no-show-signature",
  "--encoding=UTF-8",
];

/** The log did not have the expected shape at `offset` (bytes from the start). */
export class GitLogError extends Error {
  constructor(
    readonly offset: number,
    detail: string,
  ) {
    super(`git log output could not be read at byte ${offset}: ${detail}`);
    this.name = "GitLogError";
  }
}

const HASH = /^(?:[0-9a-f]{40}|[0-9a-f]{64})$/;
const SHORT = /^[0-9a-f]{4,64}$/;
const ISO = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(?:Z|[+-]\d{2}:\d{2})$/;
/** A --name-status letter (with the similarity score of C and R). */
const STATUS = /^[ACDMRTUXB]\d*$/;

/** Converts a repository-relative path to one relative to the data folder, or null if outside it. */
export function dataPathOf(prefix: string, repoPath: string): string | null {
  if (!prefix) return repoPath;
  return repoPath.startsWith(prefix) ? repoPath.slice(prefix.length) : null;
}

/** Shows a token briefly in an error message. */
function brief(t: string): string {
  return JSON.stringify(t.length > 60 ? `${t.slice(0, 57)}…` : t);
}

/** Incremental parser: `push` chunks as they come, then `end`; commits are delivered in order to `onCommit`. */
export class GitLogParser {
  private pending: Buffer[] = [];
  private offset = 0;
  private tokenStart = 0;
  private header: string[] = [];
  private current: GitCommit | undefined;
  /** "header": reading header tokens; "first": after a header; "entry": after a file; "path": paths still to read. */
  private state: "header" | "first" | "entry" | "path" = "header";
  private pathsLeft = 0;

  constructor(
    private readonly prefix: string,
    private readonly onCommit: (c: GitCommit) => void,
  ) {}

  push(chunk: Buffer): void {
    let from = 0;
    for (;;) {
      const nul = chunk.indexOf(0, from);
      if (nul < 0) break;
      if (this.pending.length) {
        this.token(Buffer.concat([...this.pending, chunk.subarray(from, nul)]).toString("utf8"));
        this.pending = [];
      } else this.token(chunk.toString("utf8", from, nul));
      this.offset += nul - from + 1;
      this.tokenStart = this.offset;
      from = nul + 1;
    }
    if (from < chunk.length) {
      // Copied: the caller may reuse its buffer.
      this.pending.push(Buffer.from(chunk.subarray(from)));
      this.offset += chunk.length - from;
    }
  }

  end(): void {
    const rest = this.pending.reduce((n, b) => n + b.length, 0);
    if (rest > 0) throw new GitLogError(this.tokenStart, `the output ends inside a field (${rest} bytes without a terminating NUL)`);
    if (this.state === "header" && this.header.length > 0)
      throw new GitLogError(this.offset, `the output ends inside a commit header (${this.header.length} of 6 fields)`);
    if (this.state === "path") throw new GitLogError(this.offset, "the output ends before a changed file's path");
    this.flush();
  }

  private token(t: string): void {
    switch (this.state) {
      case "header":
        this.header.push(t);
        if (this.header.length === 6) this.startCommit();
        return;
      case "path": {
        this.current!.files.push(t);
        const inData = dataPathOf(this.prefix, t);
        if (inData !== null) this.current!.dataFiles.push(inData);
        if (--this.pathsLeft === 0) this.state = "entry";
        return;
      }
      case "first":
      case "entry": {
        if (HASH.test(t)) {
          this.flush();
          this.header = [t];
          this.state = "header";
          return;
        }
        const status = this.state === "first" && t.startsWith("\n") ? t.slice(1) : t;
        if ((this.state === "first") !== t.startsWith("\n") || !STATUS.test(status)) {
          throw new GitLogError(
            this.tokenStart,
            `expected a commit hash or a file status${this.state === "first" ? " after a newline" : ""}, found ${brief(t)}`,
          );
        }
        this.pathsLeft = status[0] === "R" || status[0] === "C" ? 2 : 1;
        this.state = "path";
        return;
      }
    }
  }

  private startCommit(): void {
    const [hash, shortHash, date, committedAt, author, subject] = this.header;
    const bad = !HASH.test(hash)
      ? ["commit hash", hash]
      : !SHORT.test(shortHash) || !hash.startsWith(shortHash)
        ? ["short hash", shortHash]
        : !ISO.test(date)
          ? ["author date", date]
          : !ISO.test(committedAt)
            ? ["commit date", committedAt]
            : null;
    if (bad) throw new GitLogError(this.tokenStart, `expected a ${bad[0]}, found ${brief(bad[1])}`);
    this.current = { hash, shortHash, date, committedAt, author, subject, files: [], dataFiles: [] };
    this.header = [];
    this.state = "first";
  }

  private flush(): void {
    if (this.current) this.onCommit(this.current);
    this.current = undefined;
  }
}

/** Parses a whole log (bytes, or text as UTF-8) at once; throws GitLogError when it does not have the expected shape. */
export function parseGitLog(output: string | Buffer, prefix = ""): GitCommit[] {
  const commits: GitCommit[] = [];
  const parser = new GitLogParser(prefix, (c) => commits.push(c));
  parser.push(typeof output === "string" ? Buffer.from(output, "utf8") : output);
  parser.end();
  return commits;
}

/** Parses a log arriving in chunks. */
export async function parseGitLogStream(chunks: AsyncIterable<Buffer>, prefix = ""): Promise<GitCommit[]> {
  const commits: GitCommit[] = [];
  const parser = new GitLogParser(prefix, (c) => commits.push(c));
  for await (const chunk of chunks) parser.push(chunk);
  parser.end();
  return commits;
}
