/**
 * Command-line arguments: `waferbook build [--data DIR] [--out DIR] [--strict]
 * [--base PATH] [--no-cache] [--quiet]`. Unknown options are a usage error
 * (exit code 2) with a hint.
 */
import { didYouMean } from "../validate/problem.ts";

export interface BuildOptions {
  data: string;
  out: string;
  strict: boolean;
  basePath: string;
  quiet: boolean;
  /** Analysis cache folder; null with --no-cache. Default: .waferbook-cache/ beside the output folder. */
  cache?: string | null;
}

export type ParsedArgs = { command: "build"; options: BuildOptions } | { command: "help" } | { command: "version" } | { command: "usage-error"; message: string };

export const HELP = `waferbook — builds a qualification site from wafer records and raw measurements

Usage:
  waferbook build [--data DIR] [--out DIR] [--strict] [--base PATH] [--quiet]
                 [--cache DIR | --no-cache]
  waferbook --help | --version

Options:
  --data DIR    the data folder: wafers/<id>/wafer.md, targets.yaml, optional
                analysis.yaml and runs/<run>.md (default: ./data)
  --out DIR     where the site is written (default: ./site): a link to the
                current build's folder beside it, switched only when the build
                succeeds; a failed build leaves the previous site as it was.
                Wafer pages whose content has not changed are carried over
                from the previous site (docs/publishing.md).
  --strict      exit with code 1 when any input error was found (for CI)
  --base PATH   serve the site under a sub-path, e.g. /qual/ (default: /)
  --quiet       print only problems and the summary
  --cache DIR   where analysis results are kept between builds, keyed by the
                wafer's files, settings and the analysis code (default:
                .waferbook-cache/ beside the --out folder)
  --no-cache    analyse every wafer from its raw files and draw every page
                afresh, ignoring the cache and the pages of the previous site
  -h, --help    show this help
  --version     print the version

Exit codes: 0 built; 1 input errors with --strict, or nothing could be built;
2 bad usage, or an --out/--cache refused before anything was written (it is,
holds or lies in the data folder or its git work tree; a folder waferbook did
not write; a file; not writable), or a malformed SOURCE_DATE_EPOCH.

Formats: docs/formats.md. Verdicts support, and never replace, the lab's own
QA sign-off.`;

const OPTIONS = ["--data", "--out", "--strict", "--base", "--quiet", "--cache", "--no-cache", "--help", "--version"];

export function parseArgs(argv: string[]): ParsedArgs {
  if (argv.length === 0 || argv[0] === "--help" || argv[0] === "-h" || argv[0] === "help") return { command: "help" };
  if (argv[0] === "--version") return { command: "version" };
  if (argv[0] !== "build") {
    const hint = didYouMean(argv[0], ["build"]);
    return { command: "usage-error", message: `unknown command ${JSON.stringify(argv[0])}${hint ? ` — did you mean "${hint}"?` : ""}` };
  }
  const options: BuildOptions = { data: "data", out: "site", strict: false, basePath: "/", quiet: false, cache: undefined };
  for (let i = 1; i < argv.length; i++) {
    const a = argv[i];
    const [flag, inline] = a.includes("=") ? [a.slice(0, a.indexOf("=")), a.slice(a.indexOf("=") + 1)] : [a, undefined];
    const value = () => {
      const v = inline ?? argv[++i];
      if (v === undefined || v.startsWith("--")) throw new Error(`${flag} needs a value`);
      return v;
    };
    try {
      switch (flag) {
        case "--data": options.data = value(); break;
        case "--out": options.out = value(); break;
        case "--base": {
          let b = value();
          if (!b.startsWith("/")) b = "/" + b;
          if (!b.endsWith("/")) b += "/";
          if (!/^\/[A-Za-z0-9._~\-/]*$/.test(b) || b.includes("..")) throw new Error(`--base must be a URL path such as /qual/, found ${JSON.stringify(b)}`);
          options.basePath = b;
          break;
        }
        case "--strict": options.strict = true; break;
        case "--quiet": options.quiet = true; break;
        case "--cache": options.cache = value(); break;
        case "--no-cache": options.cache = null; break;
        case "--help": case "-h": return { command: "help" };
        default: {
          const hint = didYouMean(flag, OPTIONS);
          return { command: "usage-error", message: `unknown option ${JSON.stringify(flag)}${hint ? ` — did you mean "${hint}"?` : ""}` };
        }
      }
    } catch (err) {
      return { command: "usage-error", message: (err as Error).message };
    }
  }
  if (!options.out.trim() || options.out === "/" ) return { command: "usage-error", message: "--out must name a folder" };
  return { command: "build", options };
}
