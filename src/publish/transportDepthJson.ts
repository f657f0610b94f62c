/**
 * results.json fields of the transport analyses in depth, in lab units: per
 * point (SdH density and τ_q from the oscillation fit with standard errors,
 * or why not determined; mismatch, τ_t, l, k_F·l, τ_t/τ_q) and per device (every fit
 * with its window, parameters, standard errors, R² and points, or its reason).
 */
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { PointDepth } from "../analyse/transport/deviceDepth.ts";
import type { OscillationFit } from "../analyse/transport/oscillationFit.ts";
import { sig6OrNull } from "../model/format.ts";
import { F_PER_M2_TO_UF_PER_CM2, M2_PER_VS_TO_CM2_PER_VS, M_TO_UM, PER_M2_TO_PER_CM2 as CM2, S_TO_PS } from "../physics/constants.ts";

/** v to `digits` significant digits, or null when missing or non-finite (for figures shown to fewer digits than sig6). */
function roundTo(v: number | undefined | null, digits: number): number | null {
  return v === undefined || v === null || !Number.isFinite(v) ? null : Number(v.toPrecision(digits));
}

/** The `oscillation_fit` block of a point: quality and nuisance parameters of the fit. */
function oscillationFitJson(o: OscillationFit): Record<string, unknown> {
  return {
    r2: roundTo(o.r2, 6),
    residual_noise_ohm: roundTo(o.residualNoise, 4),
    residual_noise_relative: roundTo(o.residualNoiseRelative, 3),
    points: o.points,
    field_range_T: o.fieldRange.map((b) => sig6OrNull(b)),
    amplitude_factor: roundTo(o.amplitudeFactor.value, 4),
    amplitude_factor_stderr: o.amplitudeFactor.fixed ? null : roundTo(o.amplitudeFactor.stdErr, 3),
    phase_rad: roundTo(o.phase.value, 4),
    background_order: o.background.order,
    spin_splitting: o.spinSplitting?.note ?? null,
  };
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
    oscillation_fit: o.ok ? oscillationFitJson(o) : null,
    hall_sdh_mismatch_percent: p.mismatch ? roundTo(p.mismatch.mismatchPercent, 4) : null,
    hall_sdh_mismatch_stderr_percent: p.mismatch ? roundTo(p.mismatch.stdErrPercent, 3) : null,
    parallel_conduction: p.mismatch ? p.mismatch.parallelConduction : null,
    transport_lifetime_ps: p.derived.ok ? sig6OrNull(p.derived.transportLifetime * S_TO_PS) : null,
    mean_free_path_um: p.derived.ok ? sig6OrNull(p.derived.meanFreePath * M_TO_UM) : null,
    kf_l: p.derived.ok ? sig6OrNull(p.derived.kfl) : null,
    quantum_lifetime_ps: tq?.ok ? sig6OrNull(tq.value * S_TO_PS) : null,
    quantum_lifetime_stderr_ps: tq?.ok ? roundTo(tq.stdErr * S_TO_PS, 3) : null,
    quantum_lifetime_skipped: tq ? (tq.ok ? null : tq.reason) : o.ok ? null : o.reason,
    scattering_time_ratio: sig6OrNull(p.scatteringTimeRatio),
  };
}

/** A fit window in density (m⁻² inside), in cm⁻², with the rule that chose it. */
function densityWindowJson(w: { minDensity: number; maxDensity: number; rule: string }): Record<string, unknown> {
  return { min_density_per_cm2: sig6OrNull(w.minDensity * CM2), max_density_per_cm2: sig6OrNull(w.maxDensity * CM2), rule: w.rule };
}

type Depth = NonNullable<DeviceAnalysis["depth"]>;

