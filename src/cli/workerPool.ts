/**
 * Analyses wafer folders, in parallel on worker threads (node:worker_threads)
 * where that pays, each wafer independently, and returns the results in the
 * order of the folders given, whatever order they finish in — so the output
 * is the same as a sequential build.
 *
 * Cache look-ups (hash the wafer's files, read its slim entry) run in this
 * thread, a few folders at a time. The first misses start the pool, and
 * every further miss goes to it at once, so hashing overlaps analysis instead
 * of preceding it. The pool size is os.availableParallelism(), capped at
 * MAX_WORKERS and at the wafers that can still miss; with one core, or when
 * fewer than MIN_WAFERS_FOR_WORKERS wafers could miss, the misses are
 * analysed in this thread (starting a worker costs a few tenths of a second
 * of module loading). WAFERBOOK_WORKERS=n overrides the size (0 = in this
 * thread).
 */
import os from "node:os";
import { Worker } from "node:worker_threads";
import pLimit from "p-limit";
import { workerEntry } from "./paths.ts";
import { analyseFolder, lookUpFolder, type AnalyseContext, type AnalysedFolder } from "./analyseFolder.ts";

export const MAX_WORKERS = 8;
/** Below this many wafers, starting workers costs more than it saves. */
export const MIN_WAFERS_FOR_WORKERS = 6;
/** Misses seen before the pool starts (one changed wafer is cheaper in this thread). */
const MISSES_TO_START_POOL = 2;

export function poolSize(wafers: number): number {
  const env = process.env.WAFERBOOK_WORKERS;
  if (env !== undefined && /^\d+$/.test(env)) return Math.min(Number(env), wafers);
  const cores = typeof os.availableParallelism === "function" ? os.availableParallelism() : os.cpus().length;
  if (cores < 2 || wafers < MIN_WAFERS_FOR_WORKERS) return 0;
  return Math.min(cores, MAX_WORKERS, wafers);
}

type Reply = { id: number; ok: true; result: AnalysedFolder } | { id: number; ok: false; error: string };

/** A fixed set of analysis workers fed from one queue. */
class Pool {
  private readonly workers: Worker[] = [];
  private readonly idle: Worker[] = [];
  private readonly queue: { id: number; folder: string; key?: string }[] = [];
  private readonly waiting = new Map<number, { resolve: (r: AnalysedFolder) => void; reject: (e: Error) => void; folder: string }>();
  private failure: Error | undefined;

  constructor(size: number, ctx: AnalyseContext) {
    for (let k = 0; k < size; k++) {
      const w = new Worker(workerEntry(), { workerData: ctx });
      this.workers.push(w);
      this.idle.push(w);
      w.on("message", (m: Reply) => {
        const job = this.waiting.get(m.id);
        this.waiting.delete(m.id);
        if (m.ok) job?.resolve(m.result);
        else job?.reject(new Error(`analysis of ${job.folder} failed in a worker:\n${m.error}`));
        this.idle.push(w);
        this.pump();
      });
      w.on("error", (e) => this.fail(e));
    }
  }

  run(id: number, folder: string, key?: string): Promise<AnalysedFolder> {
    if (this.failure) return Promise.reject(this.failure);
    return new Promise((resolve, reject) => {
      this.waiting.set(id, { resolve, reject, folder });
      this.queue.push({ id, folder, key });
      this.pump();
    });
  }

  private pump(): void {
    while (this.idle.length > 0 && this.queue.length > 0) this.idle.pop()!.postMessage(this.queue.shift());
  }

  private fail(e: Error): void {
    this.failure ??= e;
    for (const job of this.waiting.values()) job.reject(e);
    this.waiting.clear();
  }

  close(): Promise<unknown> {
    return Promise.all(this.workers.map((w) => w.terminate()));
  }
}

/** Analyses every folder; onDone(i) is called as each finishes (progress, page models). Internal errors reject. */
export async function analyseAll(folders: string[], ctx: AnalyseContext, onDone: (i: number, r: AnalysedFolder) => void = () => {}): Promise<AnalysedFolder[]> {
  const results: AnalysedFolder[] = new Array(folders.length);
  const misses: { i: number; key?: string }[] = [];
  const running: Promise<void>[] = [];
  let pool: Pool | undefined;
  const toPool = (p: Pool, m: { i: number; key?: string }) => {
    const job = p.run(m.i, folders[m.i], m.key).then((r) => {
      onDone(m.i, (results[m.i] = r));
    });
    // Handled here so a failure while look-ups go on is not an unhandled rejection; Promise.all below reports it.
    job.catch(() => {});
    running.push(job);
  };
  try {
    // A few look-ups at a time: each is file reads and hashing, mostly waiting on the disk.
    const limit = pLimit(4);
    let looked = 0;
    await Promise.all(
      folders.map((f, i) =>
        limit(async () => {
          const { key, hit } = await lookUpFolder(f, ctx);
          looked++;
          if (hit) {
            onDone(i, (results[i] = hit));
            return;
          }
          misses.push({ i, key });
          if (!pool && misses.length >= MISSES_TO_START_POOL) {
            const size = poolSize(misses.length + folders.length - looked);
            if (size > 0) {
              pool = new Pool(size, ctx);
              for (const m of misses) toPool(pool, m);
            }
          } else if (pool) toPool(pool, misses.at(-1)!);
        }),
      ),
    );
    misses.sort((a, b) => a.i - b.i);
    if (!pool) for (const { i, key } of misses) onDone(i, (results[i] = await analyseFolder(folders[i], ctx, key)));
    await Promise.all(running);
  } finally {
    // Settle every job before the workers go, so no rejection is left unhandled.
    await Promise.allSettled(running);
    await pool?.close();
  }
  return results;
}
