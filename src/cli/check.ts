/**
 * `waferbook check [--data DIR]`: reads and validates the whole data folder —
 * targets.yaml, analysis.yaml, run notes, every wafer.md and every file it
 * names — with the build's own read and validate stages (src/read,
 * src/validate), and lists every problem. Nothing is analysed and nothing is
 * written: no site, no cache, no lock. Meant for CI before `build --strict`
 * and for a quick look while editing records.
 *
 * Exit codes: 0 no input errors (warnings are listed but do not fail, as with
 * `build --strict`); 1 input errors; 2 bad usage.
 */
import { parseArgs } from "node:util";
import path from "node:path";
import pLimit from "p-limit";
import { loadSiteInputs } from "../validate/load/site.ts";
import { loadWafer } from "../validate/load/wafer.ts";
import { formatProblem, type Problem } from "../model/problem.ts";
import { countText } from "../model/format.ts";
import type { CommandIO } from "./commands.ts";
import type { PipelineContext } from "./pipeline.ts";
import { judgeOutcome } from "../judge/outcome.ts";

export const CHECK_HELP = `waferbook check — reads and validates a data folder without building anything

Usage:
  waferbook check [--data DIR]

Reads targets.yaml, analysis.yaml, runs/*.md, every wafers/<id>/wafer.md and
every file the records name, parses and validates them exactly as \`build\`
does, and lists every problem (file:line, expected, found, how to fix).
Nothing is analysed and nothing is written.

Options:
  --data DIR    the data folder (default: ./data)
  -h, --help    show this help
  --version     print the version

Exit codes: 0 no input errors (warnings are listed and do not fail);
1 one or more input errors; 2 bad usage.`;

export interface CheckResult {
  /** Wafer folders read. */
  wafers: number;
  /** Files read and validated (site files and every wafer's files). */
  files: number;
  /** Every problem: the site files' first, then each wafer's, in folder order. */
  problems: Problem[];
}

/**
 * Reads and validates everything under `dataDir`, as the build does before it
 * analyses: the site inputs (loadSiteInputs), each wafer folder (loadWafer)
 * and the checks made when a wafer is judged that need no analysis (grade and
 * waiver metrics known: judgeOutcome with no analysis). `today` is the date
 * future growth dates are checked against.
 */
export async function checkData(dataDir: string, today: string): Promise<CheckResult> {
  const site = await loadSiteInputs(dataDir);
  const ctx: PipelineContext = {
    dataDir,
    today,
    siteSettings: site.settings,
    waferListing: site.waferListing,
    targets: site.targets,
    siteOverrides: site.settingOverrides,
    version: "",
    sitewideErrors: [],
  };
  // A few folders at a time: reading overlaps parsing; results keep folder order.
  const limit = pLimit(4);
  const perWafer = await Promise.all(
    site.waferFolders.map((folder) =>
      limit(async () => {
        const loaded = await loadWafer(folder, ctx);
        return { files: loaded.files.length, problems: judgeOutcome(loaded, undefined, ctx).problems };
      }),
    ),
  );
  return {
    wafers: site.waferFolders.length,
    files: site.files.length + perWafer.reduce((n, w) => n + w.files, 0),
    problems: [...site.problems, ...perWafer.flatMap((w) => w.problems)],
  };
}

/** The summary line: what was read and how many problems of each kind. */
export function checkSummary(r: CheckResult, seconds: number): string {
  const errors = r.problems.filter((p) => p.severity === "error").length;
  const warnings = r.problems.length - errors;
  const found = r.problems.length === 0 ? "no problems" : `${countText(errors, "input error")}, ${countText(warnings, "warning")}`;
  return `checked ${countText(r.wafers, "wafer")} (${countText(r.files, "file")} read): ${found}; ${seconds.toFixed(1)} s`;
}

/** The `check` command: argv after "check"; returns the exit code. */
export async function checkCommand(argv: string[], io: CommandIO): Promise<number> {
  let values: { data?: string; help?: boolean; version?: boolean };
  try {
    ({ values } = parseArgs({
      args: argv,
      options: { data: { type: "string" }, help: { type: "boolean", short: "h" }, version: { type: "boolean" } },
      strict: true,
      allowPositionals: false,
    }));
  } catch (e) {
    io.err(`waferbook check: ${(e as Error).message}`);
    io.err("Run `waferbook check --help` for the options.");
    return 2;
  }
  if (values.help) {
    io.out(CHECK_HELP);
    return 0;
  }
  if (values.version) {
    io.out(await io.version());
    return 0;
  }
  const dataDir = path.resolve(values.data ?? "data");
  const started = performance.now();
  const result = await checkData(dataDir, io.today());
  // Problems are this command's output, so they go to stdout (one per line, as `build` prints them).
  for (const p of result.problems) io.out(formatProblem(p));
  io.out(checkSummary(result, (performance.now() - started) / 1000));
  return result.problems.some((p) => p.severity === "error") ? 1 : 0;
}
