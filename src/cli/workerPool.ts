/**
 * Analyses wafer folders in parallel on worker threads (node:worker_threads),
 * each wafer independently, and returns the results in the order of the
 * folders given, whatever order they finish in — so the output is the same as
 * a sequential build. The pool size is os.availableParallelism() − 0, capped
 * at MAX_WORKERS and at the number of wafers; with one core, or few wafers,
 * the folders are analysed in this thread (starting a worker costs about half
 * a second of module loading). WAFERBOOK_WORKERS=n overrides the size (0 = in
 * this thread).
 */
import os from "node:os";
import { Worker } from "node:worker_threads";
import { workerEntry } from "./paths.ts";
import { analyseFolder, lookUpFolder, type AnalyseContext, type AnalysedFolder } from "./analyseFolder.ts";

export const MAX_WORKERS = 8;
/** Below this many wafers, starting workers costs more than it saves. */
export const MIN_WAFERS_FOR_WORKERS = 6;

export function poolSize(wafers: number): number {
  const env = process.env.WAFERBOOK_WORKERS;
  if (env !== undefined && /^\d+$/.test(env)) return Math.min(Number(env), wafers);
  const cores = typeof os.availableParallelism === "function" ? os.availableParallelism() : os.cpus().length;
  if (cores < 2 || wafers < MIN_WAFERS_FOR_WORKERS) return 0;
  return Math.min(cores, MAX_WORKERS, wafers);
}

type Reply = { id: number; ok: true; result: AnalysedFolder } | { id: number; ok: false; error: string };

/** Analyses every folder; onDone(i) is called as each finishes (progress). Internal errors reject. */
export async function analyseAll(folders: string[], ctx: AnalyseContext, onDone: (i: number, r: AnalysedFolder) => void = () => {}): Promise<AnalysedFolder[]> {
  const results: AnalysedFolder[] = new Array(folders.length);
  // Cache look-ups (hash the files, read the entry) are cheap and run here; only misses go to the workers.
  const misses: { i: number; key?: string }[] = [];
  for (const [i, f] of folders.entries()) {
    const { key, hit } = await lookUpFolder(f, ctx);
    if (hit) onDone(i, (results[i] = hit));
    else misses.push({ i, key });
  }
  const size = poolSize(misses.length);
  if (size === 0) {
    for (const { i, key } of misses) onDone(i, (results[i] = await analyseFolder(folders[i], ctx, key)));
    return results;
  }
  let next = 0;
  const workers: Worker[] = [];
  try {
    await new Promise<void>((resolve, reject) => {
      let finished = 0;
      let failed = false;
      const feed = (w: Worker) => {
        if (next < misses.length) {
          const { i, key } = misses[next++];
          w.postMessage({ id: i, folder: folders[i], key });
        }
      };
      for (let k = 0; k < size; k++) {
        const w = new Worker(workerEntry(), { workerData: ctx });
        workers.push(w);
        w.on("message", (m: Reply) => {
          if (failed) return;
          if (!m.ok) {
            failed = true;
            reject(new Error(`analysis of ${folders[m.id]} failed in a worker:\n${m.error}`));
            return;
          }
          results[m.id] = m.result;
          onDone(m.id, m.result);
          if (++finished === misses.length) resolve();
          else feed(w);
        });
        w.on("error", (e) => {
          failed = true;
          reject(e);
        });
        feed(w);
      }
    });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return results;
}
