/**
 * Standard errors of the judged metric values, where the analysis has one, in each metric's unit —
 * for the exports (results.csv, results.json). Taken from the fits the analysis already made:
 *   gate_density_slope, turn_on_voltage  Hall-density line n(Vg), least-squares parameter errors
 *   gate_capacitance                      C = e·dn/dVg, the same fit's slope error × e
 *   percolation_density, mobility_exponent  the percolation and power-law fits
 *   ge_fraction, buffer_relaxation        X-ray peak positions propagated (bufferRelaxation.ts)
 *   well_strain                           well-peak or buffer a∥ error propagated (wellStrain.ts)
 *   well_thickness, interface_width_*     depth-profile sigmoid fits; image widths from the Z-contrast fit
 *   interface_inplane_mismatch, interface_outofplane_strain  GPA noise propagated (wellCoherence.ts)
 *   valley_splitting_*                    the profile fit's errors propagated (valleyUncertainty.ts)
 * Metrics without a fit error (peak values, medians, mismatches, CVs, the critical thickness) have none.
 *
 * A device metric judged as the mean of n devices gets SE = √(Σ SEᵢ²)/n (first-order propagation
 * for independent devices; GUM, JCGM 100:2008 §5.1, from memory), and only when every device has
 * one; judged as `min` or `max`, the SE of the device that gives the value.
 */
import type { WaferOutcome } from "../judge/outcome.ts";
import { toMetricUnit } from "../model/metrics.ts";

type DeviceOf = NonNullable<WaferOutcome["analysis"]>["devices"][number];

/** SI standard error of a device metric, or undefined. */
function deviceStdErr(d: DeviceOf, key: string): number | undefined {
  const fit = d.summary?.gateFit;
  const depth = d.depth;
  switch (key) {
    case "gate_density_slope":
      return fit?.slopeStdErr;
    case "turn_on_voltage":
      return fit?.turnOnStdErr;
    case "gate_capacitance":
      return depth?.calibration.ok ? (depth.calibration.capacitanceStdErr ?? undefined) : undefined;
    case "percolation_density":
      return depth?.percolation.ok ? depth.percolation.densityStdErr : undefined;
    case "mobility_exponent":
      return depth?.powerLaw.ok ? depth.powerLaw.exponentStdErr : undefined;
  }
  return undefined;
}

/** SI standard error of a wafer-level metric, or undefined. */
function waferStdErr(o: WaferOutcome, key: string): number | undefined {
  const s = o.analysis?.structure;
  const b = s?.xrd?.buffer.ok ? s.xrd.buffer : undefined;
  const strain = s?.xrd?.strain.ok ? s.xrd.strain : undefined;
  const prof = s?.profiles.find((p) => p.result.ok)?.result;
  const r = prof?.ok ? prof : undefined;
  const img = o.analysis?.images;
  const imgProfile = (k: string) => {
    const i = img?.metricSource[k];
    const p = i === undefined ? undefined : img!.images[i]?.profile;
    return p?.ok ? p : undefined;
  };
  switch (key) {
    case "ge_fraction":
      return b?.geFractionStdErr;
    case "buffer_relaxation":
      return b?.relaxationStdErr;
    case "well_strain":
      return strain?.epsParallelStdErr;
    case "well_thickness":
      return r ? r.wellThicknessStdErr * 1e-9 : undefined;
    case "interface_width_top":
      return r ? r.top.width10to90StdErr * 1e-9 : undefined;
    case "interface_width_bottom":
      return r ? r.bottom.width10to90StdErr * 1e-9 : undefined;
    case "interface_width_top_image":
      return imgProfile(key)?.top.width10to90StdErr_m;
    case "interface_width_bottom_image":
      return imgProfile(key)?.bottom.width10to90StdErr_m;
    case "interface_inplane_mismatch":
    case "interface_outofplane_strain": {
      const i = img?.metricSource[key];
      const c = i === undefined ? undefined : img!.images[i]?.coherence;
      if (!c?.ok) return undefined;
      return (key === "interface_inplane_mismatch" ? c.inPlaneMismatch_pct : c.outOfPlaneStrain_pct).uncertainty / 100;
    }
  }
  const v = s?.valley?.result.ok ? s.valley.result : undefined;
  if (v) {
    const byKey: Record<string, number> = {
      valley_splitting_mean: v.stdErr.mean,
      valley_splitting_p10: v.stdErr.p10,
      valley_splitting_deterministic: v.stdErr.deterministicSplitting,
      valley_splitting_disorder: v.stdErr.sigma,
      valley_splitting_yield: v.stdErr.yieldFraction,
    };
    if (key in byKey) return byKey[key];
  }
  return undefined;
}

const finite = (v: number | undefined | null): v is number => typeof v === "number" && Number.isFinite(v) && v >= 0;

/** Metric key → standard error of the judged value, in the metric's unit (only metrics that have one). */
export function metricStdErrors(o: WaferOutcome): Record<string, number> {
  const out: Record<string, number> = {};
  for (const m of o.judgement.metrics) {
    if (m.value === undefined) continue;
    const wafer = o.values[m.key]?.wafer;
    let si: number | undefined;
    if (wafer !== undefined) {
      si = waferStdErr(o, m.key);
    } else {
      const devices = (o.analysis?.devices ?? []).filter((d) => m.perDevice[d.id] !== undefined);
      const errs = devices.map((d) => deviceStdErr(d, m.key));
      if (devices.length === 0 || !errs.every(finite)) continue;
      const how = m.target?.aggregate ?? "mean";
      if (how === "min" || how === "max") {
        const vals = devices.map((d) => m.perDevice[d.id]);
        const pick = vals.indexOf(how === "min" ? Math.min(...vals) : Math.max(...vals));
        si = errs[pick];
      } else {
        si = Math.sqrt(errs.reduce((a, e) => a + e! * e!, 0)) / errs.length;
      }
    }
    if (!finite(si)) continue;
    const v = toMetricUnit(m.key, si);
    if (v !== undefined) out[m.key] = Math.abs(v);
  }
  return out;
}
