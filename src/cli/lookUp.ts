/**
 * Cache look-up of one wafer folder in the main thread: its cache key (the
 * files hashed, not parsed) and its slim entry, if any. Kept apart from the
 * analysis (analyseFolder.ts) so that a build whose wafers are all cached, or
 * analysed on workers, never loads the analysis code in the main thread.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import type { AnalyseContext, AnalysedFolder } from "./analyseFolder.ts";
import { cacheKey, readEntry } from "./cache.ts";
import type { FileHashes } from "./fileHashes.ts";

/** The cached (slim) result of one wafer folder, if any, and its cache key (undefined without a cache). */
export async function lookUpFolder(folder: string, ctx: AnalyseContext, hashes?: FileHashes): Promise<{ key?: string; hit?: AnalysedFolder }> {
  if (!ctx.cacheDir) return {};
  const twins = (await fs.readdir(path.join(ctx.dataDir, "wafers")).catch(() => [] as string[])).filter((n) => n !== folder && n.toLowerCase() === folder.toLowerCase()).sort();
  const key = await cacheKey(path.join(ctx.dataDir, "wafers", folder), ctx.code, ctx.siteSettings, hashes, twins);
  const entry = await readEntry(ctx.cacheDir, key, "slim");
  return { key, hit: entry && entry.folder === folder ? { entry, cacheHit: true, form: "slim", key } : undefined };
}