function calibrationJson(c: Depth["calibration"]): Record<string, unknown> {
  if (!c.ok) return { skipped: c.reason };
  return {
    method: "linear fit of Hall density against gate voltage",
    params: {
      capacitance_uF_per_cm2: sig6OrNull(c.capacitance * F_PER_M2_TO_UF_PER_CM2),
      turn_on_V: sig6OrNull(c.turnOnVoltage),
      slope_per_cm2_per_V: sig6OrNull(c.slope * CM2),
    },
    errors: {
      capacitance_uF_per_cm2: sig6OrNull(c.capacitanceStdErr === null ? undefined : c.capacitanceStdErr * F_PER_M2_TO_UF_PER_CM2),
      turn_on_V: sig6OrNull(c.turnOnVoltageStdErr),
    },
    r2: sig6OrNull(c.r2),
    points: c.points,
  };
}

function percolationJson(pc: Depth["percolation"]): Record<string, unknown> {
  if (!pc.ok) return { skipped: pc.reason };
  return {
    method: "σ = A·(n − n_p)^p, Levenberg–Marquardt",
    file: pc.file,
    window: densityWindowJson(pc.window),
    params: { n_p_per_cm2: sig6OrNull(pc.density * CM2), A_S_m2p: sig6OrNull(pc.prefactor), p: sig6OrNull(pc.exponent) },
    errors: {
      n_p_per_cm2: sig6OrNull(pc.densityStdErr * CM2),
      A_S_m2p: sig6OrNull(pc.prefactorStdErr),
      p: pc.exponentFixed ? null : sig6OrNull(pc.exponentStdErr),
    },
    exponent_fixed: pc.exponentFixed,
    r2: sig6OrNull(pc.r2),
    points: pc.points,
    excluded_insulating: pc.excludedInsulating,
  };
}

function gateSweepJson(s: Depth["gateSweeps"][number]): Record<string, unknown> {
  const pc = s.percolation;
  return {
    file: s.file,
    direction: s.direction,
    field_T: s.field_T,
    points: s.gateVoltage.length,
    percolation: pc.ok ? { n_p_per_cm2: sig6OrNull(pc.density * CM2), r2: sig6OrNull(pc.r2) } : { skipped: pc.reason },
  };
}

function powerLawJson(pl: Depth["powerLaw"]): Record<string, unknown> {
  if (!pl.ok) return { skipped: pl.reason };
  return {
    method: "least-squares line ln μ = α ln n + c",
    window: densityWindowJson(pl.window),
    params: { alpha: sig6OrNull(pl.exponent), mobility_at_1e11_cm2_per_Vs: sig6OrNull(pl.mobilityAtReference * M2_PER_VS_TO_CM2_PER_VS) },
    errors: { alpha: sig6OrNull(pl.exponentStdErr) },
    r2: sig6OrNull(pl.r2),
    points: pl.points,
  };
}

function hysteresisJson(h: Depth["hysteresis"]): Record<string, unknown> {
  if (!h.ok) return { skipped: h.reason };
  return {
    up: h.up,
    down: h.down,
    mean_shift_V: sig6OrNull(h.meanShift),
    median_shift_V: sig6OrNull(h.medianShift),
    max_shift_V: sig6OrNull(h.maxShift),
    points: h.points,
  };
}

/** Per-device `transport_depth` block, or null without depth analysis. */
export function deviceDepthJson(d: DeviceAnalysis): unknown {
  const x = d.depth;
  if (!x) return null;
  const tq = x.quantumLifetime;
  const ratio = x.scatteringTimeRatio;
  return {
    density_calibration: calibrationJson(x.calibration),
    percolation: percolationJson(x.percolation),
    gate_sweeps: x.gateSweeps.map(gateSweepJson),
    mobility_power_law: powerLawJson(x.powerLaw),
    hysteresis: hysteresisJson(x.hysteresis),
    quantum_lifetime: tq.ok
      ? {
          method: "least-squares fit of the Lifshitz–Kosevich form, median over the points where τ_q is determined",
          median_ps: sig6OrNull(tq.value * S_TO_PS),
          points: tq.points,
        }
      : { skipped: tq.reason },
    scattering_time_ratio: ratio.ok ? { median: sig6OrNull(ratio.value), points: ratio.points } : { skipped: ratio.reason },
    parallel_conduction_flagged: x.parallelConduction,
  };
}
