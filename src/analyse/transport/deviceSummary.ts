/**
 * Per-device summary of transport points taken at several gate voltages.
 *
 * Points are sorted by gate voltage. Peak mobility is the largest Hall
 * mobility and the density where it occurs. With at least three gate
 * voltages, a linear least-squares fit of density against gate voltage gives
 * dn/dVg and the turn-on voltage V_on = −intercept/slope (the gate voltage
 * where the extrapolated density vanishes; common practice for gated 2DEGs).
 */
import { ELEMENTARY_CHARGE } from "../../physics/constants.ts";
import { densityCalibration, type DensityCalibration } from "./densityCalibration.ts";
import type { TransportPoint } from "./fieldSweep.ts";
import type { Skipped } from "./outcome.ts";

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

/**
 * The device's n(Vg) gate calibration (densityCalibration.ts): Hall density
 * (m⁻²) against gate voltage (V) over the transport points in the order given
 * (usedIndices index that order; pass them sorted by gate with sortByGate, as
 * analyseDevice does). Fitted once per device and shared by summariseDevice and
 * analyseDeviceDepth; never throws (the two arrays always match).
 */
export function pointsCalibration(points: TransportPoint[]): DensityCalibration | Skipped {
  return densityCalibration(
    points.map((p) => p.gate_V),
    points.map((p) => p.density),
  );
}

/**
 * Peak mobility and gate fit of one device (see the module comment); undefined
 * without points. calibration: pointsCalibration(sortByGate(points)) when the
 * caller has it already (analyseDevice), computed here otherwise.
 */
export function summariseDevice(points: TransportPoint[], calibration?: DensityCalibration | Skipped): DeviceSummary | undefined {
  if (points.length === 0) return undefined;
  const sorted = sortByGate(points);
  const peak = sorted.reduce((best, p) => (p.mobility > best.mobility ? p : best), sorted[0]);
  const summary: DeviceSummary = { peakMobility: peak.mobility, densityAtPeakMobility: peak.density, gateAtPeakMobility: peak.gate_V };
  const gates = new Set(sorted.map((p) => p.gate_V));
  if (gates.size < 3) {
    summary.gateFitSkipped = `needs field sweeps at 3 or more gate voltages, found ${gates.size}`;
    return summary;
  }
  // The same n(Vg) line as the gate calibration (densityCalibration.ts), so the two never disagree.
  const cal = calibration ?? pointsCalibration(sorted);
  if (!cal.ok) summary.gateFitSkipped = cal.reason;
  else {
    summary.gateFit = {
      slope: cal.slope,
      slopeStdErr: cal.capacitanceStdErr! / ELEMENTARY_CHARGE,
      turnOn: cal.turnOnVoltage,
      turnOnStdErr: cal.turnOnVoltageStdErr!,
      r2: cal.r2,
      points: cal.points,
    };
  }
  return summary;
}
