/**
 * The per-wafer pipeline's context: what loading a wafer needs (src/validate/load/wafer.ts) and
 * what judging it needs (src/judge/outcome.ts). The outcome itself (WaferOutcome, judgeOutcome)
 * lives in src/judge/outcome.ts.
 */
import type { LoadContext } from "../validate/load/wafer.ts";
import type { OutcomeContext } from "../judge/outcome.ts";
import { countText } from "../model/format.ts";
import type { SiteInputs } from "../validate/load/site.ts";

export interface PipelineContext extends LoadContext, OutcomeContext {}

/** The context of a build (whole or one shard) from the site's inputs: settings, targets and their overrides. */
export function pipelineContext(dataDir: string, site: SiteInputs, today: string, version: string): PipelineContext {
  return { dataDir, today, siteSettings: site.settings, targets: site.targets, siteOverrides: site.settingOverrides, version, sitewideErrors: [] };
}

/** Why nothing was built: the site-wide input errors, listed above the summary. */
export function sitewideReason(errors: number): string {
  return `${countText(errors, "site-wide input error")} (listed above)`;
}
