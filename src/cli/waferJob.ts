/**
 * The per-wafer work of a build that runs on worker threads (or in the main
 * thread for small builds): analyse a wafer folder (or take it from the
 * cache) and draw its page. Drawing happens where the full analysis is, so
 * the bulk arrays never travel between threads: what comes back to the main
 * thread is the slim result (figures only) and whether the page was drawn.
 */
import { analyseFolder, loadInFull, type AnalyseContext, type AnalysedFolder } from "./analyseFolder.ts";
import { slimAnalysis } from "./cache.ts";
import { judgeOutcome, type PipelineContext } from "./pipeline.ts";
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
  if (r.form !== "full") return { result: r, drawn: false };
  await drawWaferPage(judgeOutcome(r.entry, r.entry.analysis, ctx.pipeline), ctx.outDir, ctx.scratchDir);
  return { result: { ...r, entry: { ...r.entry, analysis: r.entry.analysis && slimAnalysis(r.entry.analysis) }, form: "slim" }, drawn: true };
}

/** Draws the page of a wafer that was taken slim from the cache (loading it in full). */
export async function drawJob(folder: string, ctx: JobContext, key?: string): Promise<JobResult> {
  const full = await loadInFull(folder, key, ctx);
  await drawWaferPage(judgeOutcome(full.entry, full.entry.analysis, ctx.pipeline), ctx.outDir, ctx.scratchDir);
  return { result: { ...full, entry: { ...full.entry, analysis: full.entry.analysis && slimAnalysis(full.entry.analysis) }, form: "slim" }, drawn: true };
}
