/**
 * The per-wafer work of a build that runs on worker threads (or in the main
 * thread for small builds): analyse a wafer folder (or take it from the
 * cache) and draw its page. Drawing happens where the full analysis is, so
 * the bulk arrays never travel between threads: what comes back to the main
 * thread is the slim result (figures only) and whether the page was drawn.
 */
import { analyseFolder, loadInFull, type AnalyseContext, type AnalysedFolder } from "./analyseFolder.ts";
import { slimAnalysis } from "./cache.ts";
import type { PipelineContext } from "./pipeline.ts";
import { judgeOutcome } from "../judge/outcome.ts";
import { drawWaferPage } from "./waferPages.ts";

export interface JobContext extends AnalyseContext {
  /** Targets and settings for judging (a page shows its verdicts). */
  pipeline: PipelineContext;
  /** The output folder being built (page pictures) and the scratch folder for page models. */
  outDir: string;
  scratchDir: string;
}

export interface JobResult {
  result: AnalysedFolder;
  /** True when the wafer's page was drawn by this job. */
  drawn: boolean;
}

/** Analyses a folder that missed the cache and draws its page; returns the slim result. */
export async function analyseJob(folder: string, ctx: JobContext, key?: string): Promise<JobResult> {
  const r = await analyseFolder(folder, ctx, key);
  return r.form === "full" ? drawThenSlim(r, ctx) : { result: r, drawn: false };
}

/** Draws the page of a wafer that was taken slim from the cache (loading it in full). */
export async function drawJob(folder: string, ctx: JobContext, key?: string): Promise<JobResult> {
  return drawThenSlim(await loadInFull(folder, key, ctx), ctx);
}

/** Draws a page from a full result, then returns the result in its slim form (all the main thread needs). */
async function drawThenSlim(full: AnalysedFolder, ctx: JobContext): Promise<JobResult> {
  const { entry } = full;
  await drawWaferPage(judgeOutcome(entry, entry.analysis, ctx.pipeline), ctx.outDir, ctx.scratchDir);
  const slim = full.slim ?? (entry.analysis && slimAnalysis(entry.analysis));
  return { result: { entry: { ...entry, analysis: slim }, cacheHit: full.cacheHit, form: "slim", key: full.key, warnings: full.warnings }, drawn: true };
}
