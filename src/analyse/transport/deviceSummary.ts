/**
 * Per-device summary of transport points taken at several gate voltages.
 *
 * Points are sorted by gate voltage. Peak mobility is the largest Hall
 * mobility and the density where it occurs. With at least three gate
 * voltages, a linear least-squares fit of density against gate voltage gives
 * dn/dVg and the turn-on voltage V_on = −intercept/slope (the gate voltage
 * where the extrapolated density vanishes; common practice for gated 2DEGs).
 */
import { linearFit } from "../numeric/linearFit.ts";
import type { TransportPoint } from "./fieldSweep.ts";

export interface GateFit {
  /** dn/dVg, m⁻²/V. */
  slope: number;
  slopeStdErr: number;
  /** Turn-on voltage, V. */
  turnOn: number;
  turnOnStdErr: number;
  r2: number;
  points: number;
}

export interface DeviceSummary {
  /** m²/(V s) */
  peakMobility: number;
  /** m⁻² */
  densityAtPeakMobility: number;
  gateAtPeakMobility: number;
  gateFit?: GateFit;
  gateFitSkipped?: string;
}

export function sortByGate(points: TransportPoint[]): TransportPoint[] {
  return [...points].sort((a, b) => a.gate_V - b.gate_V);
}

export function summariseDevice(points: TransportPoint[]): DeviceSummary | undefined {
  if (points.length === 0) return undefined;
  const sorted = sortByGate(points);
  const peak = sorted.reduce((best, p) => (p.mobility > best.mobility ? p : best), sorted[0]);
  const summary: DeviceSummary = { peakMobility: peak.mobility, densityAtPeakMobility: peak.density, gateAtPeakMobility: peak.gate_V };
  const gates = new Set(sorted.map((p) => p.gate_V));
  const span = sorted[sorted.length - 1].gate_V - sorted[0].gate_V;
  if (gates.size >= 3 && !(span > 1e-9)) {
    summary.gateFitSkipped = "gate voltages differ by less than 1 nV";
  } else if (gates.size >= 3) {
    const f = linearFit(sorted.map((p) => p.gate_V), sorted.map((p) => p.density));
    const turnOn = -f.intercept / f.slope;
    // Delta method for V_on = −b/a: var = (b²/a⁴)σa² + σb²/a² (covariance neglected; stated).
    const turnOnStdErr = Math.sqrt((f.intercept ** 2 / f.slope ** 4) * f.slopeStdErr ** 2 + f.interceptStdErr ** 2 / f.slope ** 2);
    const fit = { slope: f.slope, slopeStdErr: f.slopeStdErr, turnOn, turnOnStdErr, r2: f.r2, points: sorted.length };
    // Densities that do not change with gate, or overflow the fit, give no finite turn-on: a reason, never NaN.
    if (Object.values(fit).every(Number.isFinite)) summary.gateFit = fit;
    else summary.gateFitSkipped = "the density-against-gate fit is not finite (density does not change with gate, or values out of range)";
  } else {
    summary.gateFitSkipped = `needs field sweeps at 3 or more gate voltages, found ${gates.size}`;
  }
  return summary;
}
