/**
 * The build driver: load site inputs, run every wafer through the pipeline
 * (workerPool.ts), decide which wafer pages are reused (pageReuse.ts), render
 * with Eleventy (render.ts) into a temporary folder beside the output, add
 * results.json files, raw-file copies and assets (writeWaferFiles.ts), then
 * swap the folder into place under the output lock (outputFolder.ts). A
 * failed build leaves the previous output exactly as it was.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import pLimit from "p-limit";
import { pipelineContext, sitewideReason } from "./pipeline.ts";
import { judgeOutcome, type WaferOutcome } from "../judge/outcome.ts";
import { codeVersion, damagedEntryWarning, defaultCacheDir, refusedPageWarning } from "./cache.ts";
import { drawnPageKey, restoreDrawnPage } from "./drawnPages.ts";
import { prestartWorkers, WaferJobs, type Prestarted } from "./workerPool.ts";
import { loadSiteInputs } from "../validate/load/site.ts";
import { buildSiteModel, sortOutcomes, waferPageExtras, type SiteMeta } from "../publish/siteModel.ts";
import { pageCodeVersion, pageFingerprint, previousFingerprint } from "./pageReuse.ts";
import type { AnalysedFolder } from "./analyseFolder.ts";
import { renderSite } from "./render.ts";
import { writeSearch } from "../publish/searchIndex.ts";
import type { Problem } from "../model/problem.ts";
import type { BuildOptions } from "./args.ts";
import { loadDataHistory } from "../validate/load/history.ts";
import { decisionCommits } from "../validate/load/decisionCommits.ts";
import { writeExports } from "./writeExports.ts";
import { PACKAGE_ROOT, packageFile } from "./paths.ts";
import { readVersion } from "./version.ts";
import { acquireLock, BuildLockedError, BuildStoppedError } from "./outputFolder.ts";
import { checkOutput, OutputRefusedError } from "./outputGuard.ts";
import { publish, recoverInterrupted } from "./siteLayout.ts";
import { writeExtras, type CommitsOf } from "./writeWaferFiles.ts";

export { PACKAGE_ROOT, BuildLockedError, BuildStoppedError, OutputRefusedError, readVersion };

export interface BuildIO {
  log: (line: string) => void;
  /** Today's date, YYYY-MM-DD (future-date checks). */
  today: () => string;
  /** The build stamp shown in page footers. */
  now: () => string;
}

export interface BuildResult {
  ok: boolean;
  /** Why nothing was built, when ok is false and the reason is known. */
  reason?: string;
  outcomes: WaferOutcome[];
  problems: Problem[];
  outDir: string;
  pages: number;
  /** Wafers taken from the analysis cache / analysed from raw files; wafer pages reused unchanged from the previous output; pages taken as drawn from the cache (drawnPages.ts); raw files read to compute cache keys (the others' hashes came from the file-hash record); wall time of each phase, ms. */
  /** Things the user should know that did not stop the build (e.g. an old site generation that could not be removed). */
  warnings?: string[];
  stats?: {
    cacheHits: number;
    analysed: number;
    pagesReused: number;
    pagesFromCache?: number;
    drawn?: number;
    filesHashed: number;
    phases: Record<string, number>;
  };
}

/**
 * Errors outside any wafer folder (targets.yaml, analysis.yaml, runs/*.md, a
 * missing data or wafers folder). A badly named wafer folder is the wafer's own
 * problem and does not stop the build.
 */
export function siteWideErrors(problems: readonly Problem[]): Problem[] {
  return problems.filter((p) => p.severity === "error" && p.wafer === undefined && !p.file.startsWith("wafers/"));
}

/** The build-output warning for a history that could not be read (the changes page shows the same reason). */
function historyWarning(reason: string): Problem {
  return {
    severity: "warning",
    file: "",
    message: `the git history could not be read, so the changes page and the wafers' histories show no commits: ${reason}`,
    fix: "run `git log` in the data folder to see the error; check that git is installed and the .git folder is intact",
  };
}

