/**
 * Cache look-up of one wafer folder in the main thread: its cache key (the
 * files hashed, not parsed) and its slim entry, if any. Kept apart from the
 * analysis (analyseFolder.ts) so that a build whose wafers are all cached, or
 * analysed on workers, never loads the analysis code in the main thread.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import type { AnalyseContext, AnalysedFolder } from "./analyseFolder.ts";
import { cacheKey, damagedEntryWarning, entryMismatch, entryPath, readEntry } from "./cache.ts";
import type { Problem } from "../model/problem.ts";
import type { FileHashes } from "./fileHashes.ts";

/** The names in the data folder's wafers/ folder, as the loader's duplicate-id check sees them: ctx.waferListing when given (read once per build by loadSiteInputs), else read now. */
export async function waferListing(ctx: Pick<AnalyseContext, "dataDir" | "waferListing">): Promise<readonly string[]> {
  return ctx.waferListing ?? fs.readdir(path.join(ctx.dataDir, "wafers")).catch(() => [] as string[]);
}

/**
 * The cached (slim) result of one wafer folder, if any, and its cache key
 * (undefined without a cache). `listing`: waferListing's result, for the
 * letter-case twins that are part of the key. `damaged`: the warning when the
 * entry failed its checksum and was discarded (then there is no hit).
 */
export async function lookUpFolder(
  folder: string,
  ctx: AnalyseContext,
  hashes?: FileHashes,
  listing?: readonly string[],
): Promise<{ key?: string; hit?: AnalysedFolder; damaged?: Problem }> {
  if (!ctx.cacheDir) return {};
  const twins = (listing ?? (await waferListing(ctx))).filter((n) => n !== folder && n.toLowerCase() === folder.toLowerCase()).sort();
  const digests = new Map<string, string>();
  const key = await cacheKey(path.join(ctx.dataDir, "wafers", folder), ctx.code, ctx.siteSettings, hashes, twins, digests);
  let damaged: Problem | undefined;
  const entry = await readEntry(ctx.cacheDir, key, "slim", (file, reason) => (damaged = damagedEntryWarning(folder, file, reason)));
  if (!entry || entry.folder !== folder) return { key, damaged };
  const mismatch = entryMismatch(entry, folder, digests);
  if (mismatch) {
    // Written while a file changed under the analysis: discarded like a damaged entry (the full form is rewritten with it).
    const file = entryPath(ctx.cacheDir, key, "slim");
    await fs.rm(file, { force: true }).catch(() => {});
    return { key, damaged: damagedEntryWarning(folder, file, mismatch) };
  }
  return { key, hit: { entry, cacheHit: true, form: "slim", key } };
}
