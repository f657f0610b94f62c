/**
 * Percolation density of a 2D electron gas from its zero-field conductivity.
 *
 * Model: σ_xx(n) = A·(n − n_p)^p for n > n_p, 0 otherwise (percolation transition
 * of an inhomogeneous 2D gas; Tracy et al., PRB 79, 235307 (2009)). The 2D
 * percolation conductivity exponent is p ≈ 1.31 (Grassberger, Physica A 262, 251
 * (1999); REFERENCES §8), used fixed by default; p may also be fitted.
 * Fit: Levenberg–Marquardt (nonlinearFit.ts) on σ/σ_max, standard errors from
 * the Jacobian. Units: n in m⁻², σ in S (per square), A in S·m^(2p).
 *
 * Fit window (points with n ≤ n_max):
 *  - `maxDensity` given → n_max = maxDensity.
 *  - otherwise derived: a first estimate n_p⁰ is the n-axis intercept of the
 *    straight line σ^(1/p) vs n through the lower half of the conducting density
 *    range; n_max = 3·n_p⁰ when n_p⁰ > 0, else the midpoint of the conducting
 *    density range. The window is then widened upward, point by point, until it
 *    holds at least `minPoints` conducting points.
 * Insulating points (σ ≤ 0 or non-finite: negative, open-circuit or huge
 * resistance) are left out and counted. The fit is skipped when the window's
 * lowest-density conductivity is not below `insulatingRatio` (default 0.15) times
 * its highest: the data then never approach the insulating side.
 */
import { linearFit } from "../numeric/linearFit.ts";
import { nonlinearFit } from "../numeric/nonlinearFit.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";

/** 2D percolation conductivity exponent (Grassberger 1999; REFERENCES §8, from memory). */
export const PERCOLATION_EXPONENT_2D = 1.31;

export interface PercolationOptions {
  /** Upper end of the fit window, m⁻². Derived from the data when absent. */
  maxDensity?: number;
  /** Fixed exponent p (default 1.31) or "free" to fit it. */
  exponent?: number | "free";
  /** Fewest conducting points in the window (default 6). */
  minPoints?: number;
  /** Largest allowed σ(lowest n)/σ(highest n) in the window (default 0.15). */
  insulatingRatio?: number;
}

export interface PercolationFit {
  ok: true;
  /** Percolation density n_p, m⁻². */
  density: number;
  densityStdErr: number;
  /** Prefactor A, S·m^(2p). */
  prefactor: number;
  prefactorStdErr: number;
  exponent: number;
  /** 0 when the exponent was held fixed. */
  exponentStdErr: number;
  exponentFixed: boolean;
  r2: number;
  window: { minDensity: number; maxDensity: number; rule: "given" | "derived" };
  /** Conducting points fitted. */
  points: number;
  /** Indices into the input arrays of the points fitted. */
  usedIndices: number[];
  /** Points left out as insulating (σ ≤ 0 or non-finite). */
  excludedInsulating: number;
}

/**
 * Sheet conductance σ = 1/R (S) of a recorded resistance R (Ω), or 0 when the
 * point is insulating: R ≤ 0 (an open-circuit lock-in reading), non-finite, or
 * above `insulatingAbove` (default 1e9 Ω, far above h/e² = 25.8 kΩ).
 */
export function sheetConductance(resistance: number, insulatingAbove = 1e9): number {
  return Number.isFinite(resistance) && resistance > 0 && resistance <= insulatingAbove ? 1 / resistance : 0;
}

/** σ = A·(n − n_p)^p above n_p, 0 below (S); exported for charts. */
export function percolationConductivity(density: number, np: number, prefactor: number, exponent: number): number {
  return density > np ? prefactor * (density - np) ** exponent : 0;
}

function derivedMaxDensity(ns: number[], sig: number[], p: number, minPoints: number): number {
  const lo = ns[0];
  const hi = ns[ns.length - 1];
  const half = ns.map((_n, i) => i).filter((i) => ns[i] <= (lo + hi) / 2);
  let nMax = (lo + hi) / 2;
  if (half.length >= 3 && new Set(half.map((i) => ns[i])).size >= 2) {
    const f = linearFit(
      half.map((i) => ns[i]),
      half.map((i) => sig[i] ** (1 / p)),
    );
    const np0 = f.slope > 0 ? -f.intercept / f.slope : Number.NaN;
    if (np0 > 0 && Number.isFinite(np0)) nMax = 3 * np0;
  }
  const k = Math.min(minPoints, ns.length) - 1;
  return Math.max(nMax, ns[k]);
}

/**
 * Fit the percolation law to a zero-field gate sweep. density in m⁻², conductivity
 * in S (1/ρ_xx). Returns { ok: false, reason } for too few conducting points, no
 * insulating side or a failed fit. Throws RangeError when the arrays differ in length.
 */
