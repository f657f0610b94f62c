/** The error of a failed git command (src/read/gitRunner.ts, src/read/gitObjects.ts). */

/** Most characters of git's error output kept in a GitError. */
export const STDERR_KEEP = 2000;

/** git failed (exit code ≠ 0), or could not be started (exitCode null, e.g. not installed). */
export class GitError extends Error {
  constructor(
    readonly args: readonly string[],
    readonly exitCode: number | null,
    readonly stderr: string,
    cause?: string,
  ) {
    const said = stderr.trim().split("\n").filter(Boolean).slice(0, 3).join(" / ");
    super(
      exitCode === null
        ? `git could not be run (${cause ?? "unknown reason"})`
        : `git ${args[0] ?? ""} failed with exit code ${exitCode}${said ? `: ${said.slice(0, 300)}` : ""}`,
    );
    this.name = "GitError";
  }
}
