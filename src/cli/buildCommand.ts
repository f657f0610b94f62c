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
import { OutputRefusedError } from "./outputGuard.ts";
import { cacheLine, reportInternalError, reportProblems, summary } from "./report.ts";
import { buildStamp } from "./buildStamp.ts";
import { countText } from "../model/format.ts";
import { buildShard, type ShardResult } from "./shardBuild.ts";
import type { CommandIO } from "./main.ts";

/** `announce: false` leaves out the line saying where the site went (serve says it its own way). */
export async function runBuild(options: BuildOptions, io: CommandIO, { announce = true } = {}): Promise<number> {
  // The footer's build time: SOURCE_DATE_EPOCH when set (reproducible builds), else the clock.
  const stamp = buildStamp(process.env, () => new Date());
  if ("error" in stamp) {
    io.err(`waferbook: ${stamp.error}`);
    return EXIT.usage;
  }
  const quiet = options.quiet || process.env.CI === "true" || !process.stderr.isTTY;
  const started = Date.now();
  try {
    const buildIO = {
      log: quiet ? () => {} : (s: string) => process.stderr.write(`\r\x1b[2K${s} (${((Date.now() - started) / 1000).toFixed(1)} s)`),
      today: () => new Date().toISOString().slice(0, 10),
      now: stamp.stamp,
    };
    const shard = options.shard;
    const result = shard ? await buildShard({ ...options, quiet, shard }, buildIO) : await build({ ...options, quiet }, buildIO);
    if (!quiet) process.stderr.write("\r\x1b[2K");
    // For the benchmark (bench/run.ts): phase times, cache use, this process's CPU time (all threads) and peak memory.
    if (process.env.WAFERBOOK_STATS)
      await writeFile(
        process.env.WAFERBOOK_STATS,
        JSON.stringify({
          ...result.stats,
          wall_ms: Date.now() - started,
          cpu_ms: Math.round((process.resourceUsage().userCPUTime + process.resourceUsage().systemCPUTime) / 1000),
          maxRSS_kB: process.resourceUsage().maxRSS,
        }) + "\n",
      );
    reportProblems(result.problems, io.err);
    for (const w of result.warnings ?? []) io.err(`waferbook: warning: ${w}`);
    io.out(summary(result, (Date.now() - started) / 1000));
    if (result.ok && result.stats) io.out(cacheLine(result.stats));
    if (!result.ok) {
      io.err(`waferbook: ${result.reason ? `${result.reason}: ` : ""}nothing could be built; the previous site was left as it was.`);
      return EXIT.inputErrors;
    }
    if ("shard" in result) {
      const sh = (result as ShardResult).shard;
      io.out(
        `shard ${sh.index}/${sh.count}: ${sh.wafers} of ${countText(sh.of, "wafer")}, ${countText(sh.pagesStored, "drawn page")} stored; cache written to ${path.relative(process.cwd(), sh.cacheDir) || "."} (no site written: copy every shard's cache folder into one and run waferbook build on it)`,
      );
    } else if (announce) io.out(siteWrittenMessage(path.relative(process.cwd(), result.outDir) || ".", options.basePath));
    const errors = result.problems.filter((p) => p.severity === "error").length;
    if (options.strict && errors > 0) {
      io.err(`waferbook: --strict: ${errors} input error${errors === 1 ? "" : "s"} (listed above)`);
      return EXIT.inputErrors;
    }
    return EXIT.ok;
  } catch (e) {
    if (e instanceof OutputRefusedError) {
      io.err(`waferbook: ${e.message}`);
      return EXIT.usage;
    }
    if (e instanceof BuildStoppedError) {
      io.err(`waferbook: ${e.message}`);
      if (!(e instanceof BuildLockedError) && e.previousKept) io.err("The previous site was left as it was.");
      return EXIT.inputErrors;
    }
    const sys = e as NodeJS.ErrnoException;
    if (typeof sys.code === "string" && /^E[A-Z]+$/.test(sys.code) && sys.syscall) {
      // The file system said no (permissions, space, a file in the way) before anything was published: one line, no stack.
      io.err(`waferbook: ${sys.syscall} failed: ${sys.code}${sys.path ? ` on ${sys.path}` : ""}; the previous site was left as it was.`);
      return EXIT.inputErrors;
    }
    reportInternalError(e, io.err);
    io.err("The previous site was left as it was.");
    return EXIT.internal;
  }
}
