/**
 * `waferbook build`: runs the build, prints problems (stderr), the summary and
 * where the site went (stdout). Progress goes to stderr and only to a terminal,
 * so stdout carries nothing but the result. Returns the exit code (args.ts EXIT).
 */
import path from "node:path";
import { siteWrittenMessage } from "./siteMessage.ts";
import { writeFile } from "node:fs/promises";
import { EXIT, type BuildOptions } from "./args.ts";
import { build, BuildLockedError, BuildStoppedError } from "./build.ts";
import { reportInternalError, reportProblems, summary } from "./report.ts";
import type { CommandIO } from "./main.ts";

export async function runBuild(options: BuildOptions, io: CommandIO): Promise<number> {
  const quiet = options.quiet || process.env.CI === "true" || !process.stderr.isTTY;
  const started = Date.now();
  try {
    const result = await build({ ...options, quiet }, {
      log: quiet ? () => {} : (s) => process.stderr.write(`\r\x1b[2K${s} (${((Date.now() - started) / 1000).toFixed(1)} s)`),
      today: () => new Date().toISOString().slice(0, 10),
      now: () => new Date().toISOString().replace(/\.\d+Z$/, "Z"),
    });
    if (!quiet) process.stderr.write("\r\x1b[2K");
    // For the benchmark (bench/run.ts): phase times, cache use and this process's peak memory.
    if (process.env.WAFERBOOK_STATS) await writeFile(process.env.WAFERBOOK_STATS, JSON.stringify({ ...result.stats, wall_ms: Date.now() - started, maxRSS_kB: process.resourceUsage().maxRSS }) + "\n");
    reportProblems(result.problems, io.err);
    io.out(summary(result, (Date.now() - started) / 1000));
    if (!result.ok) {
      io.err(`waferbook: ${result.reason ? `${result.reason}: ` : ""}nothing could be built; the previous site was left as it was.`);
      return EXIT.inputErrors;
    }
    io.out(siteWrittenMessage(path.relative(process.cwd(), result.outDir) || ".", options.basePath));
    const errors = result.problems.filter((p) => p.severity === "error").length;
    if (options.strict && errors > 0) {
      io.err(`waferbook: --strict: ${errors} input error${errors === 1 ? "" : "s"} (listed above)`);
      return EXIT.inputErrors;
    }
    return EXIT.ok;
  } catch (e) {
    if (e instanceof BuildStoppedError) {
      io.err(`waferbook: ${e.message}`);
      if (!(e instanceof BuildLockedError)) io.err("The previous site was left as it was.");
      return EXIT.inputErrors;
    }
    reportInternalError(e, io.err);
    io.err("The previous site was left as it was.");
    return EXIT.internal;
  }
}
