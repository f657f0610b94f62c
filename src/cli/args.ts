/**
 * Command-line arguments, read with Node's `util.parseArgs`. Each command is
 * one entry of `COMMANDS`: its one-line summary, usage, options (in
 * `util.parseArgs` form plus help text) and a `normalise` that turns the
 * parsed values into the command's typed options or throws `UsageError`.
 * Adding a command is one entry here and one runner line in main.ts.
 *
 * Every command takes `--help` (`-h`) and `--version`. Unknown commands and
 * options are usage errors (exit code 2) with a "did you mean" hint.
 */
import { parseArgs as nodeParseArgs } from "node:util";
import { didYouMean } from "../model/problem.ts";
import { parseShard, type Shard } from "./shard.ts";

/** A usage mistake: printed as `waferbook: <message>` with exit code 2. */
export class UsageError extends Error {}

export interface OptionSpec {
  type: "string" | "boolean";
  short?: string;
  /** Shown in the help: `--data DIR`. */
  arg?: string;
  help: string;
}

export interface CommandSpec<T> {
  summary: string;
  /** Usage line(s) after `waferbook <command> `, e.g. `[--data DIR] [--strict]`. */
  usage: string;
  options: Record<string, OptionSpec>;
  /** Positional arguments allowed: how many at most (default 0). */
  maxPositionals?: number;
  /** Parsed values (in the order given, for options that override each other) → typed options. */
  normalise(values: Record<string, string | boolean | undefined>, positionals: string[], order: string[]): T;
}

const define = <T>(spec: CommandSpec<T>): CommandSpec<T> => spec;

/** Options several commands share; a command lists the ones it takes. */
export const COMMON_OPTIONS = {
  data: {
    type: "string",
    arg: "DIR",
    help: "the data folder: wafers/<id>/wafer.md, targets.yaml, optional\nanalysis.yaml and runs/<run>.md (default: ./data)",
  },
  quiet: { type: "boolean", help: "print only problems and the summary" },
} satisfies Record<string, OptionSpec>;

export interface BuildOptions {
  data: string;
  out: string;
  strict: boolean;
  basePath: string;
  quiet: boolean;
  /** Analysis cache folder; null with --no-cache. Default: .waferbook-cache/ beside the output folder. */
  cache?: string | null;
  /** --shard K/N: analyse and draw only partition K of N into the cache, render nothing (src/cli/shard.ts). */
  shard?: Shard;
}

/** `--base qual` → `/qual/`; refuses anything but a plain URL path. */
function basePath(value: string): string {
  let b = value;
  if (!b.startsWith("/")) b = "/" + b;
  if (!b.endsWith("/")) b += "/";
  if (!/^\/[A-Za-z0-9._~\-/]*$/.test(b) || b.includes("..")) throw new UsageError(`--base must be a URL path such as /qual/, found ${JSON.stringify(b)}`);
  return b;
}

const build = define<BuildOptions>({
  summary: "builds the qualification site",
  usage: "[--data DIR] [--out DIR] [--strict] [--base PATH] [--quiet]\n      [--cache DIR | --no-cache] [--shard K/N]",
  options: {
    data: COMMON_OPTIONS.data,
    out: {
      type: "string",
      arg: "DIR",
      help: "where the site is written (default: ./site): a link to the\ncurrent build's folder beside it, switched only when the build\nsucceeds; a failed build leaves the previous site as it was.\nWafer pages whose content has not changed are carried over\nfrom the previous site (docs/publishing.md).",
    },
    strict: { type: "boolean", help: "exit with code 1 when any input error was found (for CI)" },
    base: {
      type: "string",
      arg: "PATH",
      help: "absolute links under PATH for a web server, e.g. /qual/ or /\n(default: relative links, which work opened from disk and\non a server under any path)",
    },
    quiet: COMMON_OPTIONS.quiet,
    cache: {
      type: "string",
      arg: "DIR",
      help: "where analysis results are kept between builds, keyed by the\nwafer's files, settings and the analysis code (default:\n.waferbook-cache/ beside the --out folder)",
    },
    "no-cache": {
      type: "boolean",
      help: "analyse every wafer from its raw files and draw every page\nafresh, ignoring the cache and the pages of the previous site",
    },
    shard: {
      type: "string",
      arg: "K/N",
      help: "analyse and draw only the wafers of shard K of N (1 ≤ K ≤ N)\ninto the cache folder, and write no site (--out is not\ntouched); copy the N cache folders into one and build\nwithout --shard to render the whole site (docs/scaling.md)",
    },
  },
  normalise(v, _positionals, order) {
    const out = (v.out as string | undefined) ?? "site";
    if (!out.trim() || out === "/") throw new UsageError("--out must name a folder");
    // --cache DIR and --no-cache: the later one wins.
    const lastCache = order.filter((n) => n === "cache" || n === "no-cache").at(-1);
    let shard: Shard | undefined;
    if (v.shard !== undefined) {
      const parsed = parseShard(v.shard as string);
      if ("error" in parsed) throw new UsageError(parsed.error);
      if (lastCache === "no-cache")
        throw new UsageError(
          "--shard writes its results into the cache folder, so it cannot run with --no-cache; drop --no-cache (and give --cache DIR to choose the folder)",
        );
      shard = parsed;
    }
    return {
      data: (v.data as string | undefined) ?? "data",
      out,
      strict: v.strict === true,
      basePath: v.base === undefined ? "" : basePath(v.base as string),
      quiet: v.quiet === true,
      cache: lastCache === "no-cache" ? null : lastCache === "cache" ? (v.cache as string) : undefined,
      ...(shard ? { shard } : {}),
    };
  },
});

