/** Worker side of workerPool.ts: runs one wafer job (waferJob.ts) or renders one batch of wafer pages (render.ts) per message and replies with plain data; a `context` message sets the build's context. */
import { parentPort, workerData } from "node:worker_threads";
import { analyseJob, drawJob, type JobContext } from "./waferJob.ts";
import { renderWaferBatch, type RenderBatch } from "./render.ts";

// Null for a worker started before the build's context was known (workerPool.ts prestartWorkers): it comes as the first message.
let ctx = workerData as JobContext | null;
parentPort!.on(
  "message",
  async (m: { context: JobContext } | { id: number; kind: "analyse" | "draw" | "render"; folder: string; key?: string; batch?: RenderBatch }) => {
    if ("context" in m) {
      ctx = m.context;
      return;
    }
    try {
      if (!ctx) throw new Error("a job arrived before the build's context");
      const result =
        m.kind === "render"
          ? await renderWaferBatch(m.batch!, ctx.outDir, ctx.scratchDir)
          : m.kind === "draw"
            ? await drawJob(m.folder, ctx, m.key)
            : await analyseJob(m.folder, ctx, m.key);
      parentPort!.postMessage({ id: m.id, ok: true, result });
    } catch (e) {
      parentPort!.postMessage({ id: m.id, ok: false, error: (e as Error).stack ?? String(e) });
    }
  },
);
