/** Worker side of workerPool.ts: runs one wafer job per message (waferJob.ts) and replies with plain data. */
import { parentPort, workerData } from "node:worker_threads";
import { analyseJob, drawJob, type JobContext } from "./waferJob.ts";

const ctx = workerData as JobContext;
parentPort!.on("message", async (m: { id: number; kind: "analyse" | "draw"; folder: string; key?: string }) => {
  try {
    const result = m.kind === "draw" ? await drawJob(m.folder, ctx, m.key) : await analyseJob(m.folder, ctx, m.key);
    parentPort!.postMessage({ id: m.id, ok: true, result });
  } catch (e) {
    parentPort!.postMessage({ id: m.id, ok: false, error: (e as Error).stack ?? String(e) });
  }
});
