/**
 * The per-wafer pipeline: read → validate → analyse → judge. One wafer at a
 * time, each independent: a broken wafer yields an `error` outcome with its
 * problems and never stops the others.
 */
import type { WaferAnalysis } from "../analyse/wafer.ts";
import { judgeWafer, type MetricValues, type WaferJudgement } from "../judge/verdict.ts";
import type { LoadContext, LoadedWafer, RawFileInfo } from "../validate/load/wafer.ts";
import { findingChecks } from "../judge/findings.ts";
import { capProblem, formatProblem, type Problem } from "../model/problem.ts";
import type { WaferRecord } from "../validate/wafer.ts";
import type { Targets } from "../validate/targets.ts";
import { SETTING_SPECS } from "../validate/settings.ts";
import { sig6 } from "../model/format.ts";
import { uniformityMetrics } from "../analyse/uniformityMetrics.ts";

export interface Provenance {
  files: RawFileInfo[];
  /** Settings in force, in the units they are documented in, with where each came from. */
  settings: { key: string; value: string; source: "default" | "site" | "wafer" }[];
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

export function metricValues(analysis: WaferAnalysis): Record<string, MetricValues> {
  const values: Record<string, MetricValues> = {};
  for (const d of analysis.devices) {
    for (const [k, v] of Object.entries(d.metrics)) {
      (values[k] ??= { perDevice: {} }).perDevice[d.id] = v;
    }
  }
  for (const section of [analysis.structure, analysis.images]) {
    for (const [k, v] of Object.entries(section?.metrics ?? {})) (values[k] ??= { perDevice: {} }).wafer = v;
  }
  for (const [k, v] of Object.entries(uniformityMetrics(analysis.devices))) (values[k] ??= { perDevice: {} }).wafer = v;
  return values;
}

function settingsProvenance(record: WaferRecord | undefined, siteOverrides: Record<string, unknown>): Provenance["settings"] {
  if (!record) return [];
  return Object.keys(SETTING_SPECS).map((key) => {
    const spec = SETTING_SPECS[key as keyof typeof SETTING_SPECS];
    const v = record.settings[key as keyof typeof record.settings];
    let text: string;
    if (v === null) text = "derived from the data";
    else if (Array.isArray(v)) text = v.map((x) => `${(x / ("si" in spec ? spec.si : 1)).toPrecision(3)} ${"unit" in spec ? spec.unit : ""}`).join(" … ");
    else if (typeof v === "number") text = "unit" in spec ? `${sig6(v / spec.si)} ${spec.unit}` : String(v);
    else text = String(v);
    const source = key in record.settingOverrides ? "wafer" : key in siteOverrides ? "site" : "default";
    return { key, value: text, source };
  });
}

export interface PipelineContext extends LoadContext {
  targets?: Targets;
  siteOverrides: Record<string, unknown>;
  version: string;
  /** Problems outside any wafer that make every wafer's verdict unreliable (e.g. targets.yaml broken). */
  sitewideErrors: Problem[];
}

export function judgeOutcome(loaded: Pick<LoadedWafer, "folder" | "record" | "problems" | "files">, analysis: WaferAnalysis | undefined, ctx: PipelineContext): WaferOutcome {
  const problems = [...loaded.problems];
  const record = loaded.record;
  const values = analysis ? metricValues(analysis) : {};
  const grade = record?.grade ?? ctx.targets?.defaultGrade ?? "—";
  if (record && ctx.targets && !(grade in ctx.targets.grades)) {
    problems.push({ severity: "error", wafer: loaded.folder, file: record.file, field: "grade", message: "unknown grade", expected: Object.keys(ctx.targets.grades).join(", "), found: JSON.stringify(grade), fix: "use a grade defined in targets.yaml" });
  }
  const capped = problems.map(capProblem);
  const errors = [...capped.filter((p) => p.severity === "error"), ...ctx.sitewideErrors];
  const targets = ctx.targets ?? { defaultGrade: grade, grades: {}, findings: {}, file: "targets.yaml" };
  const judgement = judgeWafer(values, grade, targets, record?.waivers ?? [], errors.length > 0, errors.map((p) => `input error: ${formatProblem(p)}`), findingChecks(analysis));
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

