/**
 * results.json fields of the transport analyses in depth, in lab units: per
 * point (SdH density, mismatch, τ_t, l, k_F·l, τ_q) and per device (every fit
 * with its window, parameters, standard errors, R² and points, or its reason).
 */
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { PointDepth } from "../analyse/transport/deviceDepth.ts";
import { sig6OrNull } from "./format.ts";

const CM2 = 1e-4; // m⁻² → cm⁻²

/** v to `digits` significant digits, or null when missing or non-finite (for figures shown to fewer digits than sig6). */
function roundTo(v: number | undefined | null, digits: number): number | null {
  return v === undefined || v === null || !Number.isFinite(v) ? null : Number(v.toPrecision(digits));
}

/** Per-point fields (spread into the point's entry). */
export function pointDepthJson(d: DeviceAnalysis, file: string): Record<string, unknown> {
  const p: PointDepth | undefined = d.depth?.points.find((x) => x.file === file);
  if (!p) return {};
  return {
    sdh_density_per_cm2: p.sdh.ok ? sig6OrNull(p.sdh.density * CM2) : null,
    sdh_skipped: p.sdh.ok ? null : p.sdh.reason,
    sdh_frequency_T: p.sdh.ok ? sig6OrNull(p.sdh.frequency) : null,
    sdh_periods: p.sdh.ok ? roundTo(p.sdh.periods, 3) : null,
    hall_sdh_mismatch_percent: p.mismatch ? roundTo(p.mismatch.mismatchPercent, 4) : null,
    parallel_conduction: p.mismatch ? p.mismatch.parallelConduction : null,
    transport_lifetime_ps: p.derived.ok ? sig6OrNull(p.derived.transportLifetime * 1e12) : null,
    mean_free_path_um: p.derived.ok ? sig6OrNull(p.derived.meanFreePath * 1e6) : null,
    kf_l: p.derived.ok ? sig6OrNull(p.derived.kfl) : null,
    quantum_lifetime_ps: p.dingle.ok ? sig6OrNull(p.dingle.quantumLifetime * 1e12) : null,
    quantum_lifetime_skipped: p.dingle.ok ? null : p.dingle.reason,
    dingle_ratio: sig6OrNull(p.dingleRatio),
  };
}

/** Per-device `transport_depth` block, or null without depth analysis. */
export function deviceDepthJson(d: DeviceAnalysis): unknown {
  const x = d.depth;
  if (!x) return null;
  const c = x.calibration;
  const pc = x.percolation;
  const pl = x.powerLaw;
  const h = x.hysteresis;
  return {
    density_calibration: c.ok
      ? { method: "linear fit of Hall density against gate voltage", params: { capacitance_uF_per_cm2: sig6OrNull(c.capacitance * 100), turn_on_V: sig6OrNull(c.turnOnVoltage), slope_per_cm2_per_V: sig6OrNull(c.slope * CM2) }, errors: { capacitance_uF_per_cm2: sig6OrNull(c.capacitanceStdErr === null ? undefined : c.capacitanceStdErr * 100), turn_on_V: sig6OrNull(c.turnOnVoltageStdErr) }, r2: sig6OrNull(c.r2), points: c.points }
      : { skipped: c.reason },
    percolation: pc.ok
      ? { method: "σ = A·(n − n_p)^p, Levenberg–Marquardt", file: pc.file, window: { min_density_per_cm2: sig6OrNull(pc.window.minDensity * CM2), max_density_per_cm2: sig6OrNull(pc.window.maxDensity * CM2), rule: pc.window.rule }, params: { n_p_per_cm2: sig6OrNull(pc.density * CM2), A_S_m2p: sig6OrNull(pc.prefactor), p: sig6OrNull(pc.exponent) }, errors: { n_p_per_cm2: sig6OrNull(pc.densityStdErr * CM2), A_S_m2p: sig6OrNull(pc.prefactorStdErr), p: pc.exponentFixed ? null : sig6OrNull(pc.exponentStdErr) }, exponent_fixed: pc.exponentFixed, r2: sig6OrNull(pc.r2), points: pc.points, excluded_insulating: pc.excludedInsulating }
      : { skipped: pc.reason },
    gate_sweeps: x.gateSweeps.map((s) => ({ file: s.file, direction: s.direction, field_T: s.field_T, points: s.gateVoltage.length, percolation: s.percolation.ok ? { n_p_per_cm2: sig6OrNull(s.percolation.density * CM2), r2: sig6OrNull(s.percolation.r2) } : { skipped: s.percolation.reason } })),
    mobility_power_law: pl.ok
      ? { method: "least-squares line ln μ = α ln n + c", window: { min_density_per_cm2: sig6OrNull(pl.window.minDensity * CM2), max_density_per_cm2: sig6OrNull(pl.window.maxDensity * CM2), rule: pl.window.rule }, params: { alpha: sig6OrNull(pl.exponent), mobility_at_1e11_cm2_per_Vs: sig6OrNull(pl.mobilityAtReference * 1e4) }, errors: { alpha: sig6OrNull(pl.exponentStdErr) }, r2: sig6OrNull(pl.r2), points: pl.points }
      : { skipped: pl.reason },
    hysteresis: h.ok ? { up: h.up, down: h.down, mean_shift_V: sig6OrNull(h.meanShift), median_shift_V: sig6OrNull(h.medianShift), max_shift_V: sig6OrNull(h.maxShift), points: h.points } : { skipped: h.reason },
    quantum_lifetime: x.quantumLifetime.ok ? { median_ps: sig6OrNull(x.quantumLifetime.value * 1e12), points: x.quantumLifetime.points } : { skipped: x.quantumLifetime.reason },
    parallel_conduction_flagged: x.parallelConduction,
  };
}
