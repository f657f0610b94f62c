/**
 * The slim form of an analysis (cache.ts slimAnalysis) must carry everything
 * judging and the site-wide outputs read: for demo wafers covering every
 * section (transport depth, XRD maps, depth profiles, lattice images, a broken
 * file, a one-sign sweep), results.json, points.csv, results.csv, the search
 * index entries and the site model built from the slim form equal those built
 * from the full analysis, while the slim form is much smaller.
 */
import path from "node:path";
import v8 from "node:v8";
import { describe, expect, it } from "vitest";
import { analyseFolder } from "../../src/cli/analyseFolder.ts";
import { slimAnalysis } from "../../src/cli/cache.ts";
import type { PipelineContext } from "../../src/cli/pipeline.ts";
import { judgeOutcome } from "../../src/judge/outcome.ts";
import { PACKAGE_ROOT } from "../../src/cli/paths.ts";
import { loadSiteInputs } from "../../src/validate/load/site.ts";
import { pointsCsv, resultsCsv } from "../../src/publish/exports.ts";
import { resultsJson } from "../../src/publish/resultsJson.ts";
import { buildSiteModel } from "../../src/publish/siteModel.ts";
import { searchDocuments } from "../../src/publish/searchIndex.ts";

const WAFERS = ["TQ-2401", "TQ-2403", "TQ-2404", "TQ-2406", "TQ-2501", "TQ-2505"];

describe("slim analysis", () => {
  it("gives the same judgement and site-wide outputs as the full analysis, at a fraction of the size", async () => {
    const dataDir = path.join(PACKAGE_ROOT, "data");
    const site = await loadSiteInputs(dataDir);
    const ctx: PipelineContext = {
      dataDir,
      today: "2026-06-01",
      siteSettings: site.settings,
      targets: site.targets,
      siteOverrides: site.settingOverrides,
      version: "test",
      sitewideErrors: [],
    };
    const full = [];
    const slim = [];
    for (const folder of WAFERS) {
      const r = await analyseFolder(folder, { dataDir, today: ctx.today, siteSettings: site.settings, cacheDir: null, code: "" });
      const analysis = r.entry.analysis!;
      const thin = slimAnalysis(analysis);
      // The slim form drops the bulk arrays: well under a quarter of the full size for every wafer (common practice: measured, not a published figure).
      expect(v8.serialize(thin).length).toBeLessThan(0.25 * v8.serialize(analysis).length);
      full.push(judgeOutcome(r.entry, analysis, ctx));
      slim.push(judgeOutcome(r.entry, thin, ctx));
    }
    for (let i = 0; i < WAFERS.length; i++) {
      expect(slim[i].judgement, WAFERS[i]).toEqual(full[i].judgement);
      expect(slim[i].values, WAFERS[i]).toEqual(full[i].values);
      expect(JSON.stringify(resultsJson(slim[i], { wafer: "abc", targets: "def" })), WAFERS[i]).toBe(
        JSON.stringify(resultsJson(full[i], { wafer: "abc", targets: "def" })),
      );
      expect(pointsCsv(slim[i]), WAFERS[i]).toBe(pointsCsv(full[i]));
    }
    expect(resultsCsv(slim, site.runs)).toBe(resultsCsv(full, site.runs));
    expect(searchDocuments(slim, site.runs)).toEqual(searchDocuments(full, site.runs));
    const meta = { title: "t", version: "test", builtAt: "then", basePath: "/" };
    expect(JSON.stringify(buildSiteModel(slim, site.runs, [], meta, { targets: site.targets }))).toBe(
      JSON.stringify(buildSiteModel(full, site.runs, [], meta, { targets: site.targets })),
    );
  }, 120_000);
});