export async function build(options: BuildOptions, io: BuildIO): Promise<BuildResult> {
  const dataDir = path.resolve(options.data);
  const outDir = path.resolve(options.out);
  const cacheDir = options.cache === null ? null : path.resolve(options.cache ?? defaultCacheDir(outDir));
  // Before anything is written: the output can never be, hold or lie in the data (outputGuard.ts).
  await checkOutput({ data: dataDir, out: outDir, cache: cacheDir });
  const release = await acquireLock(outDir);
  const tmpDir = path.join(path.dirname(outDir), `.${path.basename(outDir)}-building-${process.pid}`);
  // Drawn pages' models wait here for rendering (waferPages.ts); a killed build's is removed by recoverInterrupted.
  const scratchDir = `${tmpDir}-pages`;
  const warnings: string[] = [];
  let early: Prestarted | undefined;
  try {
    // Workers load their code while this thread reads the site inputs (workerPool.ts).
    early = await prestartWorkers(dataDir, cacheDir);
    warnings.push(...(await recoverInterrupted(outDir)));
    await fs.rm(tmpDir, { recursive: true, force: true });
    const version = await readVersion();
    const site = await loadSiteInputs(dataDir);
    // A broken site-wide input (targets.yaml, analysis.yaml, a run note) makes every verdict unreliable:
    // the build stops before anything is written, so the previous site stays as it was (exit 1, --strict or not).
    const sitewide = siteWideErrors(site.problems);
    if (sitewide.length) {
      return {
        ok: false,
        outcomes: [],
        problems: [...site.problems],
        outDir,
        pages: 0,
        reason: sitewideReason(sitewide.length),
      };
    }
    const ctx = pipelineContext(dataDir, site, io.today(), version);
    const phases: Record<string, number> = {};
    let t = performance.now();
    const lap = (name: string) => {
      const now = performance.now();
      phases[name] = Math.round(now - t);
      t = now;
    };
    const code = cacheDir ? await codeVersion(version) : "";
    const jobs = new WaferJobs(
      { dataDir, today: ctx.today, siteSettings: ctx.siteSettings, waferListing: site.waferListing, cacheDir, code, pipeline: ctx, outDir: tmpDir, scratchDir },
      early,
    );
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
    let sorted: WaferOutcome[] = [];
    let pageExtras: ReturnType<typeof waferPageExtras> = new Map();
    let commitsOf: CommitsOf = () => ({ wafer: null, targets: null });
    let written = 0;
    let stats: NonNullable<BuildResult["stats"]>;
    let failure: unknown;
    /** Warnings about the build's own inputs besides the data files: history that could not be read. */
    const buildProblems: Problem[] = [];
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
        return { ok: false, outcomes, problems: [...site.problems], outDir, pages: 0, warnings };
      }
      const history = await loadDataHistory(dataDir);
      if (history?.failure) buildProblems.push(historyWarning(history.failure));
      const findDecisions = async () => {
        if (history && !history.failure)
          history.decisions = await decisionCommits(
            dataDir,
            history,
            outcomes.map((o) => ({ id: o.folder, file: o.record?.file ?? "", decision: o.record?.decision })),
          );
      };
      await findDecisions();
      meta = { title: "waferbook", version, builtAt: io.now(), basePath: options.basePath, dataCommit: history?.head ?? null };
      const pageCode = await pageCodeVersion(version);
      const fingerprints = new Map<string, string>();
      /** Pages taken as drawn from the cache (drawnPages.ts). */
      const restoredPages = new Set<string>();
      let stillToDraw: { folder: string; key?: string; outcome: WaferOutcome }[] = [];
      // Usually one round. A drawn page refused as not waferbook's own (drawnPages.ts restoreDrawnPage) means someone
      // could write into the cache: that wafer is analysed again from its raw files, never from its entry, and since
      // its outcome may differ from the entry's, what depends on every outcome (order, neighbours, fingerprints,
      // pages reused) is worked out again in a second round, keeping the pages restored in the first.
      let reanalysed = 0;
      for (;;) {
        sorted = sortOutcomes(outcomes);
        pageExtras = waferPageExtras(sorted, meta.basePath, history);
        const targetsCommit = history?.targetsVersions[0]?.hash ?? null;
        commitsOf = (folder) => ({ wafer: pageExtras.get(folder)?.history.commits[0]?.hash ?? null, targets: targetsCommit });
        reused.clear();
        const toDraw: { folder: string; key?: string; outcome: WaferOutcome; i: number }[] = [];
        for (const [i, o] of outcomes.entries()) {
          // Everything in the wafer's output folder: the page's extras, and the commits its results.json names.
          const fp = pageFingerprint(pageCode, meta.basePath, o, { extras: pageExtras.get(o.folder), commits: commitsOf(o.folder) });
          fingerprints.set(o.folder, fp);
          if (drawn.has(o.folder) || restoredPages.has(o.folder)) continue;
          if (reusePages && (await previousFingerprint(path.join(outDir, "wafers", o.folder, "index.html"))) === fp) reused.add(o.folder);
          else toDraw.push({ folder: o.folder, key: found[i].key, outcome: o, i });
        }
        // Pages drawn by a --shard build (or an earlier one) are taken from the cache as drawn (drawnPages.ts).
        // A few at a time: each is a file read and a few writes.
        const restoreLimit = pLimit(4);
        const cachePages: Problem[][] = toDraw.map(() => []);
        const restored = await Promise.all(
          toDraw.map((it, k) =>
            restoreLimit(async () =>
              !cacheDir || !it.key
                ? "absent"
                : await restoreDrawnPage(
                    cacheDir,
                    drawnPageKey(pageCode, it.key, it.outcome),
                    it.folder,
                    tmpDir,
                    scratchDir,
                    (file, reason) => cachePages[k].push(damagedEntryWarning(it.folder, file, reason)),
                    (file, found) => cachePages[k].push(refusedPageWarning(it.folder, file, found)),
                  ),
            ),
          ),
        );
        // In folder order, whatever order the reads finished in.
        jobs.cacheWarnings.push(...cachePages.flat());
        toDraw.forEach((it, k) => restored[k] === "restored" && restoredPages.add(it.folder));
        stillToDraw = toDraw.filter((_, k) => restored[k] === "absent" || restored[k] === "damaged");
        const refused = toDraw.filter((_, k) => restored[k] === "refused");
        // Each round moves the refused wafers to `drawn`, so the rounds end.
        if (!refused.length) break;
        reanalysed += refused.length;
        await jobs.reanalyseAll(refused, (k, r) => {
          const i = refused[k].i;
          found[i] = r;
          drawn.add(r.entry.folder);
          outcomes[i] = judgeOutcome(r.entry, r.entry.analysis, ctx);
        });
        await findDecisions();
      }
      const pagesFromCache = restoredPages.size;
      await jobs.drawAll(stillToDraw);
      stats = {
        cacheHits: analysed.filter((a) => a.cacheHit).length - reanalysed,
        analysed: analysed.filter((a) => !a.cacheHit).length + reanalysed,
        pagesReused: reused.size,
        pagesFromCache,
        drawn: drawn.size + stillToDraw.length,
        filesHashed: jobs.fileHashes?.hashed ?? 0,
        phases,
      };
      const model = buildSiteModel(outcomes, site.runs, site.problems, meta, { targets: site.targets, history });
      lap("model");
      const toRender = sorted.map((o) => o.folder).filter((f) => !reused.has(f));
      const rendering = renderSite(
        model,
        toRender,
        tmpDir,
        scratchDir,
        meta,
        pageExtras,
        fingerprints,
        // A fresh worker renders the wafer pages while this thread renders the rest (workerPool.ts renderer).
        await jobs.renderer(toRender.length),
      );
      // Meanwhile the files that are not rendered pages: results.json files, raw-file copies, exports and the
      // search index (no file of theirs is a page; mostly waiting on the disk, so they fill this thread's gaps).
      const writing = (async () => {
        await writeExtras(outcomes, dataDir, tmpDir, commitsOf, outDir, reused, jobs.fileHashes);
        await writeExports(outcomes, tmpDir, meta, site.runs, reused);
        await writeSearch(outcomes, site.runs, tmpDir, packageFile("minisearch", "dist/umd/index.js"));
      })();
      // Both settle before anything else happens to the folder they write into; a rendering failure is reported first.
      const [rendered, wrote] = await Promise.allSettled([rendering, writing]);
      if (rendered.status === "rejected") throw rendered.reason;
      if (wrote.status === "rejected") throw wrote.reason;
      written = rendered.value;
      lap("render and write");
    } finally {
      await jobs.close();
    }
    const problems = [...site.problems, ...buildProblems, ...jobs.cacheWarnings, ...outcomes.flatMap((o) => o.problems)];
    warnings.push(...(await publish(tmpDir, outDir)));
    lap("publish");
    return { ok: true, outcomes, problems, outDir, pages: written, stats, warnings };
  } finally {
    // Workers started early and never used (a site-wide error, every wafer from the cache).
    await early?.close().catch(() => {});
    // Best effort: once the site is published, nothing here may turn the build into a failure.
    for (const dir of [tmpDir, scratchDir]) {
      await fs
        .rm(dir, { recursive: true, force: true })
        .catch((err: NodeJS.ErrnoException) => warnings.push(`could not remove ${dir} (${err.code ?? err.message}); the next build removes it`));
    }
    await release().catch((err: NodeJS.ErrnoException) =>
      warnings.push(`could not remove the lock ${outDir}.lock (${err.code ?? err.message}); delete it by hand`),
    );
  }
}
