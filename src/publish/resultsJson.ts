/**
 * One wafer's results.json: every judged metric with its target and verdict,
 * every device's Hall points and transport-depth figures, the structure
 * figures, the problems, and the provenance. Built from the slim outcome
 * (figures only), in the main thread, on every build.
 */
import { PER_M2_TO_PER_CM2, M2_PER_VS_TO_CM2_PER_VS } from "../physics/constants.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import { formatProblem } from "../model/problem.ts";
import { sig6OrNull } from "../model/format.ts";
import { decisionJson } from "./decisionSection.ts";
import { metricStdErrors } from "./metricStdErr.ts";
import { structureResults } from "./structureSection.ts";
import { deviceDepthJson, pointDepthJson } from "./transportDepthJson.ts";
import { growthJson } from "./exports.ts";

/**
 * One wafer's results.json. `commits`: the latest commit that changed the
 * wafer's folder and the latest that changed targets.yaml (null outside a
 * repository). Deliberately not the repository's HEAD: the file then changes
 * only when the wafer's figures, verdicts or history do, like its page.
 */
export function resultsJson(o: WaferOutcome, commits: { wafer: string | null; targets: string | null } = { wafer: null, targets: null }): unknown {
  const metrics: Record<string, unknown> = {};
  const se = metricStdErrors(o);
  for (const m of o.judgement.metrics) {
    metrics[m.key] = {
      value: sig6OrNull(m.value),
      stderr: sig6OrNull(se[m.key]),
      unit: m.spec.unit,
      verdict: m.verdict,
      target: m.target
        ? {
            min: sig6OrNull(m.target.min),
            max: sig6OrNull(m.target.max),
            text: m.target.text,
            guard: m.target.guardText ?? null,
            required: m.target.required,
            aggregate: m.target.aggregate,
          }
        : null,
      reason: m.reason ?? null,
      not_judged: m.notJudged ?? null,
      waiver: m.waiver ?? null,
    };
  }
  return {
    wafer: o.folder,
    run: o.record?.run ?? null,
    grown: o.record?.grown ?? null,
    grade: o.judgement.grade,
    verdict: o.judgement.verdict,
    reasons: o.judgement.reasons,
    decision: decisionJson(o),
    growth: growthJson(o),
    metrics,
    findings: Object.fromEntries(
      o.judgement.findings.map((f) => [
        f.key,
        {
          verdict: f.verdict,
          consequence: f.consequence,
          consequence_from: f.fromGrade ? "grade" : "default",
          checked: f.check.checked,
          raised: f.check.raised,
          reason: f.reason ?? null,
          waiver: f.waiver ?? null,
        },
      ]),
    ),
    devices: (o.analysis?.devices ?? []).map((d) => ({
      id: d.id,
      geometry: d.geometry,
      at_mm: d.at_mm ?? null,
      points: d.points.map((p) => ({
        file: p.file,
        gate_V: sig6OrNull(p.gate_V),
        density_per_cm2: sig6OrNull(p.density * PER_M2_TO_PER_CM2),
        mobility_cm2_per_Vs: sig6OrNull(p.mobility * M2_PER_VS_TO_CM2_PER_VS),
        sheet_resistance_ohm_per_sq: sig6OrNull(p.sheetResistance),
        hall_fit_r2: sig6OrNull(p.hall.r2),
        hall_fit_poor: p.hall.poor,
        symmetrised: p.symmetrised,
        ...pointDepthJson(d, p.file),
      })),
      transport_depth: deviceDepthJson(d),
      skipped: d.skipped,
      metrics: Object.fromEntries(Object.entries(d.metrics).map(([k, v]) => [k, sig6OrNull(v)])),
    })),
    structure: structureResults(o),
    errors: o.problems.filter((p) => p.severity === "error").map(problemJson),
    warnings: o.problems.filter((p) => p.severity === "warning").map(problemJson),
    provenance: { ...o.provenance, waferCommit: commits.wafer, targetsCommit: commits.targets },
  };
}

function problemJson(p: WaferOutcome["problems"][number]) {
  return {
    file: p.file,
    line: p.line ?? null,
    field: p.field ?? null,
    message: p.message,
    expected: p.expected ?? null,
    found: p.found ?? null,
    fix: p.fix ?? null,
    text: formatProblem(p),
  };
}
