/**
 * Lean per-wafer data of the comparison page (compare/?w=…), written beside
 * the wafer page as wafers/<id>/compare.js: a script that adds the wafer to
 * `window.waferbookCompare`, not a JSON file, because a page opened from disk
 * (file://) may load scripts but not fetch files. It holds what the page sets
 * side by side: metrics with unit and verdict, Hall points, gate calibrations,
 * Ge depth profiles (downsampled), the layer stack and the growth conditions.
 * Made where the page is drawn (src/cli/waferPages.ts), from the full
 * analysis, so it depends only on the wafer's outcome like the page.
 */
import type { WaferOutcome } from "../judge/outcome.ts";
import { PER_M2_TO_PER_CM2, M2_PER_VS_TO_CM2_PER_VS } from "../physics/constants.ts";
import { formatNumber, formatValue, prettyUnit, sig6OrNull } from "../model/format.ts";
import { round, traceSeries } from "./charts.ts";
import { growthVariables } from "../validate/growth.ts";

/** Depths kept per profile in the comparison (the wafer page keeps more). */
const PROFILE_POINTS = 250;

export function compareData(o: WaferOutcome) {
  const r = o.record;
  const devices = o.analysis?.devices ?? [];
  return {
    id: o.folder,
    run: r?.run ?? "",
    grown: r?.grown ?? "",
    grade: o.judgement.grade,
    reactor: r?.reactor ?? "",
    verdict: o.judgement.verdict,
    metrics: o.judgement.metrics
      .filter((m) => m.value !== undefined || m.target !== undefined)
      .map((m) => ({
        key: m.key,
        label: m.spec.label,
        unit: prettyUnit(m.spec.unit),
        digits: m.spec.digits,
        value: sig6OrNull(m.value),
        text: formatValue(m.value, m.spec),
        verdict: m.verdict,
      })),
    hall: devices
      .filter((d) => d.points.length)
      .map((d) => ({ device: d.id, points: d.points.map((p) => [round(p.density * PER_M2_TO_PER_CM2), round(p.mobility * M2_PER_VS_TO_CM2_PER_VS)]) })),
    calibrations: devices
      .filter((d) => d.points.length)
      .map((d) => {
        const f = d.summary?.gateFit;
        return {
          device: d.id,
          points: d.points.map((p) => [round(p.gate_V), round((p.density * PER_M2_TO_PER_CM2) / 1e11)]),
          fit: f
            ? {
                slope: round((f.slope * PER_M2_TO_PER_CM2) / 1e11),
                turnOn: round(f.turnOn),
                text: `dn/dVg ${formatNumber(f.slope * PER_M2_TO_PER_CM2, 3)} cm⁻²/V, turn-on ${formatNumber(f.turnOn, 3)} V`,
              }
            : null,
        };
      }),
    profiles: (o.analysis?.structure?.profiles ?? []).map((p) => ({
      file: p.data.file,
      method: p.data.method,
      points: traceSeries("", p.data.depth, p.data.ge, "data", PROFILE_POINTS).points,
    })),
    stack: (r?.stack ?? []).map((l) => ({ name: l.name, role: l.role, material: l.material ?? "", ge: l.ge ?? null, thickness_nm: l.thickness_nm ?? null })),
    growth: r?.growth
      ? {
          recipe: r.growth.recipe ?? "",
          values: growthVariables(r.growth).map((v) => ({ key: v.key, label: v.label, unit: v.unit, value: sig6OrNull(v.value) })),
        }
      : null,
  };
}

/** What wafers/<id>/compare.js holds around the wafer's JSON (drawnPageCheck.ts reads it back against these). */
export function compareScriptFrame(folder: string): { before: string; after: string } {
  return { before: `(window.waferbookCompare = window.waferbookCompare || {})[${JSON.stringify(folder)}] = `, after: ";\n" };
}

/** The script text of wafers/<id>/compare.js. */
export function compareScript(o: WaferOutcome): string {
  // JSON is a JavaScript expression; "<" is escaped so the text is inert even if it were ever inlined.
  const json = JSON.stringify(compareData(o)).replace(/</g, "\\u003c");
  const { before, after } = compareScriptFrame(o.folder);
  return `${before}${json}${after}`;
}
