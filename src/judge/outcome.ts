/**
 * A wafer's outcome: its record, analysis, metric values, judgement, problems and provenance —
 * what the per-wafer pipeline (read → validate → analyse → judge, src/cli/waferJob.ts) hands to
 * publish. A broken wafer yields an `error` outcome with its problems and never stops the others.
 */
import type { WaferAnalysis } from "../analyse/wafer.ts";
import { judgeWafer, type MetricValues, type WaferJudgement } from "./verdict.ts";
import type { LoadedWafer } from "../validate/load/wafer.ts";
import type { RawFileInfo } from "../read/fileInfo.ts";
import { findingChecks } from "./findings.ts";
import { capProblem, formatProblem, type Problem } from "../model/problem.ts";
import type { WaferRecord } from "../validate/wafer.ts";
import type { Targets } from "../validate/targets.ts";
import { settingsProvenance, type SettingProvenance } from "../validate/settingsProvenance.ts";
import { unknownGradeProblem } from "../validate/grade.ts";
import { uniformityMetrics } from "../analyse/uniformityMetrics.ts";

export interface Provenance {
  files: RawFileInfo[];
  /** Settings in force, in the units they are documented in, with where each came from. */
  settings: SettingProvenance[];
  waferbookVersion: string;
}

export interface WaferOutcome {
  folder: string;
  record?: WaferRecord;
  analysis?: WaferAnalysis;
  values: Record<string, MetricValues>;
  judgement: WaferJudgement;
  problems: Problem[];
  provenance: Provenance;
}

/** The entry for metric `k`, created empty on first use. */
function slot(values: Record<string, MetricValues>, k: string): MetricValues {
  values[k] ??= { perDevice: {} };
  return values[k];
}

export function metricValues(analysis: WaferAnalysis): Record<string, MetricValues> {
  const values: Record<string, MetricValues> = {};
  for (const d of analysis.devices) {
    for (const [k, v] of Object.entries(d.metrics)) {
      slot(values, k).perDevice[d.id] = v;
    }
  }
  for (const section of [analysis.structure, analysis.images]) {
    for (const [k, v] of Object.entries(section?.metrics ?? {})) slot(values, k).wafer = v;
  }
  for (const [k, why] of Object.entries(analysis.structure?.notJudged ?? {})) if (values[k]) values[k].notJudged = why;
  for (const [k, v] of Object.entries(uniformityMetrics(analysis.devices))) slot(values, k).wafer = v;
  return values;
}

/** What judging a wafer needs beyond the wafer itself. */
export interface OutcomeContext {
  targets?: Targets;
  siteOverrides: Record<string, unknown>;
  version: string;
  /** Problems outside any wafer that make every wafer's verdict unreliable (e.g. targets.yaml broken). */
  sitewideErrors: Problem[];
}

export function judgeOutcome(
  loaded: Pick<LoadedWafer, "folder" | "record" | "problems" | "files">,
  analysis: WaferAnalysis | undefined,
  ctx: OutcomeContext,
): WaferOutcome {
  const problems = [...loaded.problems];
  const record = loaded.record;
  const values = analysis ? metricValues(analysis) : {};
  const grade = record?.grade ?? ctx.targets?.defaultGrade ?? "—";
  const gradeProblem = record && ctx.targets ? unknownGradeProblem(loaded.folder, record, grade, ctx.targets) : undefined;
  if (gradeProblem) problems.push(gradeProblem);
  const capped = problems.map(capProblem);
  const errors = [...capped.filter((p) => p.severity === "error"), ...ctx.sitewideErrors];
  const targets = ctx.targets ?? { defaultGrade: grade, grades: {}, findings: {}, file: "targets.yaml" };
  const judgement = judgeWafer(
    values,
    grade,
    targets,
    record?.waivers ?? [],
    errors.length > 0,
    errors.map((p) => `input error: ${formatProblem(p)}`),
    findingChecks(analysis),
  );
  return {
    folder: loaded.folder,
    record,
    analysis,
    values,
    judgement,
    problems: capped,
    provenance: { files: loaded.files, settings: settingsProvenance(record, ctx.siteOverrides), waferbookVersion: ctx.version },
  };
}