export interface ServeOptions {
  data: string;
  out: string;
  /** 0: any free port. */
  port: number;
  quiet: boolean;
}

const serve = define<ServeOptions>({
  summary: "builds the site, serves it on localhost and rebuilds on every change",
  usage: "[--data DIR] [--out DIR] [--port N] [--quiet]",
  options: {
    data: COMMON_OPTIONS.data,
    out: { type: "string", arg: "DIR", help: "where the site is written, as with build (default: ./site)" },
    port: { type: "string", arg: "N", help: "the port on localhost (default: 8080; 0 picks a free one)" },
    quiet: COMMON_OPTIONS.quiet,
  },
  normalise(v) {
    const out = (v.out as string | undefined) ?? "site";
    if (!out.trim() || out === "/") throw new UsageError("--out must name a folder");
    const port = v.port === undefined ? 8080 : Number(v.port);
    if (!/^\d+$/.test(String(v.port ?? "8080")) || port > 65535)
      throw new UsageError(`--port must be a whole number from 0 to 65535, found ${JSON.stringify(v.port)}`);
    return { data: (v.data as string | undefined) ?? "data", out, port, quiet: v.quiet === true };
  },
});

/** The commands, in the order the help lists them. */
export const COMMANDS = {
  build,
  serve,
};

export type CommandName = keyof typeof COMMANDS;

/** Commands that read their own arguments (src/cli/check.ts, init.ts), dispatched by main.ts before parseArgs. */
export const SELF_PARSED = ["check", "init"] as const;
type OptionsOf<K extends CommandName> = (typeof COMMANDS)[K] extends CommandSpec<infer T> ? T : never;
export type CommandRun = { [K in CommandName]: { command: K; options: OptionsOf<K> } }[CommandName];

export type ParsedArgs =
  | CommandRun
  | { command: "help"; text: string }
  | { command: "version" }
  | { command: "usage-error"; message: string; helpCommand: string };

/** Exit codes of the `waferbook` command (README "Exit codes"). */
export const EXIT = {
  ok: 0,
  /** Input errors with --strict, or nothing could be built. */
  inputErrors: 1,
  /** Bad usage: unknown command or option, missing value; an --out/--cache refused before anything was written (outputGuard.ts); a malformed SOURCE_DATE_EPOCH. */
  usage: 2,
  /** A bug in waferbook (EX_SOFTWARE of BSD's sysexits.h). */
  internal: 70,
} as const;

const EXIT_TEXT = `Exit codes: 0 done; 1 input errors (with --strict), or nothing could be
built; 2 bad usage, or an --out/--cache refused before anything was written
(it is, holds or lies in the data folder or its git work tree; a folder
waferbook did not write; a file; not writable); 70 internal error (a bug:
please report it).`;

const STANDARD: Record<string, OptionSpec> = {
  help: { type: "boolean", short: "h", help: "show this help" },
  version: { type: "boolean", help: "print the version" },
};

function optionLines(options: Record<string, OptionSpec>): string {
  const rows = Object.entries(options).map(([name, o]) => [`${o.short ? `-${o.short}, ` : ""}--${name}${o.arg ? ` ${o.arg}` : ""}`, o.help] as const);
  const width = Math.max(...rows.map(([l]) => l.length)) + 2;
  return rows.map(([l, h]) => `  ${l.padEnd(width)}${h.split("\n").join("\n" + " ".repeat(width + 2))}`).join("\n");
}

