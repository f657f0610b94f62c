/**
 * Small hand-made wafer outcomes for export and site-model tests: a record, per-device values
 * (metric units), the gate-fit standard errors a device summary carries (SI), and the judgement
 * made by the real verdict code under the given targets. Only the fields the exports read are filled.
 */
import * as yaml from "js-yaml";
import type { WaferOutcome } from "../../src/judge/outcome.ts";
import { judgeWafer, type MetricValues } from "../../src/judge/verdict.ts";
import { validateTargets, type Targets } from "../../src/validate/targets.ts";
import type { Decision } from "../../src/validate/decision.ts";

export function targetsFrom(text: string): Targets {
  return validateTargets(yaml.load(text), "targets.yaml", text);
}

export interface OutcomeSpec {
  id: string;
  grown?: string;
  grade?: string;
  reactor?: string;
  /** Device id → metric key → value in the metric's unit. */
  devices: Record<string, Record<string, number>>;
  /** Device id → gate fit standard errors, SI (slope m⁻²/V, turn-on V). */
  gateFitErr?: Record<string, { slope: number; turnOn: number }>;
  decision?: Decision;
  error?: boolean;
  /** Wafer-level values (metric units), as structure figures are measured once per wafer. */
  wafer?: Record<string, number>;
  /** Metric key → the analysis's reason the value is shown but not judged (MetricValues.notJudged). */
  notJudged?: Record<string, string>;
}

export function makeOutcome(s: OutcomeSpec, targets: Targets): WaferOutcome {
  const values: Record<string, MetricValues> = {};
  for (const [dev, ms] of Object.entries(s.devices))
    for (const [k, v] of Object.entries(ms)) {
      values[k] ??= { perDevice: {} };
      values[k].perDevice[dev] = v;
    }
  for (const [k, v] of Object.entries(s.wafer ?? {})) {
    values[k] ??= { perDevice: {} };
    values[k].wafer = v;
  }
  for (const [k, why] of Object.entries(s.notJudged ?? {})) if (values[k]) values[k].notJudged = why;
  const grade = s.grade ?? targets.defaultGrade;
  const devices = Object.keys(s.devices).map((id) => {
    const e = s.gateFitErr?.[id];
    return {
      id,
      geometry: "hall-bar",
      points: [],
      gateSweeps: [],
      skipped: [],
      metrics: s.devices[id],
      summary: e ? { gateFit: { slope: 0, slopeStdErr: e.slope, turnOn: 0, turnOnStdErr: e.turnOn, r2: 1, points: 5 } } : undefined,
    };
  });
  return {
    folder: s.id,
    record: {
      wafer: s.id,
      run: "R1",
      grown: s.grown ?? "2025-01-01",
      grade: s.grade,
      reactor: s.reactor,
      stack: [],
      devices: [],
      images: [],
      waivers: [],
      decision: s.decision,
      settings: {},
      settingOverrides: {},
      notes: "",
      file: `wafers/${s.id}/wafer.md`,
    },
    analysis: { devices },
    values,
    judgement: judgeWafer(values, grade, targets, [], s.error ?? false, s.error ? ["broken file"] : []),
    problems: [],
    provenance: { files: [], settings: [], waferbookVersion: "test" },
  } as unknown as WaferOutcome;
}
