/**
 * Rendering with Eleventy: the site-wide pages in one run, wafer pages in
 * batches from the models parked by drawWaferPage (waferPages.ts), so the
 * memory of rendering follows the batch, not the archive.
 *
 * Eleventy is loaded on first use, after setting ELEVENTY_SKIP_ESM_RESOLVER:
 * Eleventy otherwise registers an ES-module resolve hook (for its watch
 * mode's cache busting), which on Node 20 sends every later import of the
 * process through a hooks thread. waferbook never watches, so it opts out
 * (the variable is Eleventy's own switch for this).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import type { SiteMeta, waferPageExtras } from "../publish/siteModel.ts";
import { siteRoot, siteUrl } from "../publish/siteUrl.ts";
import { countText } from "../model/format.ts";
import { PACKAGE_ROOT } from "./paths.ts";
import type { PageModel } from "./waferPages.ts";

/** Where a drawn page's model waits for rendering. */
export function parkedPath(scratchDir: string, folder: string): string {
  return path.join(scratchDir, `${encodeURIComponent(folder)}.v8`);
}

type PageExtras = ReturnType<typeof waferPageExtras> extends Map<string, infer E> ? E : never;

/**
 * Wafer pages rendered per Eleventy run: bounds memory (about 0.5 MB per page)
 * against the run's fixed cost (~0.1 s). WAFERBOOK_PAGES_PER_RENDER=n changes
 * it (tests use a small n to exercise batching on a few wafers).
 */
export const PAGES_PER_RENDER = Number(process.env.WAFERBOOK_PAGES_PER_RENDER) > 0 ? Number(process.env.WAFERBOOK_PAGES_PER_RENDER) : 40;

/** The wafer pages of `folders` as the templates read them: each drawn model with what the page shows beside it. */
export async function waferPageBatch(
  folders: readonly string[],
  scratchDir: string,
  extras: ReadonlyMap<string, PageExtras>,
  fingerprints: ReadonlyMap<string, string>,
) {
  const batch = [];
  for (const folder of folders) {
    const model = v8.deserialize(await fs.readFile(parkedPath(scratchDir, folder))) as PageModel;
    batch.push({ ...model, ...extras.get(folder)!, fingerprint: fingerprints.get(folder) ?? "" });
  }
  return batch;
}

/** One Eleventy run's worth of wafer pages: the folders (in order) and what their pages show beside the drawn model. */
export interface RenderBatch {
  folders: string[];
  meta: SiteMeta;
  extras: Map<string, PageExtras>;
  fingerprints: Map<string, string>;
}

/** `folders` cut into batches of PAGES_PER_RENDER, each with its own part of `extras` and `fingerprints` (a batch is plain data: it can be posted to a worker). */
export function renderBatches(
  folders: readonly string[],
  meta: SiteMeta,
  extras: ReadonlyMap<string, PageExtras>,
  fingerprints: ReadonlyMap<string, string>,
  size = PAGES_PER_RENDER,
): RenderBatch[] {
  const batches: RenderBatch[] = [];
  for (let k = 0; k < folders.length; k += size) {
    const part = folders.slice(k, k + size);
    batches.push({
      folders: part,
      meta,
      extras: new Map(part.map((f) => [f, extras.get(f)!])),
      fingerprints: new Map(part.map((f) => [f, fingerprints.get(f) ?? ""])),
    });
  }
  return batches;
}

/** Renders the wafer pages of `folders` alone (no site-wide page) in one Eleventy run; returns the number of pages written. */
async function renderWaferPages(
  folders: readonly string[],
  outDir: string,
  scratchDir: string,
  meta: SiteMeta,
  extras: ReadonlyMap<string, PageExtras>,
  fingerprints: ReadonlyMap<string, string>,
): Promise<number> {
  const wafers = await waferPageBatch(folders, scratchDir, extras, fingerprints);
  return renderTemplates(path.join(PACKAGE_ROOT, "templates", "wafer.njk"), outDir, { meta, wafers });
}

/** The error of a wafer page that fails on its own, naming the wafer. */
function pageFailed(folder: string, e: unknown): Error {
  return new Error(`the page of wafers/${folder} could not be rendered: ${e instanceof Error ? e.message : String(e)}`, { cause: e });
}

/**
 * After a run of several wafer pages failed (an Eleventy error need not say which page it was
 * rendering): renders `folders` one at a time, in order, and returns an error naming the first
 * wafer whose page fails alone; undefined when none does (the failure was the run's, not a page's).
 * Only on a failing build: the pages written meanwhile go to the build's temporary folder, which
 * is removed.
 */
async function firstFailingPage(folders: readonly string[], renderOne: (folder: string) => Promise<unknown>): Promise<Error | undefined> {
  for (const folder of folders) {
    try {
      await renderOne(folder);
    } catch (e) {
      return pageFailed(folder, e);
    }
  }
  return undefined;
}

/**
 * Renders one batch of drawn wafer pages (in the main thread or a worker: waferJob.ts); returns the number of pages written.
 * When the batch fails, the error names the wafer whose page fails (firstFailingPage), whichever thread renders it.
 */
