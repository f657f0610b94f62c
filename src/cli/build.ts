/**
 * The build driver: load site inputs, run every wafer through the pipeline,
 * render with Eleventy into a temporary folder beside the output, add
 * results.json files, raw-file copies and assets, then swap the folder into
 * place. A failed build leaves the previous output exactly as it was. A lock
 * file keeps two builds from writing the same output at once.
 */
import { promises as fs, constants as fsc } from "node:fs";
import path from "node:path";
import { Eleventy } from "@11ty/eleventy";
import pLimit from "p-limit";
import { judgeOutcome, type PipelineContext, type WaferOutcome } from "./pipeline.ts";
import { codeVersion, defaultCacheDir } from "./cache.ts";
import { analyseAll } from "./workerPool.ts";
import { loadSiteInputs } from "../read/site.ts";
import { buildSiteModel, sortOutcomes, waferPageExtras, type SiteMeta } from "../publish/siteModel.ts";
import { linkReusedPage, pageCodeVersion, pageFingerprint, previousFingerprint } from "./pageReuse.ts";
import { loadInFull, type AnalysedFolder } from "./analyseFolder.ts";
import { resultsJson, waferPageModel } from "../publish/waferPage.ts";
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
  /** Wafers taken from the analysis cache / analysed from raw files; wafer pages reused unchanged from the previous output; wall time of each phase, ms. */
  stats?: { cacheHits: number; analysed: number; pagesReused: number; phases: Record<string, number> };
}

export class BuildLockedError extends Error {}

async function acquireLock(outDir: string): Promise<() => Promise<void>> {
  const lock = `${outDir}.lock`;
  await fs.mkdir(path.dirname(outDir), { recursive: true });
  try {
    const h = await fs.open(lock, fsc.O_CREAT | fsc.O_EXCL | fsc.O_WRONLY);
    await h.writeFile(`${process.pid}\n`);
    await h.close();
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "EEXIST") throw err;
    const pid = Number((await fs.readFile(lock, "utf8").catch(() => "")).trim());
    let alive = false;
    try {
      if (pid > 0) {
        process.kill(pid, 0);
        alive = true;
      }
    } catch {
      alive = false;
    }
    if (alive) throw new BuildLockedError(`another build (process ${pid}) is writing ${outDir}; wait for it to finish, or delete ${lock} if that process is gone`);
    await fs.rm(lock, { force: true });
    return acquireLock(outDir);
  }
  return () => fs.rm(lock, { force: true });
}

export async function readVersion(): Promise<string> {
  const pkg = JSON.parse(await fs.readFile(path.join(PACKAGE_ROOT, "package.json"), "utf8")) as { version: string };
  return pkg.version;
}

