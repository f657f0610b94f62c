/**
 * Transport analysis in depth for one device: gate calibration, percolation,
 * mobility power law, Shubnikov–de Haas, derived quantities, hysteresis, Dingle.
 * Extension point called by analyseDevice; metrics in ./metrics.ts.
 *
 * Per field sweep (transport point): the 1/B spectrum of the symmetrised ρ_xx
 * already in the point (shubnikovDeHaas.ts), which seeds the least-squares fit
 * of the whole oscillation (oscillationFit.ts) that gives n_SdH and τ_q with
 * their standard errors, or says why they are not determined; the Hall–SdH
 * mismatch with its standard error (same point, so same gate); the derived
 * figures τ_t, k_F, l, k_F·l (derivedQuantities.ts); the Dingle plot of the
 * fit as a diagnostic view (dingle.ts); and τ_t/τ_q.
 * Per device: density calibration from the Hall points, percolation and
 * hysteresis from the gate sweeps (gateSweepDepth.ts), μ ∝ n^α over the points.
 *
 * Device metrics (metric units, see metrics.ts): gate_capacitance (C),
 * percolation_density (n_p of the chosen sweep), mobility_exponent (α),
 * hall_sdh_mismatch (largest |mismatch| over the points, %), gate_hysteresis
 * (|mean shift|, V), quantum_lifetime (median τ_q over the points where it is
 * determined), scattering_time_ratio (median τ_t/τ_q over the same points).
 * Points whose τ_q is not determined are left out of the medians; so are
 * points flagged for parallel conduction, whose ρxx oscillation a second
 * channel reshapes. Pure; SI inside.
 */
import type { AnalysisSettings } from "../../validate/settings.ts";
import type { Sweep } from "../../validate/sweep.ts";
import { putMetric } from "../../model/metrics.ts";
import type { DensityCalibration } from "./densityCalibration.ts";
import { derivedQuantities, type DerivedQuantities } from "./derivedQuantities.ts";
import { pointsCalibration } from "./deviceSummary.ts";
import { DINGLE_BULK, dinglePlot, dingleRatio, type DinglePlot } from "./dingle.ts";
import type { DeviceGeometry, TransportPoint } from "./fieldSweep.ts";
import { analyseGateSweeps, GATE_SWEEP_BULK, deviceHysteresis, devicePercolation, type GateSweepDepth } from "./gateSweepDepth.ts";
import type { GateHysteresis } from "./gateHysteresis.ts";
import { mobilityPowerLaw, type MobilityPowerLaw } from "./mobilityPowerLaw.ts";
import { skipped, type Skipped } from "./outcome.ts";
import type { PercolationFit } from "./percolation.ts";
import { fitOscillations, OSCILLATION_FIT_BULK, type OscillationFit } from "./oscillationFit.ts";
import { hallSdhMismatch, SDH_BULK, shubnikovDeHaas, type HallSdhMismatch, type SdhResult } from "./shubnikovDeHaas.ts";
import { median } from "simple-statistics";
import { under } from "../bulk.ts";

export interface PointDepth {
  file: string;
  gate_V: number;
  /** Hall density of the point and its standard error (from the Hall slope's), m⁻². */
  hallDensity: number;
  hallDensityStdErr: number;
  /** The 1/B spectrum (seeds the fit; charted). */
  sdh: SdhResult | Skipped;
  /** The oscillation fit: n_SdH, τ_q with standard errors, or why not determined. */
  oscillation: OscillationFit | Skipped;
  /** Present when the fit gave an SdH density. */
  mismatch?: HallSdhMismatch;
  derived: DerivedQuantities | Skipped;
  /** Diagnostic Dingle plot of the fit. */
  dingle: DinglePlot | Skipped;
  /** τ_t/τ_q, dimensionless, when both lifetimes are determined. */
  scatteringTimeRatio?: number;
}

