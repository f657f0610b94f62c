/**
 * Wafer pages, drawn one wafer at a time and rendered a batch at a time, so
 * the build's memory follows the largest wafer (and the batch size), not the
 * size of the archive:
 *   - `drawWaferPage` turns one wafer's full analysis into its page model as
 *     soon as that analysis is at hand (in the worker that analysed it),
 *     writes the page's pictures (PNG files) into the output being built, and
 *     parks the rest of the model (strings: chart data, SVG figures, tables)
 *     in a scratch folder beside it;
 *   - `renderSite` (render.ts) reads the parked models back PAGES_PER_RENDER at a time, adds
 *     what each page shows beside the wafer (neighbours, breadcrumbs, history,
 *     fingerprint) and renders the batch with Eleventy from templates/wafer.njk
 *     alone; the site-wide pages are rendered once, separately (build.ts).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import type { WaferOutcome } from "../judge/outcome.ts";
import { waferPageModel } from "../publish/waferPage.ts";
import { parkedPath } from "./render.ts";
import { compareScript } from "../publish/compareData.ts";

export type PageModel = ReturnType<typeof waferPageModel>;

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
  // The comparison page's lean data of this wafer (src/publish/compareData.ts), beside its page.
  await fs.mkdir(path.join(outDir, "wafers", o.folder), { recursive: true });
  await fs.writeFile(path.join(outDir, "wafers", o.folder, "compare.js"), compareScript(o));
  await fs.mkdir(scratchDir, { recursive: true });
  await fs.writeFile(parkedPath(scratchDir, o.folder), v8.serialize(withoutChartData(model)));
}

/**
 * The model as the templates read it: the charts' series (their points) go,
 * since the page carries them in `chartsJson` alone (the chart macro writes a
 * chart's id, title, views' labels and captions and summary: templates/_includes/macros.njk).
 * The series are three quarters of a parked model's memory once read back
 * (about 3.6 MB of heap per page of the benchmark, 0.9 MB without), so a
 * render batch holds a quarter of it.
 */
export function withoutChartData(model: PageModel): PageModel {
  for (const c of model.charts) {
    c.series = [];
    for (const v of c.views ?? []) v.series = [];
  }
  return model;
}