export async function build(options: BuildOptions, io: BuildIO): Promise<BuildResult> {
  const dataDir = path.resolve(options.data);
  const outDir = path.resolve(options.out);
  const release = await acquireLock(outDir);
  await recoverInterrupted(outDir);
  const tmpDir = path.join(path.dirname(outDir), `.${path.basename(outDir)}-building-${process.pid}`);
  try {
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
    const analyseCtx = { dataDir, today: ctx.today, siteSettings: ctx.siteSettings, cacheDir, code };
    // Unchanged wafer pages are reused from the previous output (src/cli/pageReuse.ts); --no-cache builds every page afresh.
    const reusePages = cacheDir !== null;
    let done = 0;
    // Each wafer is judged as soon as its analysis arrives. A wafer analysed
    // now (full form) gets its page model at once, and the arrays drawn into
    // its pictures are then dropped; a cache hit arrives slim and is loaded in
    // full later only if its page must be drawn again. The build holds every
    // wafer's slim analysis and the page models of pages being drawn, never
    // every wafer's map points and traces at once.
    const outcomes: WaferOutcome[] = new Array(site.waferFolders.length);
    const found: AnalysedFolder[] = new Array(site.waferFolders.length);
    const pageModels = new Map<string, PageModel>();
    let failure: unknown;
    const drawPage = (r: AnalysedFolder) => {
      const o = judgeOutcome(r.entry, r.entry.analysis, ctx);
      pageModels.set(o.folder, waferPageModel(o));
      releasePictureData([o]);
    };
    const analysed = await analyseAll(site.waferFolders, analyseCtx, (i, r) => {
      try {
        outcomes[i] = judgeOutcome(r.entry, r.entry.analysis, ctx);
        found[i] = r;
        if (r.form === "full") drawPage(r);
      } catch (err) {
        // Thrown again below: this callback may run inside a worker's message handler.
        failure ??= err;
      }
      if (!options.quiet) io.log(`analysed ${++done}/${site.waferFolders.length} ${r.entry.folder}${r.cacheHit ? " (cached)" : ""}`);
    });
    if (failure !== undefined) throw failure;
    lap("analyse");
    const problems = [...site.problems, ...outcomes.flatMap((o) => o.problems)];
    if (site.waferFolders.length === 0 && site.problems.some((p) => p.severity === "error")) {
      return { ok: false, outcomes, problems, outDir, pages: 0 };
    }
    const history = await loadDataHistory(dataDir);
    const meta: SiteMeta = { title: "waferbook", version, builtAt: io.now(), basePath: options.basePath, dataCommit: history?.head ?? null };
    const pageExtras = waferPageExtras(sortOutcomes(outcomes), meta.basePath, history);
    const pageCode = await pageCodeVersion(version);
    const fingerprints = new Map<string, string>();
    const reused = new Set<string>();
    for (const [i, o] of outcomes.entries()) {
      const fp = pageFingerprint(pageCode, meta.basePath, o, pageExtras.get(o.folder));
      fingerprints.set(o.folder, fp);
      if (reusePages && (await previousFingerprint(path.join(outDir, "wafers", o.folder, "index.html"))) === fp) {
        reused.add(o.folder);
        pageModels.delete(o.folder);
      } else if (!pageModels.has(o.folder)) drawPage(await loadInFull(found[i], analyseCtx));
    }
    const stats = { cacheHits: analysed.filter((a) => a.cacheHit).length, analysed: analysed.filter((a) => !a.cacheHit).length, pagesReused: reused.size, phases };
    const model = buildSiteModel(outcomes, site.runs, site.problems, meta, { targets: site.targets, history, pages: pageModels, pageExtras, reused, fingerprints });
    pageModels.clear();
    lap("model");
    const pages = await render(model, tmpDir);
    lap("render");
    await writeExtras(outcomes, dataDir, tmpDir, meta.dataCommit ?? null, new Map(model.wafers.map((w) => [w.id, w])), outDir, reused);
    await writeExports(outcomes, tmpDir, meta, site.runs);
    await writeSearch(outcomes, site.runs, tmpDir, PACKAGE_ROOT);
    await swapInto(tmpDir, outDir);
    lap("write");
    return { ok: true, outcomes, problems, outDir, pages, stats };
  } finally {
    await fs.rm(tmpDir, { recursive: true, force: true });
    await release();
  }
}

const NO_TRACE = { b: new Float64Array(0), rhoxx: new Float64Array(0), rxy: new Float64Array(0) };

/**
 * Once a wafer's page model exists, the arrays drawn into its pictures and
 * charts (XRD map points, the charted full-resolution traces) are read by
 * nothing else (results.json, exports and search use the fitted figures), so
 * they are dropped.
 */
function releasePictureData(outcomes: WaferOutcome[]): void {
  for (const o of outcomes) {
    for (const f of o.analysis?.structure?.xrd?.files ?? []) f.points = undefined;
    for (const d of o.analysis?.devices ?? []) for (const p of d.points) p.trace = NO_TRACE;
  }
}

async function render(model: ReturnType<typeof buildSiteModel>, tmpDir: string): Promise<number> {
  const input = path.join(PACKAGE_ROOT, "templates");
  const elev = new Eleventy(input, tmpDir, {
    source: "cli",
    quietMode: true,
    configPath: path.join(PACKAGE_ROOT, ".eleventy.js"),
    config(c: any) {
      c.addGlobalData("wb", model);
    },
  });
  elev.disableLogger();
  const result = (await elev.write()) as unknown;
  const written = Array.isArray(result) ? (result as unknown[]).flat(2).length : 0;
  return written;
}

type PageModel = ReturnType<typeof waferPageModel>;

/**
 * SHA-256 of each raw-file copy in the previous output's wafer folder, from its
 * results.json provenance (empty when there is no usable previous output).
 */
