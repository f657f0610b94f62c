/**
 * Wafer pages, drawn one wafer at a time and rendered a batch at a time, so
 * the build's memory follows the largest wafer (and the batch size), not the
 * size of the archive:
 *   - `drawWaferPage` turns one wafer's full analysis into its page model as
 *     soon as that analysis is at hand (in the worker that analysed it),
 *     writes the page's pictures (PNG files) into the output being built, and
 *     parks the rest of the model (strings: chart data, SVG figures, tables)
 *     in a scratch folder beside it;
 *   - `renderWaferPages` reads the parked models back PAGES_PER_RENDER at a time, adds
 *     what each page shows beside the wafer (neighbours, breadcrumbs, history,
 *     fingerprint) and renders the batch with Eleventy from templates/wafer.njk
 *     alone; the site-wide pages are rendered once, separately (build.ts).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import { Eleventy } from "@11ty/eleventy";
import type { WaferOutcome } from "./pipeline.ts";
import { waferPageModel } from "../publish/waferPage.ts";
import type { SiteMeta, waferPageExtras } from "../publish/siteModel.ts";
import { PACKAGE_ROOT } from "./paths.ts";

type PageModel = ReturnType<typeof waferPageModel>;
type PageExtras = ReturnType<typeof waferPageExtras> extends Map<string, infer E> ? E : never;

/** Wafer pages rendered per Eleventy run: bounds memory (about 0.5 MB per page) against the run's fixed cost (~0.1 s). */
export const PAGES_PER_RENDER = 40;

/** Where a drawn page's model waits for rendering. */
function parkedPath(scratchDir: string, folder: string): string {
  return path.join(scratchDir, `${encodeURIComponent(folder)}.v8`);
}

/**
 * Draws one wafer's page from its outcome with the full analysis: writes the
 * page's pictures into the output being built and parks the rest of the model
 * in the scratch folder. Runs in a worker or in the main thread.
 */
export async function drawWaferPage(o: WaferOutcome, outDir: string, scratchDir: string): Promise<void> {
  const model = waferPageModel(o);
  for (const section of [model.transportDepth, model.structure, model.images] as ({ files?: { path: string; bytes: Buffer }[] } | undefined)[]) {
    for (const f of section?.files ?? []) {
      const parts = f.path.split("/");
      if (parts[0] !== "wafers" || parts[1] !== o.folder || parts.includes("..")) throw new Error(`section file outside its wafer folder: ${f.path}`);
      await fs.mkdir(path.dirname(path.join(outDir, ...parts)), { recursive: true });
      await fs.writeFile(path.join(outDir, ...parts), f.bytes);
    }
    if (section?.files) section.files = [];
  }
  await fs.mkdir(scratchDir, { recursive: true });
  await fs.writeFile(parkedPath(scratchDir, o.folder), v8.serialize(model));
}

/** The wafer pages of `folders` as the templates read them: each drawn model with what the page shows beside it. */
export async function waferPageBatch(folders: readonly string[], scratchDir: string, extras: ReadonlyMap<string, PageExtras>, fingerprints: ReadonlyMap<string, string>) {
  const batch = [];
  for (const folder of folders) {
    const model = v8.deserialize(await fs.readFile(parkedPath(scratchDir, folder))) as PageModel;
    batch.push({ ...model, ...extras.get(folder)!, fingerprint: fingerprints.get(folder) ?? "" });
  }
  return batch;
}

/**
 * Renders the drawn pages of `folders` (in that order), PAGES_PER_RENDER per
 * Eleventy run; returns the number of pages written.
 */
export async function renderWaferPages(folders: readonly string[], outDir: string, scratchDir: string, meta: SiteMeta, extras: ReadonlyMap<string, PageExtras>, fingerprints: ReadonlyMap<string, string>): Promise<number> {
  let written = 0;
  for (let k = 0; k < folders.length; k += PAGES_PER_RENDER) {
    const wafers = await waferPageBatch(folders.slice(k, k + PAGES_PER_RENDER), scratchDir, extras, fingerprints);
    written += await renderTemplates(path.join(PACKAGE_ROOT, "templates", "wafer.njk"), outDir, { meta, wafers });
  }
  return written;
}

/** Runs Eleventy on templates/ (or one template of it) with `wb` as global data, into outDir; returns the number of files written. */
export async function renderTemplates(input: string, outDir: string, wb: unknown): Promise<number> {
  const elev = new Eleventy(input, outDir, {
    source: "cli",
    quietMode: true,
    configPath: path.join(PACKAGE_ROOT, ".eleventy.js"),
    config(c: { addGlobalData: (name: string, value: unknown) => void }) {
      c.addGlobalData("wb", wb);
    },
  });
  elev.disableLogger();
  const result = (await elev.write()) as unknown;
  // The result lists the passthrough copies and the templates written; count the pages.
  return Array.isArray(result) ? (result as unknown[]).flat(3).filter((x) => typeof x === "object" && x !== null && "outputPath" in x && "content" in x).length : 0;
}
