/**
 * Hall slope and sheet density.
 *
 * In the classical (Drude) low-field range the Hall resistance is linear in B,
 * R_xy = B/(n·e), so the sheet density is n = 1/(e·dR_xy/dB). The slope is a
 * linear least-squares fit (linearFit.ts) to the antisymmetrised R_xy over
 * |B| ≤ hall_max_field. The fit's R² is kept and a fit below `minR2` is flagged
 * as poor (non-linear Hall: a second carrier type or quantum Hall onset).
 * Check: n = 1e11 cm⁻² ↔ dR_xy/dB = 6241.509 Ω/T (REFERENCES §6, derived).
 */
import { ELEMENTARY_CHARGE } from "../../physics/constants.ts";
import { linearFit } from "../numeric/linearFit.ts";

export interface HallFit {
  /** dR_xy/dB, Ω/T (sign kept: its sign is the carrier type under the lab's contact convention). */
  slope: number;
  slopeStdErr: number;
  intercept: number;
  r2: number;
  points: number;
  maxField: number;
  poor: boolean;
}

export type HallResult = { ok: true; fit: HallFit } | { ok: false; reason: string };

export function hallSlope(b: ArrayLike<number>, rxy: ArrayLike<number>, maxField: number, minR2: number): HallResult {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < b.length; i++) {
    if (Math.abs(b[i]) <= maxField) {
      xs.push(b[i]);
      ys.push(rxy[i]);
    }
  }
  const nonZero = xs.filter((x) => x !== 0).length;
  if (nonZero < 3) {
    return {
      ok: false,
      reason: `only ${nonZero} field values with 0 < |B| ≤ ${maxField} T; the Hall fit needs at least 3 (raise hall_max_field or measure more low-field points)`,
    };
  }
  const f = linearFit(xs, ys);
  if (f.slope === 0) return { ok: false, reason: "Hall resistance does not change with field" };
  return { ok: true, fit: { slope: f.slope, slopeStdErr: f.slopeStdErr, intercept: f.intercept, r2: f.r2, points: xs.length, maxField, poor: f.r2 < minR2 } };
}

/** Sheet density n = 1/(e·|dR_xy/dB|), m⁻². */
export function sheetDensity(hallSlopeOhmPerTesla: number): number {
  return 1 / (ELEMENTARY_CHARGE * Math.abs(hallSlopeOhmPerTesla));
}

/** Hall mobility μ = 1/(e·n·ρ_xx), m²/(V s), with n in m⁻² and ρ_xx in Ω per square. */
export function hallMobility(densityPerM2: number, sheetResistanceOhm: number): number {
  return 1 / (ELEMENTARY_CHARGE * densityPerM2 * sheetResistanceOhm);
}
