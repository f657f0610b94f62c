/**
 * Entry point of the `waferbook` command. Sets exit codes: 0 built; 1 input
 * errors with --strict, or nothing built; 2 bad usage, or an output/cache
 * folder refused before anything was written (src/cli/outputGuard.ts).
 */
import path from "node:path";
import { writeFile } from "node:fs/promises";
import { HELP, parseArgs } from "./args.ts";
import { reportProblems, summary } from "./report.ts";
import { buildStamp } from "./buildStamp.ts";

export async function main(argv: string[]): Promise<number> {
  const parsed = parseArgs(argv);
  const out = (s: string) => process.stdout.write(s + "\n");
  const err = (s: string) => process.stderr.write(s + "\n");
  if (parsed.command === "help") {
    out(HELP);
    return 0;
  }
  const { build, BuildLockedError, BuildStoppedError, OutputRefusedError, readVersion } = await import("./build.ts");
  if (parsed.command === "version") {
    out(await readVersion());
    return 0;
  }
  if (parsed.command === "usage-error") {
    err(`waferbook: ${parsed.message}`);
    err("Run `waferbook --help` for the options.");
    return 2;
  }
  const stamp = buildStamp(process.env, () => new Date());
  if ("error" in stamp) {
    err(`waferbook: ${stamp.error}`);
    return 2;
  }
  const quiet = parsed.options.quiet || process.env.CI === "true" || !process.stdout.isTTY;
  const started = Date.now();
  try {
    const result = await build({ ...parsed.options, quiet }, {
      log: quiet ? () => {} : (s) => process.stdout.write(`\r\x1b[2K${s} (${((Date.now() - started) / 1000).toFixed(1)} s)`),
      today: () => new Date().toISOString().slice(0, 10),
      now: stamp.stamp,
    });
    if (!quiet) process.stdout.write("\r\x1b[2K");
    // For the benchmark (bench/run.ts): phase times, cache use and this process's peak memory.
    if (process.env.WAFERBOOK_STATS) await writeFile(process.env.WAFERBOOK_STATS, JSON.stringify({ ...result.stats, wall_ms: Date.now() - started, maxRSS_kB: process.resourceUsage().maxRSS }) + "\n");
    reportProblems(result.problems, err);
    for (const w of result.warnings ?? []) err(`waferbook: warning: ${w}`);
    out(summary(result, (Date.now() - started) / 1000));
    if (!result.ok) {
      err("waferbook: nothing could be built; the previous site was left as it was.");
      return 1;
    }
    out(`site written to ${path.relative(process.cwd(), result.outDir) || "."}/index.html`);
    const errors = result.problems.filter((p) => p.severity === "error").length;
    if (parsed.options.strict && errors > 0) {
      err(`waferbook: --strict: ${errors} input error${errors === 1 ? "" : "s"} (listed above)`);
      return 1;
    }
    return 0;
  } catch (e) {
    if (e instanceof OutputRefusedError) {
      err(`waferbook: ${e.message}`);
      return 2;
    }
    if (e instanceof BuildStoppedError) {
      err(`waferbook: ${e.message}`);
      if (!(e instanceof BuildLockedError) && e.previousKept) err("The previous site was left as it was.");
      return 1;
    }
    const sys = e as NodeJS.ErrnoException;
    if (typeof sys.code === "string" && /^E[A-Z]+$/.test(sys.code) && sys.syscall) {
      // The file system said no (permissions, space, a file in the way): one line, no stack. Nothing was published.
      err(`waferbook: ${sys.syscall} failed: ${sys.code}${sys.path ? ` on ${sys.path}` : ""}; the previous site was left as it was.`);
      return 1;
    }
    err("waferbook: internal error (please report it with the data that triggered it):");
    err((e as Error).stack ?? String(e));
    err("The previous site was left as it was.");
    return 1;
  }
}