async function previousCopies(prevWaferDir: string): Promise<Map<string, string>> {
  try {
    const prev = JSON.parse(await fs.readFile(path.join(prevWaferDir, "results.json"), "utf8")) as { provenance?: { files?: { path: string; sha256: string }[] } };
    return new Map((prev.provenance?.files ?? []).map((f) => [f.path, f.sha256]));
  } catch {
    return new Map();
  }
}

/**
 * Puts a copy of a raw file into the new output. When the previous output
 * already holds a copy with the same SHA-256, that copy (ours, never the raw
 * file) is hard-linked instead of copying the bytes again; anything unusual
 * falls back to a plain copy.
 */
async function placeRawCopy(rawAbs: string, dest: string, prevCopy: string | undefined): Promise<void> {
  if (prevCopy) {
    try {
      await fs.link(prevCopy, dest);
      return;
    } catch {
      // different file systems, missing file, or links not allowed: copy
    }
  }
  await fs.copyFile(rawAbs, dest);
}

async function writeExtras(outcomes: WaferOutcome[], dataDir: string, tmpDir: string, dataCommit: string | null, pagesById: Map<string, PageModel>, outDir: string, reused: ReadonlySet<string>): Promise<void> {
  // Several wafers at a time: this is file copies, links and small writes, mostly waiting on the disk.
  const limit = pLimit(8);
  await Promise.all(outcomes.map((o) => limit(() => writeWaferExtras(o, dataDir, tmpDir, dataCommit, pagesById.get(o.folder), outDir, reused.has(o.folder)))));
  const chartJs = path.join(PACKAGE_ROOT, "node_modules", "chart.js", "dist", "chart.umd.min.js");
  await fs.mkdir(path.join(tmpDir, "assets"), { recursive: true });
  await fs.copyFile(chartJs, path.join(tmpDir, "assets", "chart.umd.min.js"));
}

/** One wafer's results.json, raw-file copies and page pictures (or its reused page's files). */
async function writeWaferExtras(o: WaferOutcome, dataDir: string, tmpDir: string, dataCommit: string | null, page: PageModel | undefined, outDir: string, reused: boolean): Promise<void> {
  const dir = path.join(tmpDir, "wafers", o.folder);
  await fs.mkdir(dir, { recursive: true });
  const prevDir = path.join(outDir, "wafers", o.folder);
  const prevHashes = await previousCopies(prevDir);
  await fs.writeFile(path.join(dir, "results.json"), JSON.stringify(resultsJson(o, dataCommit), null, 1) + "\n");
  for (const f of o.provenance.files) {
    const parts = f.path.split("/");
    if (parts[0] !== "wafers" || parts[1] !== o.folder) continue;
    const dest = path.join(dir, "raw", ...parts.slice(2));
    await fs.mkdir(path.dirname(dest), { recursive: true });
    const same = prevHashes.get(f.path) === f.sha256;
    await placeRawCopy(path.join(dataDir, ...parts), dest, same ? path.join(prevDir, "raw", ...parts.slice(2)) : undefined);
  }
  if (reused) {
    await linkReusedPage(prevDir, dir);
    return;
  }
  if (!page) throw new Error(`internal: no page model for wafer ${o.folder}`);
  for (const section of [page.transportDepth, page.structure, page.images] as { files?: { path: string; bytes: Buffer }[] }[]) {
    for (const f of section?.files ?? []) {
      const parts = f.path.split("/");
      if (parts[0] !== "wafers" || parts[1] !== o.folder || parts.includes("..")) throw new Error(`section file outside its wafer folder: ${f.path}`);
      await fs.mkdir(path.dirname(path.join(tmpDir, ...parts)), { recursive: true });
      await fs.writeFile(path.join(tmpDir, ...parts), f.bytes);
    }
  }
}

/**
 * Run while holding the lock: a build killed between the two renames of
 * swapInto left the previous site at `.<out>-building-<pid>-old` and no
 * outDir; put it back. Other leftovers of killed builds are removed.
 */
async function recoverInterrupted(outDir: string): Promise<void> {
  const parent = path.dirname(outDir);
  const prefix = `.${path.basename(outDir)}-building-`;
  const left = (await fs.readdir(parent)).filter((n) => n.startsWith(prefix) && /^\d+(-old)?$/.test(n.slice(prefix.length)));
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
