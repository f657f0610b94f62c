/**
 * Transport analysis in depth for one device: gate calibration, percolation,
 * mobility power law, Shubnikov–de Haas, derived quantities, hysteresis, Dingle.
 * Extension point called by analyseDevice; metrics in ./metrics.ts.
 *
 * Per field sweep (transport point): SdH on the symmetrised ρ_xx already in the
 * point (shubnikovDeHaas.ts), the Hall–SdH mismatch (same point, so same gate),
 * the derived figures τ_t, k_F, l, k_F·l (derivedQuantities.ts), and, with a
 * temperature and an SdH result, a Dingle plot (dingle.ts) and τ_t/τ_q.
 * Per device: density calibration from the Hall points, percolation and
 * hysteresis from the gate sweeps (gateSweepDepth.ts), μ ∝ n^α over the points.
 *
 * Device metrics (metric units, see metrics.ts): gate_capacitance (C),
 * percolation_density (n_p of the chosen sweep), mobility_exponent (α),
 * hall_sdh_mismatch (largest |mismatch| over the points, %), gate_hysteresis
 * (|mean shift|, V), quantum_lifetime (median τ_q over the points with a Dingle
 * fit). Pure; SI inside.
 */
import type { AnalysisSettings } from "../../validate/settings.ts";
import type { Sweep } from "../../validate/sweep.ts";
import { putMetric } from "../metrics.ts";
import type { DensityCalibration } from "./densityCalibration.ts";
import { derivedQuantities, type DerivedQuantities } from "./derivedQuantities.ts";
import { pointsCalibration } from "./deviceSummary.ts";
import { dinglePlot, dingleRatio, type DingleFit } from "./dingle.ts";
import type { DeviceGeometry, TransportPoint } from "./fieldSweep.ts";
import { analyseGateSweeps, deviceHysteresis, devicePercolation, type GateSweepDepth } from "./gateSweepDepth.ts";
import type { GateHysteresis } from "./gateHysteresis.ts";
import { mobilityPowerLaw, type MobilityPowerLaw } from "./mobilityPowerLaw.ts";
import { skipped, type Skipped } from "./outcome.ts";
import type { PercolationFit } from "./percolation.ts";
import { hallSdhMismatch, shubnikovDeHaas, type HallSdhMismatch, type SdhResult } from "./shubnikovDeHaas.ts";
import { median } from "simple-statistics";

export interface PointDepth {
  file: string;
  gate_V: number;
  /** Hall density of the point, m⁻². */
  hallDensity: number;
  sdh: SdhResult | Skipped;
  /** Present when the SdH analysis ran. */
  mismatch?: HallSdhMismatch;
  derived: DerivedQuantities | Skipped;
  dingle: DingleFit | Skipped;
  /** τ_t/τ_q, dimensionless, when both lifetimes are known. */
  dingleRatio?: number;
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
  /** Median τ_q over the points with a Dingle fit, s. */
  quantumLifetime: { ok: true; value: number; points: number } | Skipped;
  /** Points flagged as probable parallel conduction. */
  parallelConduction: string[];
}

const DEFAULT_GEOMETRY: DeviceGeometry = { geometry: "hall-bar" };

/** SdH, mismatch, derived figures and Dingle plot of one transport point. */
export function analysePointDepth(p: TransportPoint, settings: AnalysisSettings): PointDepth {
  const sdh = shubnikovDeHaas(p.trace.b, p.trace.rhoxx, {
    minField: settings.sdh_min_field,
    maxField: settings.sdh_max_field,
    degeneracy: settings.degeneracy,
    backgroundOrder: settings.sdh_background_order,
  });
  const derived = derivedQuantities(p.density, p.mobility, { massRatio: settings.effective_mass, degeneracy: settings.degeneracy });
  const out: PointDepth = { file: p.file, gate_V: p.gate_V, hallDensity: p.density, sdh, derived, dingle: skipped("no Shubnikov–de Haas oscillations to fit") };
  if (!sdh.ok) return out;
  if (p.density > 0 && Number.isFinite(p.density)) out.mismatch = hallSdhMismatch(p.density, sdh.density, settings.sdh_mismatch_tolerance);
  out.dingle = dinglePlot(sdh.trace.inverseField, sdh.trace.oscillation, p.sheetResistance, p.temperature_K, { massRatio: settings.effective_mass });
  if (out.dingle.ok && derived.ok) out.dingleRatio = dingleRatio(derived.transportLifetime, out.dingle.quantumLifetime);
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
  const powerLaw = mobilityPowerLaw(points.map((p) => p.density), points.map((p) => p.mobility), {
    densityRange: settings.exponent_density_range ?? undefined,
  });
  const depthPoints = points.map((p) => analysePointDepth(p, settings));
  const taus = depthPoints.flatMap((d) => (d.dingle.ok ? [d.dingle.quantumLifetime] : []));
  const quantumLifetime = taus.length ? { ok: true as const, value: median(taus), points: taus.length } : skipped(dingleReason(depthPoints));
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
  return {
    metrics,
    calibration,
    gateSweeps: sweeps,
    percolation,
    powerLaw,
    hysteresis,
    points: depthPoints,
    quantumLifetime,
    parallelConduction: depthPoints.filter((d) => d.mismatch?.parallelConduction).map((d) => d.file),
  };
}

function dingleReason(points: PointDepth[]): string {
  if (points.length === 0) return "no field sweeps";
  const first = points.find((d) => !d.dingle.ok);
  return first && !first.dingle.ok ? `no point gave a Dingle fit (e.g. ${first.file}: ${first.dingle.reason})` : "no Dingle fit";
}
