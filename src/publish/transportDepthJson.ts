/**
 * results.json fields of the transport analyses in depth, in lab units: per
 * point (SdH density and τ_q from the oscillation fit with standard errors,
 * or why not determined; mismatch, τ_t, l, k_F·l, τ_t/τ_q) and per device (every fit
 * with its window, parameters, standard errors, R² and points, or its reason).
 */
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { PointDepth } from "../analyse/transport/deviceDepth.ts";
import { sig6OrNull } from "../model/format.ts";

const CM2 = 1e-4; // m⁻² → cm⁻²

/** v to `digits` significant digits, or null when missing or non-finite (for figures shown to fewer digits than sig6). */
function roundTo(v: number | undefined | null, digits: number): number | null {
  return v === undefined || v === null || !Number.isFinite(v) ? null : Number(v.toPrecision(digits));
}

/** Per-point fields (spread into the point's entry). */
export function pointDepthJson(d: DeviceAnalysis, file: string): Record<string, unknown> {
  const p: PointDepth | undefined = d.depth?.points.find((x) => x.file === file);
  if (!p) return {};
  const o = p.oscillation;
  const tq = o.ok ? o.quantumLifetime : null;
  return {
    sdh_density_per_cm2: o.ok ? sig6OrNull(o.density.value * CM2) : null,
    sdh_density_stderr_per_cm2: o.ok ? roundTo(o.density.stdErr * CM2, 3) : null,
    sdh_skipped: o.ok ? null : o.reason,
    sdh_frequency_T: o.ok ? sig6OrNull(o.frequency.value) : null,
    sdh_periods: o.ok ? roundTo(o.periods, 3) : null,
    oscillation_fit: o.ok
      ? { r2: roundTo(o.r2, 6), residual_noise_ohm: roundTo(o.residualNoise, 4), residual_noise_relative: roundTo(o.residualNoiseRelative, 3), points: o.points, field_range_T: o.fieldRange.map((b) => sig6OrNull(b)), amplitude_factor: roundTo(o.amplitudeFactor.value, 4), amplitude_factor_stderr: o.amplitudeFactor.fixed ? null : roundTo(o.amplitudeFactor.stdErr, 3), phase_rad: roundTo(o.phase.value, 4), background_order: o.background.order, spin_splitting: o.spinSplitting?.note ?? null }
      : null,
    hall_sdh_mismatch_percent: p.mismatch ? roundTo(p.mismatch.mismatchPercent, 4) : null,
    hall_sdh_mismatch_stderr_percent: p.mismatch ? roundTo(p.mismatch.stdErrPercent, 3) : null,
    parallel_conduction: p.mismatch ? p.mismatch.parallelConduction : null,
    transport_lifetime_ps: p.derived.ok ? sig6OrNull(p.derived.transportLifetime * 1e12) : null,
    mean_free_path_um: p.derived.ok ? sig6OrNull(p.derived.meanFreePath * 1e6) : null,
    kf_l: p.derived.ok ? sig6OrNull(p.derived.kfl) : null,
    quantum_lifetime_ps: tq?.ok ? sig6OrNull(tq.value * 1e12) : null,
    quantum_lifetime_stderr_ps: tq?.ok ? roundTo(tq.stdErr * 1e12, 3) : null,
    quantum_lifetime_skipped: tq ? (tq.ok ? null : tq.reason) : o.ok ? null : o.reason,
    scattering_time_ratio: sig6OrNull(p.scatteringTimeRatio),
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
    quantum_lifetime: x.quantumLifetime.ok ? { method: "least-squares fit of the Lifshitz–Kosevich form, median over the points where τ_q is determined", median_ps: sig6OrNull(x.quantumLifetime.value * 1e12), points: x.quantumLifetime.points } : { skipped: x.quantumLifetime.reason },
    scattering_time_ratio: x.scatteringTimeRatio.ok ? { median: sig6OrNull(x.scatteringTimeRatio.value), points: x.scatteringTimeRatio.points } : { skipped: x.scatteringTimeRatio.reason },
    parallel_conduction_flagged: x.parallelConduction,
  };
}
