/** Writes the export files (results.csv, results.json, per-wafer points.csv) into the site being built. */
import { promises as fs } from "node:fs";
import path from "node:path";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { RunNotes } from "../validate/load/site.ts";
import { allResultsJson, pointsCsv, resultsCsv } from "../publish/exports.ts";
import { sortOutcomes } from "../publish/siteModel.ts";

/** `reused`: wafers whose folder was linked from the previous output (their points.csv is already there and must not be written through the link). */
export async function writeExports(
  outcomes: readonly WaferOutcome[],
  outDir: string,
  meta: { version: string; builtAt: string; dataCommit?: string | null },
  runs: ReadonlyMap<string, RunNotes>,
  reused: ReadonlySet<string> = new Set(),
): Promise<void> {
  const sorted = sortOutcomes(outcomes);
  await fs.writeFile(path.join(outDir, "results.csv"), resultsCsv(sorted, runs));
  await fs.writeFile(path.join(outDir, "results.json"), JSON.stringify(allResultsJson(sorted, meta, runs), null, 1) + "\n");
  for (const o of outcomes) {
    if (reused.has(o.folder)) continue;
    const dir = path.join(outDir, "wafers", o.folder);
    await fs.mkdir(dir, { recursive: true });
    await fs.writeFile(path.join(dir, "points.csv"), pointsCsv(o));
  }
}
