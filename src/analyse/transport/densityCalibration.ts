/**
 * Gate calibration of a Hall-bar field-effect device: density vs gate voltage.
 *
 * Parallel-plate model of a gated 2D gas: n(Vg) = (C/e)·(Vg − V_on), fitted as an
 * ordinary least-squares line n = a·Vg + b to the device's Hall densities.
 * Gate capacitance per area C = e·|dn/dVg| (F/m²; 1 F/m² = 100 µF/cm²), turn-on
 * voltage V_on = −b/a (the n = 0 intercept). Standard errors: from the line's
 * residuals; σ(V_on) by first-order error propagation including the slope–
 * intercept covariance cov(a,b) = −x̄·σ_a² (Press et al., Numerical Recipes, §15.2).
 */
import { ELEMENTARY_CHARGE } from "../../physics/constants.ts";
import { linearFit } from "../numeric/linearFit.ts";
import { skipped, type Skipped } from "./outcome.ts";

export interface DensityCalibration {
  ok: true;
  /** dn/dVg, m⁻²/V. */
  slope: number;
  /** n at Vg = 0, m⁻². */
  intercept: number;
  /** Gate capacitance per area C = e·|dn/dVg|, F/m². */
  capacitance: number;
  /** Standard error of C, F/m²; null with only two gate voltages. */
  capacitanceStdErr: number | null;
  /** Turn-on voltage V_on (n = 0), V. */
  turnOnVoltage: number;
  /** Standard error of V_on, V; null with only two gate voltages. */
  turnOnVoltageStdErr: number | null;
  r2: number;
  /** Number of (Vg, n) points used. */
  points: number;
  /** Indices into the input arrays of the points used. */
  usedIndices: number[];
}

/**
 * Fit n(Vg) through Hall densities. gateVoltage in V, density in m⁻².
 * Points with non-finite values or n ≤ 0 are left out. Returns { ok: false, reason }
 * with fewer than two distinct gate voltages or when n does not change with Vg.
 * Throws RangeError when the arrays differ in length.
 */
export function densityCalibration(gateVoltage: ArrayLike<number>, density: ArrayLike<number>): DensityCalibration | Skipped {
  if (gateVoltage.length !== density.length) {
    throw new RangeError(`densityCalibration: ${gateVoltage.length} gate voltages, ${density.length} densities`);
  }
  const used: number[] = [];
  for (let i = 0; i < gateVoltage.length; i++) {
    if (Number.isFinite(gateVoltage[i]) && Number.isFinite(density[i]) && density[i] > 0) used.push(i);
  }
  const x = used.map((i) => gateVoltage[i]);
  const y = used.map((i) => density[i]);
  if (new Set(x).size < 2) {
    return skipped(`need Hall densities at two or more gate voltages, found ${new Set(x).size}`);
  }
  // linearFit throws when the x values are numerically equal (e.g. 0 V and 1e-320 V): that is a data reason, not a bug.
  if (!(Math.max(...x) - Math.min(...x) > 1e-9)) return skipped("gate voltages differ by less than 1 nV");
  const fit = linearFit(x, y);
  if (fit.slope === 0 || !Number.isFinite(fit.slope)) return skipped("Hall density does not change with gate voltage");
  const a = fit.slope;
  const b = fit.intercept;
  const turnOn = -b / a;
  let capErr: number | null = null;
  let vErr: number | null = null;
  if (used.length > 2) {
    const xMean = x.reduce((s, v) => s + v, 0) / x.length;
    const varA = fit.slopeStdErr ** 2;
    const varB = fit.interceptStdErr ** 2;
    const cov = -xMean * varA;
    const varV = varB / a ** 2 + (b ** 2 * varA) / a ** 4 - (2 * b * cov) / a ** 3;
    capErr = ELEMENTARY_CHARGE * fit.slopeStdErr;
    vErr = Math.sqrt(Math.max(0, varV));
  }
  if (!Number.isFinite(turnOn)) return skipped("turn-on voltage is not finite");
  // Densities spanning hundreds of decades overflow the sums of the fit: refuse rather than publish NaN.
  if (![a, b, fit.r2, capErr ?? 0, vErr ?? 0].every(Number.isFinite))
    return skipped("the density-against-gate fit is not finite (densities out of any physical range)");
  return {
    ok: true,
    slope: a,
    intercept: b,
    capacitance: ELEMENTARY_CHARGE * Math.abs(a),
    capacitanceStdErr: capErr,
    turnOnVoltage: turnOn,
    turnOnVoltageStdErr: vErr,
    r2: fit.r2,
    points: used.length,
    usedIndices: used,
  };
}

/**
 * Density at a gate voltage from a calibration: n = slope·Vg + intercept, m⁻².
 * Below turn-on the line gives n ≤ 0; callers treat that as "no carriers".
 */
export function densityAtGate(calibration: Pick<DensityCalibration, "slope" | "intercept">, gateVoltage: number): number {
  return calibration.slope * gateVoltage + calibration.intercept;
}
