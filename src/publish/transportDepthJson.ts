/**
 * results.json fields of the transport analyses in depth, in lab units: per
 * point (SdH density, mismatch, τ_t, l, k_F·l, τ_q) and per device (every fit
 * with its window, parameters, standard errors, R² and points, or its reason).
 */
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { PointDepth } from "../analyse/transport/deviceDepth.ts";

const CM2 = 1e-4; // m⁻² → cm⁻²

function r(v: number | undefined | null, digits = 6): number | null {
  return v === undefined || v === null || !Number.isFinite(v) ? null : Number(v.toPrecision(digits));
}

/** Per-point fields (spread into the point's entry). */
export function pointDepthJson(d: DeviceAnalysis, file: string): Record<string, unknown> {
  const p: PointDepth | undefined = d.depth?.points.find((x) => x.file === file);
  if (!p) return {};
  return {
    sdh_density_per_cm2: p.sdh.ok ? r(p.sdh.density * CM2) : null,
    sdh_skipped: p.sdh.ok ? null : p.sdh.reason,
    sdh_frequency_T: p.sdh.ok ? r(p.sdh.frequency) : null,
    sdh_periods: p.sdh.ok ? r(p.sdh.periods, 3) : null,
    hall_sdh_mismatch_percent: p.mismatch ? r(p.mismatch.mismatchPercent, 4) : null,
    parallel_conduction: p.mismatch ? p.mismatch.parallelConduction : null,
    transport_lifetime_ps: p.derived.ok ? r(p.derived.transportLifetime * 1e12) : null,
    mean_free_path_um: p.derived.ok ? r(p.derived.meanFreePath * 1e6) : null,
    kf_l: p.derived.ok ? r(p.derived.kfl) : null,
    quantum_lifetime_ps: p.dingle.ok ? r(p.dingle.quantumLifetime * 1e12) : null,
    quantum_lifetime_skipped: p.dingle.ok ? null : p.dingle.reason,
    dingle_ratio: r(p.dingleRatio),
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
      ? { method: "linear fit of Hall density against gate voltage", params: { capacitance_uF_per_cm2: r(c.capacitance * 100), turn_on_V: r(c.turnOnVoltage), slope_per_cm2_per_V: r(c.slope * CM2) }, errors: { capacitance_uF_per_cm2: r(c.capacitanceStdErr === null ? undefined : c.capacitanceStdErr * 100), turn_on_V: r(c.turnOnVoltageStdErr) }, r2: r(c.r2), points: c.points }
      : { skipped: c.reason },
    percolation: pc.ok
      ? { method: "σ = A·(n − n_p)^p, Levenberg–Marquardt", file: pc.file, window: { min_density_per_cm2: r(pc.window.minDensity * CM2), max_density_per_cm2: r(pc.window.maxDensity * CM2), rule: pc.window.rule }, params: { n_p_per_cm2: r(pc.density * CM2), A_S_m2p: r(pc.prefactor), p: r(pc.exponent) }, errors: { n_p_per_cm2: r(pc.densityStdErr * CM2), A_S_m2p: r(pc.prefactorStdErr), p: pc.exponentFixed ? null : r(pc.exponentStdErr) }, exponent_fixed: pc.exponentFixed, r2: r(pc.r2), points: pc.points, excluded_insulating: pc.excludedInsulating }
      : { skipped: pc.reason },
    gate_sweeps: x.gateSweeps.map((s) => ({ file: s.file, direction: s.direction, field_T: s.field_T, points: s.gateVoltage.length, percolation: s.percolation.ok ? { n_p_per_cm2: r(s.percolation.density * CM2), r2: r(s.percolation.r2) } : { skipped: s.percolation.reason } })),
    mobility_power_law: pl.ok
      ? { method: "least-squares line ln μ = α ln n + c", window: { min_density_per_cm2: r(pl.window.minDensity * CM2), max_density_per_cm2: r(pl.window.maxDensity * CM2), rule: pl.window.rule }, params: { alpha: r(pl.exponent), mobility_at_1e11_cm2_per_Vs: r(pl.mobilityAtReference * 1e4) }, errors: { alpha: r(pl.exponentStdErr) }, r2: r(pl.r2), points: pl.points }
      : { skipped: pl.reason },
    hysteresis: h.ok ? { up: h.up, down: h.down, mean_shift_V: r(h.meanShift), median_shift_V: r(h.medianShift), max_shift_V: r(h.maxShift), points: h.points } : { skipped: h.reason },
    quantum_lifetime: x.quantumLifetime.ok ? { median_ps: r(x.quantumLifetime.value * 1e12), points: x.quantumLifetime.points } : { skipped: x.quantumLifetime.reason },
    parallel_conduction_flagged: x.parallelConduction,
  };
}
