/**
 * Sigmoid (logistic) fit of one composition step, for interface widths.
 *
 * Model: x(z) = x0 + Δx / (1 + exp(−(z − z0)/τ)) + s·(z − z̄), a logistic step on
 * a sloping background, as used for atom-probe and SIMS interface profiles
 * (e.g. Paquelet Wuetz et al., Nat. Commun. 13, 7730 (2022)). Fitted by
 * Levenberg–Marquardt (see nonlinearFit.ts).
 *
 * Widths: the 10–90 % width of a logistic step is 2·ln 9·τ = 4.394449·τ; the
 * "4τ" width spans 11.92 %–88.08 % (REFERENCES §10, derived). A falling edge has
 * Δx < 0; τ is reported positive.
 * Start: τ = span/20; when that search collapses to τ → 0 (a sharp edge sampled
 * finely) or fails, it is run again from the 10–90 % width read off the data,
 * and the better of the two is kept.
 */
import { nonlinearFit, type NonlinearFit } from "./nonlinearFit.ts";

export const LN9 = Math.log(9);

export interface SigmoidEdge {
  base: number;
  step: number;
  centre: number;
  tau: number;
  slope: number;
  /** 10–90 % width, same unit as z. */
  width10to90: number;
  width10to90StdErr: number;
  /** 4τ width, same unit as z. */
  width4tau: number;
  centreStdErr: number;
  /** Depth the background slope is measured from (the window's mean z). */
  zReference: number;
  r2: number;
  points: number;
  fit: NonlinearFit;
}

export interface SigmoidFitOptions {
  /** Include a linear background term (default true). */
  slope?: boolean;
}

export function fitSigmoidEdge(z: ArrayLike<number>, value: ArrayLike<number>, options: SigmoidFitOptions = {}): SigmoidEdge {
  const n = z.length;
  if (n < 6) throw new RangeError(`fitSigmoidEdge: need at least 6 points, got ${n}`);
  const zs = Array.from(z);
  const vs = Array.from(value);
  const zMean = zs.reduce((a, b) => a + b, 0) / n;
  const span = Math.abs(zs[n - 1] - zs[0]) || 1;
  // Initial guess: plateaus from the first and last 15 %, centre where the
  // profile crosses half-way, τ from a tenth of the span.
  const m = Math.max(1, Math.floor(n * 0.15));
  const avg = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const lo = avg(vs.slice(0, m));
  const hi = avg(vs.slice(n - m));
  const half = (lo + hi) / 2;
  let centre = zMean;
  for (let i = 1; i < n; i++) {
    if ((vs[i - 1] - half) * (vs[i] - half) <= 0) {
      centre = zs[i];
      break;
    }
  }
  const stepGuess = hi - lo || 1e-6;
  const useSlope = options.slope ?? true;
  const model =
    ([x0, dx, z0, tau, s]: number[]) =>
    (zz: number) =>
      x0 + dx / (1 + Math.exp(-(zz - z0) / tau)) + s * (zz - zMean);
  const run = (tau0: number) =>
    nonlinearFit(model, zs, vs, {
      initial: [lo, stepGuess, centre, tau0, 0],
      scale: [Math.abs(stepGuess), Math.abs(stepGuess), span, tau0, Math.abs(stepGuess) / span],
      min: [-Infinity, -Infinity, zs[0] - span, span * 1e-5, -Infinity],
      max: [Infinity, Infinity, zs[n - 1] + span, span, Infinity],
      fixed: useSlope ? [] : [4],
    });
  let fit = run(span / 20);
  // A sharp edge sampled finely can send the search from the broad first guess to τ → 0, where the
  // model is a step and no longer depends on τ. Then start again from the width the data show.
  if (!fit.params.every(Number.isFinite) || Math.abs(fit.params[3]) < span * 1e-4) {
    const retry = run(widthGuess(zs, vs, lo, hi) / (2 * LN9));
    if (retry.params.every(Number.isFinite) && (!fit.params.every(Number.isFinite) || retry.ssRes <= fit.ssRes)) fit = retry;
  }
  const [base, step, z0, tau, slope] = fit.params;
  const t = Math.abs(tau);
  return {
    base,
    step,
    centre: z0,
    tau: t,
    slope,
    width10to90: 2 * LN9 * t,
    width10to90StdErr: 2 * LN9 * fit.stdErr[3],
    width4tau: 4 * t,
    centreStdErr: fit.stdErr[2],
    zReference: zMean,
    r2: fit.r2,
    points: n,
    fit,
  };
}

/** The 10–90 % width of the edge as the data show it: the first crossings of the 10 % and 90 % levels between the plateaus lo and hi (at least the median spacing). */
function widthGuess(z: number[], v: number[], lo: number, hi: number): number {
  const cross = (f: number) => {
    const level = lo + f * (hi - lo);
    for (let i = 1; i < z.length; i++) if ((v[i - 1] - level) * (v[i] - level) <= 0) return z[i];
    return NaN;
  };
  const steps = z
    .slice(1)
    .map((zz, i) => zz - z[i])
    .sort((a, b) => a - b);
  const w = Math.abs(cross(0.9) - cross(0.1));
  return Math.max(Number.isFinite(w) ? w : 0, steps[steps.length >> 1] ?? 0, 1e-12);
}

/** The fitted model at z: base + step/(1 + e^(−(z − centre)/τ)) + slope·(z − zReference). */
export function sigmoidAt(edge: Pick<SigmoidEdge, "base" | "step" | "centre" | "tau" | "slope" | "zReference">, z: number): number {
  return edge.base + edge.step / (1 + Math.exp(-(z - edge.centre) / edge.tau)) + edge.slope * (z - edge.zReference);
}

/**
 * Partial derivatives of the model at z with respect to (base, step, centre, τ, slope), analytic:
 * with σ = 1/(1 + e^(−(z − centre)/τ)), ∂/∂base = 1, ∂/∂step = σ, ∂/∂centre = −step·σ(1 − σ)/τ,
 * ∂/∂τ = −step·σ(1 − σ)·(z − centre)/τ², ∂/∂slope = z − zReference (derived).
 */
export function sigmoidJacobian(edge: Pick<SigmoidEdge, "step" | "centre" | "tau" | "zReference">, z: number): number[] {
  const sg = 1 / (1 + Math.exp(-(z - edge.centre) / edge.tau));
  const d = edge.step * sg * (1 - sg);
  return [1, sg, -d / edge.tau, (-d * (z - edge.centre)) / edge.tau ** 2, z - edge.zReference];
}