export interface DeviceDepth {
  /** Device-level metric values in each metric's unit. */
  metrics: Record<string, number>;
  calibration: DensityCalibration | Skipped;
  gateSweeps: GateSweepDepth[];
  percolation: (PercolationFit & { file: string }) | Skipped;
  powerLaw: MobilityPowerLaw | Skipped;
  hysteresis: (GateHysteresis & { up: string; down: string }) | Skipped;
  points: PointDepth[];
  /** Median τ_q over the points where it is determined, s. */
  quantumLifetime: { ok: true; value: number; points: number } | Skipped;
  /** Median τ_t/τ_q over the points with both lifetimes. */
  scatteringTimeRatio: { ok: true; value: number; points: number } | Skipped;
  /** Points flagged as probable parallel conduction. */
  parallelConduction: string[];
}

const DEFAULT_GEOMETRY: DeviceGeometry = { geometry: "hall-bar" };

/** The lifetime of a point when determined, s. */
export function pointLifetime(d: PointDepth): number | undefined {
  return d.oscillation.ok && d.oscillation.quantumLifetime.ok ? d.oscillation.quantumLifetime.value : undefined;
}

/** SdH spectrum and fit, mismatch, derived figures and Dingle plot of one transport point. */
export function analysePointDepth(p: TransportPoint, settings: AnalysisSettings): PointDepth {
  const window = {
    minField: settings.sdh_min_field,
    maxField: settings.sdh_max_field,
    degeneracy: settings.degeneracy,
    backgroundOrder: settings.sdh_background_order,
  };
  const sdh = shubnikovDeHaas(p.trace.b, p.trace.rhoxx, window);
  const derived = derivedQuantities(p.density, p.mobility, { massRatio: settings.effective_mass, degeneracy: settings.degeneracy });
  const hallDensityStdErr = p.hall.slope !== 0 ? (p.density * p.hall.slopeStdErr) / Math.abs(p.hall.slope) : Number.POSITIVE_INFINITY;
  const oscillation = sdh.ok
    ? fitOscillations(p.trace.b, p.trace.rhoxx, p.temperature_K, sdh.frequency, {
        ...window,
        massRatio: settings.effective_mass,
        minR2: settings.sdh_min_r2,
        maxLifetimeError: settings.sdh_max_lifetime_error / 100,
        amplitudeFactor: settings.sdh_amplitude_factor,
      })
    : skipped(`no oscillation to fit: ${sdh.reason}`);
  const out: PointDepth = {
    file: p.file,
    gate_V: p.gate_V,
    hallDensity: p.density,
    hallDensityStdErr,
    sdh,
    oscillation,
    derived,
    dingle: skipped("no oscillation fit"),
  };
  if (!oscillation.ok) return out;
  if (p.density > 0 && Number.isFinite(p.density)) {
    out.mismatch = hallSdhMismatch(p.density, oscillation.density.value, settings.sdh_mismatch_tolerance, hallDensityStdErr, oscillation.density.stdErr);
  }
  out.dingle = dinglePlot(oscillation);
  if (out.mismatch?.parallelConduction && oscillation.quantumLifetime.ok) {
    // A parallel channel shunts and reshapes the well's oscillation in ρxx: its amplitude no longer gives τ_q.
    out.oscillation = {
      ...oscillation,
      quantumLifetime: skipped(
        `probable parallel conduction (Hall density ${out.mismatch.mismatchPercent.toFixed(1)} % from the SdH density): a second channel reshapes the oscillation of ρxx, so its amplitude does not give the well's τ_q`,
      ),
    };
  }
  const tau = pointLifetime(out);
  if (tau !== undefined && derived.ok) out.scatteringTimeRatio = dingleRatio(derived.transportLifetime, tau);
  return out;
}

/**
 * Everything in depth for one device. points: the device's transport points
 * (any order); gateSweeps: its gate sweeps; device: geometry with W, L (µm) for
 * Hall bars; knownCalibration: the device's gate calibration when the caller has it
 * already (analyseDevice passes deviceSummary.ts pointsCalibration of the same points),
 * computed here otherwise. Returns undefined when the device has neither points
 * nor gate sweeps.
 */