export async function renderWaferBatch(batch: RenderBatch, outDir: string, scratchDir: string): Promise<number> {
  const run = (folders: readonly string[]) => renderWaferPages(folders, outDir, scratchDir, batch.meta, batch.extras, batch.fingerprints);
  try {
    return await run(batch.folders);
  } catch (e) {
    if (batch.folders.length === 1) throw pageFailed(batch.folders[0], e);
    throw (await firstFailingPage(batch.folders, (f) => run([f]))) ?? e;
  }
}

/**
 * Renders the site: the site-wide pages from `model`, and the drawn wafer
 * pages of `folders`. A few wafer pages (a warm build) go with the site-wide
 * pages in one Eleventy run; more are rendered in batches of PAGES_PER_RENDER,
 * by `elsewhere` when given (a worker thread: workerPool.ts renderer) while this thread renders the site-wide pages, else here one
 * after the other. Every page is the same whichever thread renders it: a page
 * depends only on its own model and extras. Returns the pages written.
 */
export async function renderSite(
  model: object,
  folders: readonly string[],
  outDir: string,
  scratchDir: string,
  meta: SiteMeta,
  extras: ReadonlyMap<string, PageExtras>,
  fingerprints: ReadonlyMap<string, string>,
  elsewhere?: (batch: RenderBatch) => Promise<number>,
): Promise<number> {
  const templates = path.join(PACKAGE_ROOT, "templates");
  if (folders.length <= PAGES_PER_RENDER) {
    try {
      return await renderTemplates(templates, outDir, { ...model, wafers: await waferPageBatch(folders, scratchDir, extras, fingerprints) });
    } catch (e) {
      // Name the wafer when its page is what failed; else the failure is a site-wide page's, reported as it is.
      throw (await firstFailingPage(folders, (f) => renderWaferPages([f], outDir, scratchDir, meta, extras, fingerprints))) ?? e;
    }
  }
  // Half batches elsewhere: that worker's heap follows its batch, and the site-wide pages here take a while anyway.
  const batches = renderBatches(folders, meta, extras, fingerprints, elsewhere ? Math.ceil(PAGES_PER_RENDER / 2) : PAGES_PER_RENDER);
  const away = elsewhere ? Promise.all(batches.map(elsewhere)) : undefined;
  // Reported by the await below, after the site-wide run (which may fail first: then the build fails with that).
  away?.catch(() => {});
  let written = await renderTemplates(templates, outDir, { ...model, wafers: [] });
  if (away) return written + (await away).reduce((a, b) => a + b, 0);
  for (const b of batches) {
    written += await renderWaferBatch(b, outDir, scratchDir);
  }
  return written;
}

type FilterThis = { page?: { url?: string | false; inputPath?: string } };

/** The page a filter runs for, as its URL path ("/wafers/TQ-2401/"); a page without one cannot hold links. */
function pageUrl(self: FilterThis): string {
  const url = self.page?.url;
  if (typeof url !== "string") throw new Error(`links need the page's URL, which ${self.page?.inputPath ?? "this template"} does not have`);
  return url;
}

/**
 * Runs Eleventy on templates/ (or one template of it) with `wb` as global data, into outDir; returns the number of files written.
 * Filters: `link` turns a path from the site root into the link a page writes (`{{ "runs/" | link }}`),
 * `siteRoot` gives the root for scripts that build links (`{{ page.url | siteRoot }}`; src/publish/siteUrl.ts),
 * `count` writes a count with its noun in the right number (`{{ n | count("wafer") }}` → "1 wafer", "2 wafers"; countText in src/model/format.ts).
 */
export async function renderTemplates(input: string, outDir: string, wb: unknown): Promise<number> {
  process.env.ELEVENTY_SKIP_ESM_RESOLVER ??= "1";
  const { Eleventy } = await import("@11ty/eleventy");
  const basePath = (wb as { meta?: { basePath?: string } }).meta?.basePath ?? "";
  const elev = new Eleventy(input, outDir, {
    source: "cli",
    quietMode: true,
    configPath: path.join(PACKAGE_ROOT, ".eleventy.js"),
    config(c: { addGlobalData: (name: string, value: unknown) => void; addFilter: (name: string, f: (this: FilterThis, ...args: never[]) => string) => void }) {
      c.addGlobalData("wb", wb);
      c.addFilter("link", function (this: FilterThis, target: string) {
        return siteUrl(target, pageUrl(this), basePath);
      });
      c.addFilter("siteRoot", (url: string) => siteRoot(url, basePath));
      c.addFilter("count", (n: number, singular: string, plural?: string) => countText(n, singular, plural));
    },
  });
  elev.disableLogger();
  const result = (await elev.write()) as unknown;
  // The result lists the passthrough copies and the templates written; count the pages.
  const pages = Array.isArray(result)
    ? (result as unknown[]).flat(3).filter((x) => typeof x === "object" && x !== null && "outputPath" in x && "content" in x).length
    : 0;
  // Every call has pages to write; none means Eleventy skipped the templates (it ignores node_modules/ unless told: .eleventy.js).
  if (pages === 0) throw new Error(`Eleventy wrote no page from ${input}`);
  return pages;
}