export function percolationFit(density: ArrayLike<number>, conductivity: ArrayLike<number>, options: PercolationOptions = {}): PercolationFit | Skipped {
  if (density.length !== conductivity.length) {
    throw new RangeError(`percolationFit: ${density.length} densities, ${conductivity.length} conductivities`);
  }
  const free = options.exponent === "free";
  const p0 = typeof options.exponent === "number" ? options.exponent : PERCOLATION_EXPONENT_2D;
  const minPoints = Math.max(options.minPoints ?? 6, free ? 5 : 4);
  const ratioLimit = options.insulatingRatio ?? 0.15;
  let excluded = 0;
  const conducting: number[] = [];
  for (let i = 0; i < density.length; i++) {
    if (!Number.isFinite(density[i])) continue;
    if (Number.isFinite(conductivity[i]) && conductivity[i] > 0) conducting.push(i);
    else excluded++;
  }
  conducting.sort((a, b) => density[a] - density[b]);
  if (conducting.length < minPoints) {
    return skipped(`only ${conducting.length} conducting points; the percolation fit needs ${minPoints}`);
  }
  const allN = conducting.map((i) => density[i]);
  const allS = conducting.map((i) => conductivity[i]);
  const given = options.maxDensity !== undefined;
  const nMax = given ? options.maxDensity! : derivedMaxDensity(allN, allS, p0, minPoints);
  const used = conducting.filter((i) => density[i] <= nMax);
  if (used.length < minPoints) {
    return skipped(`only ${used.length} conducting points below the window limit; the percolation fit needs ${minPoints}`);
  }
  const ns = used.map((i) => density[i]);
  const ss = used.map((i) => conductivity[i]);
  const sMax = Math.max(...ss);
  const ratio = ss[0] / ss[ss.length - 1];
  if (!(ratio < ratioLimit)) {
    return skipped(
      `the sweep never approaches the insulating side: σ at the lowest density is ${(100 * ratio).toFixed(0)} % of σ at the top of the window (needs < ${(100 * ratioLimit).toFixed(0)} %)`,
    );
  }
  return fitWindow(ns, ss, sMax, p0, free, used, excluded, {
    minDensity: ns[0],
    maxDensity: given ? nMax : ns[ns.length - 1],
    rule: given ? "given" : "derived",
  });
}

function fitWindow(
  ns: number[],
  ss: number[],
  sMax: number,
  p0: number,
  free: boolean,
  used: number[],
  excluded: number,
  window: PercolationFit["window"],
): PercolationFit | Skipped {
  const lo = ns[0];
  const hi = ns[ns.length - 1];
  const y = ss.map((s) => s / sMax);
  // Initial guess from the linearised law y^(1/p) = A^(1/p)·(n − n_p).
  const lin = linearFit(
    ns,
    y.map((v) => v ** (1 / p0)),
  );
  let np0 = lin.slope > 0 ? -lin.intercept / lin.slope : lo - 0.1 * (hi - lo);
  if (!(np0 < lo)) np0 = lo - 0.05 * (hi - lo);
  // Stage 1, well-conditioned: y = B·((n − n_p)/n_hi)^p with B = O(1).
  const b0 = ((hi - np0) / hi) ** -p0;
  const scaled =
    ([np, b, p]: number[]) =>
    (n: number) =>
      n > np ? b * ((n - np) / hi) ** p : 0;
  // Stage 2, in the reported parameters y = a·(n − n_p)^p, started at the stage-1
  // optimum, so the Jacobian standard errors refer to A itself.
  const model =
    ([np, a, p]: number[]) =>
    (n: number) =>
      n > np ? a * (n - np) ** p : 0;
  let fit: ReturnType<typeof nonlinearFit>;
  try {
    const first = nonlinearFit(scaled, ns, y, {
      initial: [np0, b0, p0],
      scale: [hi, b0, 1],
      min: [lo - 3 * (hi - lo), 0, 0.3],
      max: [hi, b0 * 1e3, 4],
      fixed: free ? [] : [2],
      maxIterations: 500,
    });
    const [np1, b1, p1] = first.params;
    const a1 = b1 / hi ** p1;
    fit = nonlinearFit(model, ns, y, {
      initial: [np1, a1, p1],
      scale: [hi, a1 > 0 ? a1 : 1, 1],
      fixed: free ? [] : [2],
      maxIterations: 20,
    });
  } catch (e) {
    return skipped(`percolation fit failed: ${(e as Error).message}`);
  }
  const [np, a, p] = fit.params;
  const [npErr, aErr, pErr] = fit.stdErr;
  if (!allFinite(np, a, p, npErr, aErr, pErr, fit.r2) || a <= 0) {
    return skipped("percolation fit did not converge to finite parameters");
  }
  return {
    ok: true,
    density: np,
    densityStdErr: npErr,
    prefactor: a * sMax,
    prefactorStdErr: aErr * sMax,
    exponent: p,
    exponentStdErr: free ? pErr : 0,
    exponentFixed: !free,
    r2: fit.r2,
    window,
    points: ns.length,
    usedIndices: used,
    excludedInsulating: excluded,
  };
}
