/**
 * Entry point of the `waferbook` command: reads the arguments (args.ts), runs
 * the command and returns its exit code — 0 done; 1 input errors with --strict,
 * a site-wide input error (targets.yaml, analysis.yaml, a run note),
 * or nothing built; 2 bad usage; 70 internal error (args.ts EXIT, README).
 * Only an internal error prints a stack trace.
 */
import { EXIT, SELF_PARSED, parseArgs, type CommandName, type CommandRun } from "./args.ts";
import { reportInternalError } from "./report.ts";
import { runCommand } from "./commands.ts";

export interface CommandIO {
  /** The command's result (summary, machine-readable output): stdout. */
  out: (s: string) => void;
  /** Problems and messages: stderr. */
  err: (s: string) => void;
}

type Runner<K extends CommandName> = (options: Extract<CommandRun, { command: K }>["options"], io: CommandIO) => Promise<number>;

/** One line per command; each loads its code only when run. */
const RUNNERS: { [K in CommandName]: Runner<K> } = {
  build: async (o, io) => (await import("./buildCommand.ts")).runBuild(o, io),
  serve: async (o, io) => (await import("./serveCommand.ts")).runServe(o, io),
};

export async function main(argv: string[]): Promise<number> {
  const io: CommandIO = { out: (s) => process.stdout.write(s + "\n"), err: (s) => process.stderr.write(s + "\n") };
  // check and init: each command in its own file (arguments, help and all).
  const first = argv[0] as (typeof SELF_PARSED)[number];
  if (SELF_PARSED.includes(first)) return runCommand(first, argv.slice(1), io);
  try {
    const parsed = parseArgs(argv);
    if (parsed.command === "help") {
      io.out(parsed.text);
      return EXIT.ok;
    }
    if (parsed.command === "version") {
      const { readVersion } = await import("./version.ts");
      io.out(await readVersion());
      return EXIT.ok;
    }
    if (parsed.command === "usage-error") {
      io.err(`waferbook: ${parsed.message}`);
      io.err(`Run \`${parsed.helpCommand}\` for the options.`);
      return EXIT.usage;
    }
    const run = RUNNERS[parsed.command] as Runner<CommandName>;
    return await run(parsed.options, io);
  } catch (e) {
    reportInternalError(e, io.err);
    return EXIT.internal;
  }
}
