/**
 * The build driver: load site inputs, run every wafer through the pipeline,
 * render with Eleventy into a temporary folder beside the output, add
 * results.json files, raw-file copies and assets, then swap the folder into
 * place. A failed build leaves the previous output exactly as it was. A lock
 * file keeps two builds from writing the same output at once.
 */
import { createHash } from "node:crypto";
import { constants as fsConstants, promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import pLimit from "p-limit";
import { judgeOutcome, type PipelineContext, type WaferOutcome } from "./pipeline.ts";
import { codeVersion, defaultCacheDir } from "./cache.ts";
import { WaferJobs } from "./workerPool.ts";
import type { FileHashes } from "./fileHashes.ts";
import { loadSiteInputs } from "../read/site.ts";
import { buildSiteModel, sortOutcomes, waferPageExtras, type SiteMeta } from "../publish/siteModel.ts";
import { rawCopyPath } from "../publish/rawCopies.ts";
import { linkOrCopy, linkReusedPage, pageCodeVersion, pageFingerprint, previousFingerprint } from "./pageReuse.ts";
import type { AnalysedFolder } from "./analyseFolder.ts";
import { PAGES_PER_RENDER, renderTemplates, renderWaferPages, waferPageBatch } from "./render.ts";
import { resultsJson } from "../publish/resultsJson.ts";
import { writeSearch } from "../publish/searchIndex.ts";
import type { Problem } from "../validate/problem.ts";
import type { BuildOptions } from "./args.ts";
import { loadDataHistory } from "../read/history.ts";
import { writeExports } from "./writeExports.ts";
import { PACKAGE_ROOT } from "./paths.ts";

export { PACKAGE_ROOT };

export interface BuildIO {
  log: (line: string) => void;
  /** Today's date, YYYY-MM-DD (future-date checks). */
  today: () => string;
  /** The build stamp shown in page footers. */
  now: () => string;
}

export interface BuildResult {
  ok: boolean;
  outcomes: WaferOutcome[];
  problems: Problem[];
  outDir: string;
  pages: number;
  /** Wafers taken from the analysis cache / analysed from raw files; wafer pages reused unchanged from the previous output; raw files read to compute cache keys (the others' hashes came from the file-hash record); wall time of each phase, ms. */
  stats?: { cacheHits: number; analysed: number; pagesReused: number; filesHashed: number; phases: Record<string, number> };
}

/** A build stopped for a reason that is not a bug (reported without a stack trace; the previous site stays as it was). */
export class BuildStoppedError extends Error {}
/** Another live build holds the output folder's lock. */
export class BuildLockedError extends BuildStoppedError {}

/**
 * Takes the output folder's lock, `<out>.lock`, holding "pid@host". The lock
 * file is written under a temporary name and hard-linked into place, so it
 * never exists half-written. A lock is stale only when it names a process on
 * this host that no longer exists; a stale lock is renamed away (one taker
 * wins) before the lock is taken again. Returns the release function.
 */
async function acquireLock(outDir: string): Promise<() => Promise<void>> {
  const lock = `${outDir}.lock`;
  const me = `${process.pid}@${os.hostname()}`;
  await fs.mkdir(path.dirname(outDir), { recursive: true });
  const tmp = `${lock}.${process.pid}.${Math.random().toString(36).slice(2)}`;
  await fs.writeFile(tmp, `${me}\n`);
  try {
    for (let attempt = 0; ; attempt++) {
      try {
        await fs.link(tmp, lock);
        return () => fs.rm(lock, { force: true });
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code !== "EEXIST" || attempt > 5) throw err;
      }
      const holder = (await fs.readFile(lock, "utf8").catch(() => "")).trim();
      if (holderAlive(holder)) {
        const who = /^(\d+)(?:@(.*))?$/.exec(holder);
        const desc = who ? (who[2] === undefined || who[2] === os.hostname() ? `process ${who[1]}` : `process ${who[1]} on ${who[2]}`) : "an unknown process";
        throw new BuildLockedError(`another build (${desc}) is writing ${outDir}; wait for it to finish, or delete ${lock} if that process is gone`);
      }
      // Stale: move it aside under a unique name (only one of several takers succeeds), then try again.
      await fs.rename(lock, `${lock}.stale-${process.pid}`).catch(() => {});
      await fs.rm(`${lock}.stale-${process.pid}`, { force: true });
    }
  } finally {
    await fs.rm(tmp, { force: true });
  }
}

