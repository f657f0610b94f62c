/** Worker side of workerPool.ts: analyses one folder per message and replies with plain data. */
import { parentPort, workerData } from "node:worker_threads";
import { analyseFolder, type AnalyseContext } from "./analyseFolder.ts";

const ctx = workerData as AnalyseContext;
parentPort!.on("message", async (m: { id: number; folder: string; key?: string }) => {
  try {
    parentPort!.postMessage({ id: m.id, ok: true, result: await analyseFolder(m.folder, ctx, m.key) });
  } catch (e) {
    parentPort!.postMessage({ id: m.id, ok: false, error: (e as Error).stack ?? String(e) });
  }
});