export function commandHelp(name: CommandName): string {
  const c: CommandSpec<unknown> = COMMANDS[name];
  return `waferbook ${name} — ${c.summary}

Usage:
  waferbook ${name} ${c.usage}

Options:
${optionLines({ ...c.options, ...STANDARD })}

${EXIT_TEXT}`;
}

export const HELP = `waferbook — builds a qualification site from wafer records and raw measurements

Usage:
${(Object.keys(COMMANDS) as CommandName[]).map((n) => `  waferbook ${n} ${COMMANDS[n].usage}`).join("\n")}
  waferbook check [--data DIR]
  waferbook init <folder>
  waferbook <command> --help
  waferbook --help | --version

Commands:
${(Object.keys(COMMANDS) as CommandName[]).map((n) => `  ${n.padEnd(8)}${COMMANDS[n].summary}`).join("\n")}
  check   reads and validates everything, writes nothing (exit 1 on any input error)
  init    creates a new data repository (targets, settings, an example wafer, CI files)

Options of build:
${optionLines({ ...COMMANDS.build.options, ...STANDARD })}

${EXIT_TEXT}

Formats: docs/formats.md. Verdicts support, and never replace, the lab's own
QA sign-off.`;

const usageError = (message: string, helpCommand = "waferbook --help"): ParsedArgs => ({ command: "usage-error", message, helpCommand });

export function parseArgs(argv: string[]): ParsedArgs {
  const first = argv[0];
  if (first === undefined || first === "--help" || first === "-h") return { command: "help", text: HELP };
  if (first === "--version") return { command: "version" };
  if (first === "help") {
    const topic = argv[1];
    if (topic === undefined) return { command: "help", text: HELP };
    return topic in COMMANDS ? { command: "help", text: commandHelp(topic as CommandName) } : unknownCommand(topic);
  }
  if (!(first in COMMANDS)) return unknownCommand(first);
  const name = first as CommandName;
  const spec: CommandSpec<unknown> = COMMANDS[name];
  const helpCommand = `waferbook ${name} --help`;
  const options = { ...spec.options, ...STANDARD };
  // Not strict: unknown options come back as tokens, so the message can suggest the nearest known one.
  const { tokens } = nodeParseArgs({ args: argv.slice(1), options: options as never, strict: false, allowPositionals: true, tokens: true });
  const optionTokens = tokens.filter((t) => t.kind === "option");
  if (optionTokens.some((t) => t.name === "help")) return { command: "help", text: commandHelp(name) };
  if (optionTokens.some((t) => t.name === "version")) return { command: "version" };
  const values: Record<string, string | boolean | undefined> = {};
  const order: string[] = [];
  const positionals: string[] = [];
  for (const t of tokens) {
    if (t.kind === "positional") {
      positionals.push(t.value);
      continue;
    }
    if (t.kind !== "option") continue;
    const o = spec.options[t.name];
    if (!o) {
      const hint = didYouMean(
        t.rawName,
        Object.keys(options).map((n) => `--${n}`),
      );
      return usageError(`unknown option ${JSON.stringify(t.rawName)}${hint ? ` — did you mean "${hint}"?` : ""}`, helpCommand);
    }
    if (o.type === "string") {
      // `--data --out site`: the next word is another option, not the folder.
      if (t.value === undefined || (!t.inlineValue && t.value.startsWith("--"))) return usageError(`${t.rawName} needs a value`, helpCommand);
      values[t.name] = t.value;
    } else {
      if (t.inlineValue) return usageError(`${t.rawName} takes no value, found ${JSON.stringify(t.value)}`, helpCommand);
      values[t.name] = true;
    }
    order.push(t.name);
  }
  if (positionals.length > (spec.maxPositionals ?? 0))
    return usageError(`unexpected argument ${JSON.stringify(positionals[spec.maxPositionals ?? 0])}`, helpCommand);
  try {
    return { command: name, options: spec.normalise(values, positionals, order) } as CommandRun;
  } catch (err) {
    if (err instanceof UsageError) return usageError(err.message, helpCommand);
    throw err;
  }
}

function unknownCommand(word: string): ParsedArgs {
  const hint = didYouMean(word, [...Object.keys(COMMANDS), ...SELF_PARSED]);
  return usageError(`unknown command ${JSON.stringify(word)}${hint ? ` — did you mean "${hint}"?` : ""}`);
}
