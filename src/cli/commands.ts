/**
 * Runs the commands that live in files of their own (`check`, `init`): loads
 * the command, gives it its input and output, and turns an unexpected
 * exception into an internal-error report (never a bare stack trace).
 */
export interface CommandIO {
  out: (line: string) => void;
  err: (line: string) => void;
  /** Today's date, YYYY-MM-DD. */
  today: () => string;
  version: () => Promise<string>;
}

/** Exit code of an internal error (a bug, not bad input). */
export const EXIT_INTERNAL = 70; // EXIT.internal in args.ts (sysexits EX_SOFTWARE)

export async function runCommand(name: "check" | "init", argv: string[], io: Pick<CommandIO, "out" | "err">): Promise<number> {
  const full: CommandIO = { ...io, today: () => new Date().toISOString().slice(0, 10), version: async () => (await import("./version.ts")).readVersion() };
  try {
    if (name === "check") return await (await import("./check.ts")).checkCommand(argv, full);
    return await (await import("./init.ts")).initCommand(argv, full);
  } catch (e) {
    io.err(`waferbook ${name}: internal error (please report it with the data that triggered it):`);
    io.err((e as Error).stack ?? String(e));
    return EXIT_INTERNAL;
  }
}