/** Whether a lock's holder ("pid@host", or a bare pid from older versions) may still be running. */
function holderAlive(holder: string): boolean {
  const m = /^(\d+)(?:@(.*))?$/.exec(holder);
  if (!m) return false;
  if (m[2] !== undefined && m[2] !== os.hostname()) return true; // another machine's process: cannot tell, so assume it runs
  try {
    process.kill(Number(m[1]), 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === "EPERM"; // exists, but belongs to another user
  }
}

export async function readVersion(): Promise<string> {
  const pkg = JSON.parse(await fs.readFile(path.join(PACKAGE_ROOT, "package.json"), "utf8")) as { version: string };
  return pkg.version;
}

export async function build(options: BuildOptions, io: BuildIO): Promise<BuildResult> {
  const dataDir = path.resolve(options.data);
  const outDir = path.resolve(options.out);
  const release = await acquireLock(outDir);
  const tmpDir = path.join(path.dirname(outDir), `.${path.basename(outDir)}-building-${process.pid}`);
  try {
    await recoverInterrupted(outDir);
    await fs.rm(tmpDir, { recursive: true, force: true });
    const version = await readVersion();
    const site = await loadSiteInputs(dataDir);
    // A broken targets.yaml or analysis.yaml makes every verdict unreliable, so every wafer shows it.
    const sitewideErrors = site.problems.filter((p) => p.severity === "error" && (p.file === "targets.yaml" || p.file === "analysis.yaml"));
    const ctx: PipelineContext = { dataDir, today: io.today(), siteSettings: site.settings, targets: site.targets, siteOverrides: site.settingOverrides, version, sitewideErrors };
    const phases: Record<string, number> = {};
    let t = performance.now();
    const lap = (name: string) => {
      const now = performance.now();
      phases[name] = Math.round(now - t);
      t = now;
    };
    const cacheDir = options.cache === null ? null : path.resolve(options.cache ?? defaultCacheDir(outDir));
    const code = cacheDir ? await codeVersion(version) : "";
    const scratchDir = `${tmpDir}-pages`;
    const jobs = new WaferJobs({ dataDir, today: ctx.today, siteSettings: ctx.siteSettings, cacheDir, code, pipeline: ctx, outDir: tmpDir, scratchDir });
    // Unchanged wafer pages are reused from the previous output (src/cli/pageReuse.ts); --no-cache builds every page afresh.
    const reusePages = cacheDir !== null;
    let done = 0;
    // Each wafer is judged as soon as its result arrives, from its slim form
    // (figures only: see cache.ts slimAnalysis), which is all the site-wide
    // pages, results.json and the exports read. A wafer analysed now has its
    // page drawn by the same job, where its full analysis is (waferJob.ts); a
    // cache hit arrives slim, and its page is reused or drawn again below. So
    // the main thread never holds a wafer's traces and map points.
    const outcomes: WaferOutcome[] = new Array(site.waferFolders.length);
    const found: AnalysedFolder[] = new Array(site.waferFolders.length);
    const drawn = new Set<string>();
    const reused = new Set<string>();
    let meta: SiteMeta;
    let commitsOf: CommitsOf = () => ({ wafer: null, targets: null });
    let written = 0;
    let stats: NonNullable<BuildResult["stats"]>;
    let failure: unknown;
    try {
      const analysed = await jobs.analyseAll(site.waferFolders, (i, r, isDrawn) => {
        try {
          found[i] = r;
          if (isDrawn) drawn.add(r.entry.folder);
          outcomes[i] = judgeOutcome(r.entry, r.entry.analysis, ctx);
        } catch (err) {
          // Thrown again below: this callback may run inside a worker's message handler.
          failure ??= err;
        }
        if (!options.quiet) io.log(`analysed ${++done}/${site.waferFolders.length} ${r.entry.folder}${r.cacheHit ? " (cached)" : ""}`);
      });
      if (failure !== undefined) throw failure;
      lap("analyse");
      if (site.waferFolders.length === 0 && site.problems.some((p) => p.severity === "error")) {
        return { ok: false, outcomes, problems: [...site.problems], outDir, pages: 0 };
      }
      const history = await loadDataHistory(dataDir);
      meta = { title: "waferbook", version, builtAt: io.now(), basePath: options.basePath, dataCommit: history?.head ?? null };
      const sorted = sortOutcomes(outcomes);
      const pageExtras = waferPageExtras(sorted, meta.basePath, history);
      const targetsCommit = history?.targetsVersions[0]?.hash ?? null;
      commitsOf = (folder) => ({ wafer: pageExtras.get(folder)?.history.commits[0]?.hash ?? null, targets: targetsCommit });
      const pageCode = await pageCodeVersion(version);
      const fingerprints = new Map<string, string>();
      const toDraw: { folder: string; key?: string }[] = [];
      for (const [i, o] of outcomes.entries()) {
        // Everything in the wafer's output folder: the page's extras, and the commits its results.json names.
        const fp = pageFingerprint(pageCode, meta.basePath, o, { extras: pageExtras.get(o.folder), commits: commitsOf(o.folder) });
        fingerprints.set(o.folder, fp);
        if (drawn.has(o.folder)) continue;
        if (reusePages && (await previousFingerprint(path.join(outDir, "wafers", o.folder, "index.html"))) === fp) reused.add(o.folder);
        else toDraw.push({ folder: o.folder, key: found[i].key });
      }
      await jobs.drawAll(toDraw);
      // The workers' heaps go before rendering, the main thread's busiest moment for memory.
      await jobs.close();
      stats = { cacheHits: analysed.filter((a) => a.cacheHit).length, analysed: analysed.filter((a) => !a.cacheHit).length, pagesReused: reused.size, filesHashed: jobs.fileHashes?.hashed ?? 0, phases };
      const model = buildSiteModel(outcomes, site.runs, site.problems, meta, { targets: site.targets, history });
      lap("model");
      const toRender = sorted.map((o) => o.folder).filter((f) => !reused.has(f));
      const templates = path.join(PACKAGE_ROOT, "templates");
      // A few pages (a warm build) go with the site-wide pages in one Eleventy run; many are rendered in batches.
      if (toRender.length <= PAGES_PER_RENDER) written = await renderTemplates(templates, tmpDir, { ...model, wafers: await waferPageBatch(toRender, scratchDir, pageExtras, fingerprints) });
      else {
        written = await renderTemplates(templates, tmpDir, model);
        written += await renderWaferPages(toRender, tmpDir, scratchDir, meta, pageExtras, fingerprints);
      }
      lap("render");
    } finally {
      await jobs.close();
    }
    const problems = [...site.problems, ...outcomes.flatMap((o) => o.problems)];
    await writeExtras(outcomes, dataDir, tmpDir, commitsOf, outDir, reused, jobs.fileHashes);
    await writeExports(outcomes, tmpDir, meta, site.runs, reused);
    await writeSearch(outcomes, site.runs, tmpDir, PACKAGE_ROOT);
    await swapInto(tmpDir, outDir);
    lap("write");
    return { ok: true, outcomes, problems, outDir, pages: written, stats };
  } finally {
    try {
      await fs.rm(tmpDir, { recursive: true, force: true });
      await fs.rm(`${tmpDir}-pages`, { recursive: true, force: true });
    } finally {
      await release();
    }
  }
}

type CommitsOf = (folder: string) => { wafer: string | null; targets: string | null };

/**
 * Writes each wafer's results.json and places its raw-file copies in the
 * site's content-addressed raw/ folder (src/publish/rawCopies.ts); a reused
 * page's folder is linked from the previous output as it is. Several wafers at
 * a time: this is file copies, links and small writes, mostly waiting on the
 * disk.
 */
async function writeExtras(outcomes: WaferOutcome[], dataDir: string, tmpDir: string, commitsOf: CommitsOf, outDir: string, reused: ReadonlySet<string>, hashes: FileHashes | undefined): Promise<void> {
  await fs.mkdir(path.join(tmpDir, "raw"), { recursive: true });
  const placed = new Set<string>();
  const limit = pLimit(8);
  await Promise.all(
    outcomes.map((o) =>
      limit(async () => {
        const dir = path.join(tmpDir, "wafers", o.folder);
        if (reused.has(o.folder)) await linkReusedPage(path.join(outDir, "wafers", o.folder), dir);
        else {
          await fs.mkdir(dir, { recursive: true });
          await fs.writeFile(path.join(dir, "results.json"), JSON.stringify(resultsJson(o, commitsOf(o.folder)), null, 1) + "\n");
        }
        for (const f of o.provenance.files) {
          const parts = f.path.split("/");
          const rel = rawCopyPath(f);
          if (parts[0] !== "wafers" || parts[1] !== o.folder || placed.has(rel)) continue;
          placed.add(rel);
          await placeRawCopy(path.join(dataDir, ...parts), path.join(tmpDir, rel), path.join(outDir, rel), f.sha256, f.path, hashes);
        }
      }),
    ),
  );
  const chartJs = path.join(PACKAGE_ROOT, "node_modules", "chart.js", "dist", "chart.umd.min.js");
  await fs.mkdir(path.join(tmpDir, "assets"), { recursive: true });
  await fs.copyFile(chartJs, path.join(tmpDir, "assets", "chart.umd.min.js"));
}

/**
 * Puts a copy of a raw file into the new output. The copies are named by
 * their SHA-256, so a copy of that name in the previous output holds the same
 * bytes: it (ours, never the raw file) is hard-linked instead of copying the
 * bytes again. Otherwise the raw file is copied, and the copy must hold the
 * bytes that were analysed: when the file-hash record vouches that the file
 * is unchanged since it was hashed with that SHA-256, a plain copy; else the
 * file is read and its bytes checked before they are written. A file that
 * changed during the build stops the build (the previous site stays).
 */
export async function placeRawCopy(rawAbs: string, dest: string, prevCopy: string, sha256: string, rel: string, hashes: FileHashes | undefined): Promise<void> {
  if (linkOrCopy(prevCopy, dest, { copy: false })) return;
  const st = await fs.stat(rawAbs);
  if (hashes?.trusted(rawAbs, st) === sha256) {
    // A copy-on-write clone where the file system offers one (btrfs, XFS, APFS), else a plain copy.
    await fs.copyFile(rawAbs, dest, fsConstants.COPYFILE_EXCL | fsConstants.COPYFILE_FICLONE);
    return;
  }
  const bytes = await fs.readFile(rawAbs, { flag: "r" });
  if (createHash("sha256").update(bytes).digest("hex") !== sha256) {
    throw new BuildStoppedError(`${rel} changed while the site was being built (its bytes no longer match the SHA-256 that was analysed); build again once it is complete`);
  }
  await fs.writeFile(dest, bytes, { flag: "wx" });
}

/**
 * Run while holding the lock: a build killed between the two renames of
 * swapInto left the previous site at `.<out>-building-<pid>-old` and no
 * outDir; put it back. Other leftovers of killed builds are removed.
 */
async function recoverInterrupted(outDir: string): Promise<void> {
  const parent = path.dirname(outDir);
  const prefix = `.${path.basename(outDir)}-building-`;
  const left = (await fs.readdir(parent)).filter((n) => n.startsWith(prefix) && /^\d+(-old|-pages)?$/.test(n.slice(prefix.length)));
  const hasOut = await fs.stat(outDir).then(() => true, () => false);
  const old = left.find((n) => n.endsWith("-old"));
  if (!hasOut && old) await fs.rename(path.join(parent, old), outDir);
  for (const n of left) if (n !== old || hasOut) await fs.rm(path.join(parent, n), { recursive: true, force: true });
}

/** Replaces outDir by tmpDir with two renames; the old folder is removed only after the new one is in place. */
async function swapInto(tmpDir: string, outDir: string): Promise<void> {
  const old = `${tmpDir}-old`;
  await fs.rm(old, { recursive: true, force: true });
  let hadOld = false;
  try {
    await fs.rename(outDir, old);
    hadOld = true;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "ENOENT") throw err;
  }
  try {
    await fs.rename(tmpDir, outDir);
  } catch (err) {
    if (hadOld) await fs.rename(old, outDir);
    throw err;
  }
  if (hadOld) await fs.rm(old, { recursive: true, force: true });
}
