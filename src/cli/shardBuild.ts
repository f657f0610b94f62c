/**
 * `waferbook build --shard K/N`: the work of one CI job of a sharded build
 * (docs/scaling.md). It analyses the wafers of shard K of N (shard.ts) that
 * are not in the cache yet, draws their pages, and stores both in the cache
 * folder: the analysis entries (cache.ts) and the drawn pages
 * (drawnPages.ts). It renders nothing and never touches --out: no lock, no
 * site, no generation folder. The site is made by a plain `waferbook build`
 * over the N cache folders copied into one, which then only judges and
 * renders.
 *
 * Judging runs here as well, against the same targets.yaml, because a drawn
 * page shows verdicts; the drawn page's key holds the judged outcome, so a
 * page drawn against other targets is never taken.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { BuildOptions } from "./args.ts";
import { readVersion, siteWideErrors, type BuildIO, type BuildResult } from "./build.ts";
import { codeVersion, defaultCacheDir } from "./cache.ts";
import { drawnPageKey, hasDrawnPage, storeDrawnPage } from "./drawnPages.ts";
import { checkCacheFolder } from "./outputGuard.ts";
import { pageCodeVersion } from "./pageReuse.ts";
import { pipelineContext, sitewideReason } from "./pipeline.ts";
import { shardFolders, type Shard } from "./shard.ts";
import { WaferJobs } from "./workerPool.ts";
import { loadSiteInputs } from "../validate/load/site.ts";
import { judgeOutcome, type WaferOutcome } from "../judge/outcome.ts";
import type { Problem } from "../model/problem.ts";

export interface ShardResult extends BuildResult {
  shard: Shard & { wafers: number; of: number; cacheDir: string; pagesStored: number };
}

export async function buildShard(options: BuildOptions & { shard: Shard }, io: BuildIO): Promise<ShardResult> {
  const dataDir = path.resolve(options.data);
  const outDir = path.resolve(options.out);
  const cacheDir = path.resolve(options.cache ?? defaultCacheDir(outDir));
  await checkCacheFolder(dataDir, cacheDir, options.cache ?? cacheDir);
  const version = await readVersion();
  const site = await loadSiteInputs(dataDir);
  const shardInfo = { ...options.shard, wafers: 0, of: site.waferFolders.length, cacheDir, pagesStored: 0 };
  const sitewide = siteWideErrors(site.problems);
  if (sitewide.length) {
    return {
      ok: false,
      outcomes: [],
      problems: [...site.problems],
      outDir,
      pages: 0,
      reason: sitewideReason(sitewide.length),
      shard: shardInfo,
    };
  }
  const folders = await shardFolders(dataDir, site.waferFolders, options.shard);
  shardInfo.wafers = folders.length;
  const ctx = pipelineContext(dataDir, site, io.today(), version);
  // The jobs draw pictures and park models here; they are copied into the cache, then the folder goes.
  const work = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-shard-"));
  const pagesDir = path.join(work, "out");
  const scratchDir = path.join(work, "pages");
  const phases: Record<string, number> = {};
  let t = performance.now();
  const lap = (name: string) => {
    const now = performance.now();
    phases[name] = Math.round(now - t);
    t = now;
  };
  const [code, pageCode] = await Promise.all([codeVersion(version), pageCodeVersion(version)]);
  const jobs = new WaferJobs({
    dataDir,
    today: ctx.today,
    siteSettings: ctx.siteSettings,
    waferListing: site.waferListing,
    cacheDir,
    code,
    pipeline: ctx,
    outDir: pagesDir,
    scratchDir,
  });
  const outcomes: WaferOutcome[] = new Array(folders.length);
  const keys: (string | undefined)[] = new Array(folders.length);
  const drawn = new Set<number>();
  let done = 0;
  let failure: unknown;
  try {
    const analysed = await jobs.analyseAll(folders, (i, r, isDrawn) => {
      try {
        keys[i] = r.key;
        if (isDrawn) drawn.add(i);
        outcomes[i] = judgeOutcome(r.entry, r.entry.analysis, ctx);
      } catch (err) {
        failure ??= err;
      }
      if (!options.quiet)
        io.log(`shard ${options.shard.index}/${options.shard.count}: analysed ${++done}/${folders.length} ${r.entry.folder}${r.cacheHit ? " (cached)" : ""}`);
    });
    if (failure !== undefined) throw failure;
    lap("analyse");
    // Wafers taken from the cache whose drawn page is not there yet (an analysis cached by an earlier plain build) are drawn now.
    const pageKeys = outcomes.map((o, i) => (keys[i] && outcomes[i].record ? drawnPageKey(pageCode, keys[i]!, o) : undefined));
    const toDraw: { folder: string; key?: string; i: number }[] = [];
    for (const [i, o] of outcomes.entries()) {
      if (!drawn.has(i) && pageKeys[i] && !(await hasDrawnPage(cacheDir, pageKeys[i]!))) toDraw.push({ folder: o.folder, key: keys[i], i });
    }
    await jobs.drawAll(toDraw);
    for (const it of toDraw) drawn.add(it.i);
    await jobs.close();
    lap("draw");
    // Only wafers that were cached have a key worth storing a page under (a wafer whose record did not validate is read again by the assembly).
    for (const i of [...drawn].sort((a, b) => a - b)) {
      if (!pageKeys[i]) continue;
      await storeDrawnPage(cacheDir, pageKeys[i]!, outcomes[i].folder, pagesDir, scratchDir);
      shardInfo.pagesStored++;
    }
    lap("store");
    const problems: Problem[] = [...site.problems, ...jobs.cacheWarnings, ...outcomes.flatMap((o) => o.problems)];
    const stats = {
      cacheHits: analysed.filter((a) => a.cacheHit).length,
      analysed: analysed.filter((a) => !a.cacheHit).length,
      pagesReused: 0,
      drawn: drawn.size,
      filesHashed: jobs.fileHashes?.hashed ?? 0,
      phases,
    };
    return { ok: true, outcomes, problems, outDir, pages: 0, stats, shard: shardInfo };
  } finally {
    await jobs.close();
    await fs.rm(work, { recursive: true, force: true }).catch(() => {});
  }
}
