/**
 * Runs the per-wafer jobs of a build (waferJob.ts: analyse and draw, or draw
 * again from the cache), in parallel on worker threads (node:worker_threads)
 * where that pays, each wafer independently; results are put back in the
 * order of the folders given, whatever order they finish in, so the output
 * is the same as a sequential build.
 *
 * Cache look-ups (hash the wafer's files, read its slim entry) run in this
 * thread, a few folders at a time. Misses go to the pool as soon as they are
 * found, so hashing overlaps analysis instead of preceding it (the first miss
 * starts one worker, the second the rest of the pool). The pool size is
 * os.availableParallelism(), capped at MAX_WORKERS and at the jobs that can
 * still come; with one core, or fewer
 * than MIN_WAFERS_FOR_WORKERS jobs, they run in this thread (starting a
 * worker costs a few tenths of a second of module loading).
 * WAFERBOOK_WORKERS=n overrides the size (0 = in this thread).
 *
 * A build may start workers before its context is known ({@link prestartWorkers}):
 * their module loading (the analysis, validation and drawing code) then overlaps
 * the main thread's reading of targets, settings and the code's cache key. Such a
 * worker gets the context as its first message when the pool adopts it.
 */
import { existsSync, promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { Worker } from "node:worker_threads";
import pLimit from "p-limit";
import { workerEntry } from "./paths.ts";
import { FileHashes } from "./fileHashes.ts";
import type { AnalysedFolder } from "./analyseFolder.ts";
import { lookUpFolder, waferListing } from "./lookUp.ts";
import type { JobContext, JobResult } from "./waferJob.ts";
import { PAGES_PER_RENDER, type RenderBatch } from "./render.ts";
import type { Problem } from "../model/problem.ts";

/** The jobs themselves, loaded only when they run in this thread (the analysis and drawing code is otherwise loaded by the workers alone). */
const jobsHere = () => import("./waferJob.ts");

export const MAX_WORKERS = 8;
/** Below this many jobs, starting workers costs more than it saves. */
export const MIN_WAFERS_FOR_WORKERS = 6;
/** Misses seen before the pool grows beyond the one worker started at the first miss. */
const MISSES_FOR_FULL_POOL = 2;

export function poolSize(jobs: number): number {
  const env = process.env.WAFERBOOK_WORKERS;
  if (env !== undefined && /^\d+$/.test(env)) return Math.min(Number(env), jobs);
  const cores = typeof os.availableParallelism === "function" ? os.availableParallelism() : os.cpus().length;
  if (cores < 2 || jobs < MIN_WAFERS_FOR_WORKERS) return 0;
  return Math.min(cores, MAX_WORKERS, jobs);
}

type Kind = "analyse" | "draw" | "render";

type Job = { id: number; kind: Kind; folder: string; key?: string; batch?: RenderBatch };

/** What a worker was doing, for a message about it: "the worker analysing wafers/TQ-2401", "the worker rendering the wafer pages A…B". */
function workerDoing(job: Job | undefined): string {
  if (!job) return "a worker waiting for a job";
  if (job.kind === "render") return `the worker rendering ${job.folder}`;
  return `the worker ${job.kind === "draw" ? "drawing the page of" : "analysing"} wafers/${job.folder}`;
}

/** A worker stopped on its own (a library calling process.exit, the process killing the thread), naming the job it was running. */
const stoppedUnexpectedly = (code: number, job?: Job) => new Error(`${workerDoing(job)} stopped unexpectedly (exit code ${code})`);
type Reply = { id: number; ok: true; result: JobResult | number } | { id: number; ok: false; error: string };

/** A fixed set of workers fed from one queue. */
class Pool {
  private readonly workers: Worker[] = [];
  private readonly idle: Worker[] = [];
  private readonly queue: Job[] = [];
  /** The job each busy worker is running (for naming it when the worker stops or fails). */
  private readonly running = new Map<Worker, Job>();
  private readonly waiting = new Map<number, { resolve: (r: never) => void; reject: (e: Error) => void; folder: string }>();
  private failure: Error | undefined;
  private closing = false;
  private nextId = 0;

  constructor(
    size: number,
    private readonly ctx: JobContext,
    adopted: Prestarted | undefined,
  ) {
    for (const { worker, error } of adopted?.take() ?? []) {
      worker.postMessage({ context: ctx });
      this.add(worker);
      if (error) this.fail(error);
    }
    this.grow(size);
  }

  /** Adds workers up to `size` in all. */
  grow(size: number): void {
    while (this.workers.length < size) this.add(new Worker(workerEntry(), { workerData: this.ctx }));
    this.pump();
  }

  private add(w: Worker): void {
    this.workers.push(w);
    this.idle.push(w);
    w.on("message", (m: Reply) => {
      this.running.delete(w);
      const job = this.waiting.get(m.id);
      this.waiting.delete(m.id);
      if (m.ok) job?.resolve(m.result as never);
      else job?.reject(new Error(`${job.folder} failed in a worker:\n${m.error}`));
      this.idle.push(w);
      this.pump();
    });
    // An error the worker could not catch (out of memory, an exception outside a job): named with the job it was running.
    w.on("error", (e) => this.fail(new Error(`${workerDoing(this.running.get(w))} failed: ${e.message}`, { cause: e })));
    // A worker that stops on its own (a library calling process.exit) would leave its job waiting forever.
    w.on("exit", (code) => {
      if (!this.closing) this.fail(stoppedUnexpectedly(code, this.running.get(w)));
    });
  }

  get size(): number {
    return this.workers.length;
  }

  run(kind: "analyse" | "draw", folder: string, key?: string): Promise<JobResult> {
    return this.send({ kind, folder, key });
  }

  /** Renders a batch of drawn wafer pages; resolves with the pages written. */
  render(batch: RenderBatch): Promise<number> {
    return this.send({ kind: "render", folder: `the wafer pages ${batch.folders[0]}…${batch.folders.at(-1)}`, batch });
  }

  private send<R>(job: Omit<Job, "id">): Promise<R> {
    if (this.failure) return Promise.reject(this.failure);
    const id = this.nextId++;
    return new Promise<R>((resolve, reject) => {
      this.waiting.set(id, { resolve, reject, folder: job.folder });
      this.queue.push({ id, ...job });
      this.pump();
    });
  }

  private pump(): void {
    while (this.idle.length > 0 && this.queue.length > 0) {
      const w = this.idle.pop()!;
      const job = this.queue.shift()!;
      this.running.set(w, job);
      w.postMessage(job);
    }
  }

  private fail(e: Error): void {
    this.failure ??= e;
    for (const job of this.waiting.values()) job.reject(e);
    this.waiting.clear();
    this.queue.length = 0;
  }

  close(): Promise<unknown> {
    this.closing = true;
    return Promise.all(this.workers.map((w) => w.terminate()));
  }
}

/**
 * Workers started before the build's context exists (see the module comment).
 * Until a pool adopts them they only load their modules; `close` ends those
 * never adopted. An error a worker reports meanwhile is kept and fails the
 * pool that adopts it.
 */
export class Prestarted {
  private waiting: { worker: Worker; error?: Error }[] = [];

  constructor(count: number) {
    for (let i = 0; i < count; i++) {
      const entry: { worker: Worker; error?: Error } = { worker: new Worker(workerEntry(), { workerData: null }) };
      entry.worker.on("error", (e) => (entry.error ??= e));
      // Stopped before a pool took it (its exit event would not reach the pool): the pool fails with this.
      entry.worker.on("exit", (code) => (entry.error ??= stoppedUnexpectedly(code)));
      this.waiting.push(entry);
    }
  }

  get count(): number {
    return this.waiting.length;
  }

  /** Hands every waiting worker over (once). */
  take(): { worker: Worker; error?: Error }[] {
    return this.waiting.splice(0);
  }

  async close(): Promise<void> {
    await Promise.all(this.take().map(({ worker }) => worker.terminate()));
  }
}

/**
 * Starts the workers a build will probably use, before its context is known:
 * as many as the pool would have when every wafer will be analysed (no
 * file-hash record in the cache folder, or no cache), else one (a warm build's
 * first miss starts one); none when the pool would run in this thread (one
 * core, WAFERBOOK_WORKERS=0, fewer than MIN_WAFERS_FOR_WORKERS wafer folders).
 */
export async function prestartWorkers(dataDir: string, cacheDir: string | null): Promise<Prestarted> {
  const folders = await fs.readdir(path.join(dataDir, "wafers"), { withFileTypes: true }).then(
    (l) => l.filter((e) => e.isDirectory() || e.isSymbolicLink()).length,
    () => 0,
  );
  const cold = cacheDir === null || !existsSync(path.join(cacheDir, "file-hashes.json"));
  return new Prestarted(Math.min(poolSize(folders), cold ? MAX_WORKERS : 1));
}

/** The wafer jobs of one build, sharing one pool (started when first worth it, closed by `close`). */
export class WaferJobs {
  private pool: Pool | undefined;
  /** The file-hash record used by the last analyseAll (counts of files hashed and reused). */
  fileHashes: FileHashes | undefined;
  /** Damaged cache entries discarded so far (cache.ts readEntry), as warnings for the build output. */
  readonly cacheWarnings: Problem[] = [];

  /** `prestarted`: workers started before the context was known (prestartWorkers); the pool adopts them when it starts, and close() ends them if it never does. */
  constructor(
    private readonly ctx: JobContext,
    private readonly prestarted?: Prestarted,
  ) {}

  /** Starts (or grows) the pool for the jobs that may still come; undefined when they are better run in this thread. */
  private startPool(jobsAhead: number, atMost = MAX_WORKERS): Pool | undefined {
    // Workers already started are used, even where starting them now would not pay.
    const size = Math.max(Math.min(poolSize(jobsAhead), atMost), jobsAhead > 0 ? (this.prestarted?.count ?? 0) : 0);
    if (size > 0) {
      if (this.pool) this.pool.grow(size);
      else this.pool = new Pool(size, this.ctx, this.prestarted);
    }
    return this.pool;
  }

  /**
   * Looks every folder up in the cache; analyses (and draws) the misses.
   * onDone(i, r, drawn) runs as each finishes, with the slim result.
   */
  async analyseAll(folders: string[], onDone: (i: number, r: AnalysedFolder, drawn: boolean) => void = () => {}): Promise<AnalysedFolder[]> {
    const results: AnalysedFolder[] = new Array(folders.length);
    const hashes = await FileHashes.open(this.ctx.cacheDir);
    this.fileHashes = hashes;
    // Misses not yet handed to the pool; what is left at the end is analysed in this thread.
    const pending: { i: number; key?: string }[] = [];
    const running: Promise<void>[] = [];
    const finish = (i: number, j: JobResult) => {
      this.cacheWarnings.push(...(j.result.warnings ?? []));
      results[i] = j.result;
      onDone(i, j.result, j.drawn);
    };
    const toPool = (p: Pool, m: { i: number; key?: string }) => {
      const job = p.run("analyse", folders[m.i], m.key).then((j) => finish(m.i, j));
      // Handled here so a failure while look-ups go on is not an unhandled rejection; Promise.all below reports it.
      job.catch(() => {});
      running.push(job);
    };
    try {
      const listing = await waferListing(this.ctx);
      // A few look-ups at a time: each is file reads and hashing, mostly waiting on the disk.
      const limit = pLimit(4);
      let looked = 0;
      let misses = 0;
      await Promise.all(
        folders.map((f, i) =>
          limit(async () => {
            const { key, hit, damaged } = await lookUpFolder(f, this.ctx, hashes, listing);
            looked++;
            if (damaged) this.cacheWarnings.push(damaged);
            if (hit) {
              results[i] = hit;
              onDone(i, hit, false);
              return;
            }
            pending.push({ i, key });
            misses++;
            // The first miss starts one worker, so it is analysed while the look-ups go on; more misses grow the pool.
            const pool = this.startPool(misses + folders.length - looked, misses < MISSES_FOR_FULL_POOL ? 1 : MAX_WORKERS);
            if (pool) for (const m of pending.splice(0)) toPool(pool, m);
          }),
        ),
      );
      if (pending.length) {
        const { analyseJob } = await jobsHere();
        for (const m of pending.sort((a, b) => a.i - b.i)) finish(m.i, await analyseJob(folders[m.i], this.ctx, m.key));
      }
      await Promise.all(running);
    } finally {
      await Promise.allSettled(running);
    }
    await hashes.save();
    return results;
  }

  /** Draws the pages of wafers taken slim from the cache (targets or neighbours changed). */
  async drawAll(items: { folder: string; key?: string }[]): Promise<void> {
    const pool = this.startPool(items.length);
    if (!pool) {
      if (!items.length) return;
      const { drawJob } = await jobsHere();
      for (const it of items) this.cacheWarnings.push(...((await drawJob(it.folder, this.ctx, it.key)).result.warnings ?? []));
      return;
    }
    const jobs = items.map((it) => pool.run("draw", it.folder, it.key));
    for (const j of jobs) j.catch(() => {});
    for (const j of await Promise.all(jobs)) this.cacheWarnings.push(...(j.result.warnings ?? []));
  }

  /**
   * Analyses `items` again from their raw files, never from the cache (a
   * cache entry of theirs is not trusted: build.ts, a refused drawn page),
   * draws their pages and stores fresh entries; onDone(k, r) with the slim
   * result of items[k], in that order.
   */
  async reanalyseAll(items: { folder: string; key?: string }[], onDone: (k: number, r: AnalysedFolder) => void): Promise<void> {
    const pool = this.startPool(items.length);
    const { analyseJob } = pool ? { analyseJob: undefined } : await jobsHere();
    const jobs = items.map((it) => (pool ? pool.run("analyse", it.folder, it.key) : undefined));
    for (const j of jobs) j?.catch(() => {});
    for (const [k, it] of items.entries()) {
      // With a key, analyseJob skips the cache look-up and reads the raw files (analyseFolder.ts).
      const j = jobs[k] ? await jobs[k] : await analyseJob!(it.folder, this.ctx, it.key);
      this.cacheWarnings.push(...(j.result.warnings ?? []));
      onDone(k, j.result);
    }
  }

  /**
   * Ends the pool (its workers' heaps hold what their analyses left) and,
   * when there are more than PAGES_PER_RENDER `pages` to render, starts one
   * fresh worker to render batches of drawn wafer pages while this thread
   * renders the site-wide pages (render.ts renderSite), whatever the analysis
   * did (a build whose pages all come from the cache, such as the assembly of
   * --shard builds, renders as many pages as a cold one). One, not the pool's
   * size: the main thread is the other renderer, and each worker rendering
   * adds its own heap to the build's peak memory. Undefined when workers are
   * not used at all (one core, WAFERBOOK_WORKERS=0): the batches are then
   * rendered in this thread, as are `pages` of at most PAGES_PER_RENDER.
   * `close` ends the worker.
   */
  async renderer(pages: number): Promise<((batch: RenderBatch) => Promise<number>) | undefined> {
    await this.close();
    // A few pages go with the site-wide pages in one run (renderSite): no worker is worth starting.
    if (pages <= PAGES_PER_RENDER || poolSize(Number.MAX_SAFE_INTEGER) === 0) return undefined;
    const pool = new Pool(1, this.ctx, undefined);
    this.pool = pool;
    return (batch) => pool.render(batch);
  }

  async close(): Promise<void> {
    await this.prestarted?.close();
    await this.pool?.close();
    this.pool = undefined;
  }
}
