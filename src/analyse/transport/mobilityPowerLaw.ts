/**
 * Mobility–density power law μ ∝ n^α of a 2D electron gas.
 *
 * Fit: ordinary least-squares line ln μ = α·ln n + c (linearFit.ts) over a density
 * window. The exponent points to the dominant scattering: α ≈ 1.5 (up to ≈ 1.7
 * when screened) for remote charged impurities, smaller for background
 * impurities, ≈ 0 for short-range scattering (Das Sarma & Hwang, PRB 88, 035439
 * (2013); REFERENCES §12). Default window: all densities up to and including the
 * one of peak mobility (the rising branch below the mobility peak).
 * Units: density in m⁻², mobility in m²/(V s).
 */
import { linearFit } from "../numeric/linearFit.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";

/** Reference density for the reported prefactor: 1e15 m⁻² (= 1e11 cm⁻²). */
export const POWER_LAW_REFERENCE_DENSITY = 1e15;

export interface MobilityPowerLawOptions {
  /** Density window [min, max] in m⁻²; default: densities up to the mobility peak. */
  densityRange?: [number, number];
  /** Fewest points in the window (default 3). */
  minPoints?: number;
}

export interface MobilityPowerLaw {
  ok: true;
  /** Exponent α of μ ∝ n^α, dimensionless. */
  exponent: number;
  exponentStdErr: number;
  /** μ at the reference density 1e15 m⁻² on the fitted line, m²/(V s): μ = μ_ref·(n/n_ref)^α. */
  mobilityAtReference: number;
  r2: number;
  window: { minDensity: number; maxDensity: number; rule: "given" | "below mobility peak" };
  points: number;
  /** Indices into the input arrays of the points fitted. */
  usedIndices: number[];
}

/**
 * Fit μ ∝ n^α. Points with non-finite or non-positive n or μ are left out.
 * Returns { ok: false, reason } when the window holds too few points, spans too
 * little density (max/min < 1.2) or, by default, when the mobility peaks at the
 * lowest density (no rising branch). Throws RangeError when the arrays differ in length.
 */
export function mobilityPowerLaw(density: ArrayLike<number>, mobility: ArrayLike<number>, options: MobilityPowerLawOptions = {}): MobilityPowerLaw | Skipped {
  if (density.length !== mobility.length) {
    throw new RangeError(`mobilityPowerLaw: ${density.length} densities, ${mobility.length} mobilities`);
  }
  const minPoints = Math.max(3, options.minPoints ?? 3);
  const valid: number[] = [];
  for (let i = 0; i < density.length; i++) {
    if (density[i] > 0 && mobility[i] > 0 && Number.isFinite(density[i]) && Number.isFinite(mobility[i])) valid.push(i);
  }
  if (valid.length < minPoints) return skipped(`only ${valid.length} valid (n, μ) points; need ${minPoints}`);
  valid.sort((a, b) => density[a] - density[b]);
  let lo: number;
  let hi: number;
  let rule: MobilityPowerLaw["window"]["rule"];
  if (options.densityRange) {
    [lo, hi] = options.densityRange;
    rule = "given";
  } else {
    let peak = valid[0];
    for (const i of valid) if (mobility[i] > mobility[peak]) peak = i;
    if (peak === valid[0]) return skipped("mobility is highest at the lowest density: no rising branch below a mobility peak");
    lo = density[valid[0]];
    hi = density[peak];
    rule = "below mobility peak";
  }
  const used = valid.filter((i) => density[i] >= lo && density[i] <= hi);
  if (used.length < minPoints) return skipped(`only ${used.length} points in the density window; need ${minPoints}`);
  const ns = used.map((i) => density[i]);
  const span = ns[ns.length - 1] / ns[0];
  if (!(span >= 1.2)) return skipped(`density window spans only a factor ${span.toFixed(2)}; need at least 1.2`);
  const fit = linearFit(
    ns.map((n) => Math.log(n)),
    used.map((i) => Math.log(mobility[i])),
  );
  const muRef = Math.exp(fit.intercept + fit.slope * Math.log(POWER_LAW_REFERENCE_DENSITY));
  if (!allFinite(fit.slope, fit.slopeStdErr, fit.r2, muRef)) return skipped("power-law fit gave non-finite values");
  return {
    ok: true,
    exponent: fit.slope,
    exponentStdErr: fit.slopeStdErr,
    mobilityAtReference: muRef,
    r2: fit.r2,
    window: { minDensity: ns[0], maxDensity: ns[ns.length - 1], rule },
    points: used.length,
    usedIndices: used,
  };
}