export function analyseDeviceDepth(
  points: TransportPoint[],
  gateSweeps: Sweep[],
  settings: AnalysisSettings,
  device: DeviceGeometry = DEFAULT_GEOMETRY,
  knownCalibration?: DensityCalibration | Skipped,
): DeviceDepth | undefined {
  if (points.length === 0 && gateSweeps.length === 0) return undefined;
  const calibration = knownCalibration ?? pointsCalibration(points);
  const sweeps = analyseGateSweeps(gateSweeps, device, calibration, settings);
  const percolation = devicePercolation(sweeps);
  const hysteresis = deviceHysteresis(sweeps);
  const powerLaw = mobilityPowerLaw(
    points.map((p) => p.density),
    points.map((p) => p.mobility),
    {
      densityRange: settings.exponent_density_range ?? undefined,
    },
  );
  const depthPoints = points.map((p) => analysePointDepth(p, settings));
  const taus = depthPoints.flatMap((d) => pointLifetime(d) ?? []);
  const quantumLifetime = taus.length ? { ok: true as const, value: median(taus), points: taus.length } : skipped(lifetimeReason(depthPoints));
  const ratios = depthPoints.flatMap((d) => d.scatteringTimeRatio ?? []);
  const scatteringTimeRatio = ratios.length
    ? { ok: true as const, value: median(ratios), points: ratios.length }
    : skipped(quantumLifetime.ok ? "no point with both τ_t and τ_q" : quantumLifetime.reason);
  const mismatches = depthPoints.flatMap((d) => (d.mismatch ? [d.mismatch.mismatchPercent] : []));
  const largest = mismatches.length ? mismatches.reduce((m, v) => (Math.abs(v) > Math.abs(m) ? v : m), 0) : undefined;
  const metrics: Record<string, number> = {};
  const put = (key: string, si: number | undefined) => putMetric(metrics, key, si);
  if (calibration.ok) put("gate_capacitance", calibration.capacitance);
  if (percolation.ok) put("percolation_density", percolation.density);
  if (powerLaw.ok) put("mobility_exponent", powerLaw.exponent);
  if (largest !== undefined) put("hall_sdh_mismatch", Math.abs(largest));
  if (hysteresis.ok) put("gate_hysteresis", Math.abs(hysteresis.meanShift));
  if (quantumLifetime.ok) put("quantum_lifetime", quantumLifetime.value);
  if (scatteringTimeRatio.ok) put("scattering_time_ratio", scatteringTimeRatio.value);
  return {
    metrics,
    calibration,
    gateSweeps: sweeps,
    percolation,
    powerLaw,
    hysteresis,
    points: depthPoints,
    quantumLifetime,
    scatteringTimeRatio,
    parallelConduction: depthPoints.filter((d) => d.mismatch?.parallelConduction).map((d) => d.file),
  };
}

/** Why no point has a determined τ_q: the first fitted point's reason, else the first point's. */
function lifetimeReason(points: PointDepth[]): string {
  if (points.length === 0) return "no field sweeps";
  const fitted = points.find((d) => d.oscillation.ok && !d.oscillation.quantumLifetime.ok);
  if (fitted?.oscillation.ok && !fitted.oscillation.quantumLifetime.ok)
    return `τ_q not determined at any point (e.g. ${fitted.file}: ${fitted.oscillation.quantumLifetime.reason})`;
  const first = points.find((d) => !d.oscillation.ok);
  return first && !first.oscillation.ok
    ? `τ_q not determined at any point (e.g. ${first.file}: ${first.oscillation.reason})`
    : "τ_q not determined at any point";
}

/** A device's bulk arrays (src/analyse/bulk.ts): gate-sweep columns and each field sweep's SdH trace, spectrum, fit curves and Dingle points. */
export const DEVICE_DEPTH_BULK = [
  ...under(["gateSweeps", "*"], GATE_SWEEP_BULK),
  ...under(["points", "*", "sdh"], SDH_BULK),
  ...under(["points", "*", "oscillation"], OSCILLATION_FIT_BULK),
  ...under(["points", "*", "dingle"], DINGLE_BULK),
];
