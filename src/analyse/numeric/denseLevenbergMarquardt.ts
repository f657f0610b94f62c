/**
 * Levenberg–Marquardt for a model with an analytic Jacobian and few
 * parameters (≤ ~12), fast enough to run per field sweep.
 *
 * Method: Levenberg (1944), Marquardt (1963) with Marquardt's scaling
 * (damping λ·diag(JᵀJ)), as in Moré, "The Levenberg–Marquardt algorithm:
 * implementation and theory", Springer LNM 630 (1978) and Press et
 * al., Numerical Recipes, 3rd ed., §15.5. A step is taken when it lowers
 * SS_res (λ /= 10), otherwise λ *= 10; it stops when an accepted step lowers
 * SS_res by less than 1e-10 of itself, or after maxIterations. Parameters may
 * be bounded (steps are clipped) or held fixed. The standard errors are the
 * square roots of the diagonal of s²·(JᵀJ)⁻¹ at the solution, s² = SS_res/(n − k)
 * with k the number of free parameters (common practice; the same as
 * nonlinearFit.ts, which uses ml-levenberg-marquardt and suits general use).
 * Returns null when JᵀJ is singular at the start. Throws RangeError when
 * there are fewer points than free parameters + 1.
 */
import { choleskySolve } from "./linearLeastSquares.ts";

export interface DenseProblem {
  /** Number of data points. */
  n: number;
  y: ArrayLike<number>;
  /** Model value at point i for parameters p. */
  value: (p: number[], i: number) => number;
  /** Writes ∂model/∂p_j at point i into `out` (all parameters). */
  gradient: (p: number[], i: number, out: Float64Array) => void;
  /**
   * Optional: both at once, gradient into `out`, returning the value; must give
   * exactly the numbers of `value` and `gradient` (a model that shares work between them).
   */
  valueAndGradient?: (p: number[], i: number, out: Float64Array) => number;
}

export interface DenseFit {
  params: number[];
  stdErr: number[];
  ssRes: number;
  iterations: number;
}

/**
 * Solves A·x = r (A symmetric positive definite) after scaling A to unit
 * diagonal, so parameters of any size factor alike. d, b, rs: work arrays of
 * m, m·m and m entries (overwritten).
 */
function scaledSolve(
  a: Float64Array,
  r: ArrayLike<number>,
  m: number,
  d: Float64Array = new Float64Array(m),
  b: Float64Array = new Float64Array(m * m),
  rs: Float64Array = new Float64Array(m),
): Float64Array | null {
  for (let j = 0; j < m; j++) d[j] = a[j * m + j] > 0 ? 1 / Math.sqrt(a[j * m + j]) : 0;
  for (let i = 0; i < m; i++) {
    rs[i] = r[i] * d[i];
    for (let j = 0; j < m; j++) b[i * m + j] = a[i * m + j] * d[i] * d[j];
  }
  const x = choleskySolve(b, rs, m);
  if (!x) return null;
  for (let j = 0; j < m; j++) x[j] *= d[j];
  return x;
}

function ss(pr: DenseProblem, p: number[]): number {
  let s = 0;
  for (let i = 0; i < pr.n; i++) s += (pr.y[i] - pr.value(p, i)) ** 2;
  return s;
}

/** Work arrays of one fit, reused by every iteration. */
interface Work {
  /** JᵀJ and Jᵀr of the free parameters at the current point. */
  jtj: Float64Array;
  jtr: Float64Array;
  /** One row of J (all parameters); J's free columns (column-major, n per column) and the residuals. */
  row: Float64Array;
  jac: Float64Array;
  res: Float64Array;
  /** The damped JᵀJ and scaledSolve's work arrays. */
  a: Float64Array;
  d: Float64Array;
  b: Float64Array;
  rs: Float64Array;
}

/**
 * JᵀJ (free parameters) and Jᵀr at p, into w.jtj and w.jtr. J (free columns)
 * and r are stored first, then each entry is summed over the points in order
 * (i = 0, 1, …), one entry at a time: the same sums, in the same order, as
 * adding each point's products to every entry in turn.
 */
function normalEquations(pr: DenseProblem, p: number[], free: number[], w: Work): void {
  const m = free.length;
  const n = pr.n;
  const { jtj, jtr, row, jac, res } = w;
  const both = pr.valueAndGradient;
  for (let i = 0; i < n; i++) {
    let r: number;
    if (both) r = pr.y[i] - both(p, i, row);
    else {
      pr.gradient(p, i, row);
      r = pr.y[i] - pr.value(p, i);
    }
    res[i] = r;
    for (let a = 0; a < m; a++) jac[a * n + i] = row[free[a]];
  }
  for (let a = 0; a < m; a++) {
    const oa = a * n;
    let s = 0;
    for (let i = 0; i < n; i++) s += jac[oa + i] * res[i];
    jtr[a] = s;
    for (let b = 0; b <= a; b++) {
      const ob = b * n;
      let t = 0;
      for (let i = 0; i < n; i++) t += jac[oa + i] * jac[ob + i];
      jtj[a * m + b] = t;
    }
  }
  for (let a = 0; a < m; a++) for (let b = 0; b < a; b++) jtj[b * m + a] = jtj[a * m + b];
}

export function denseLevenbergMarquardt(
  pr: DenseProblem,
  initial: number[],
  o: { min?: number[]; max?: number[]; fixed?: number[]; maxIterations?: number } = {},
): DenseFit | null {
  const k = initial.length;
  const fixed = new Set(o.fixed ?? []);
  const free = [...Array(k).keys()].filter((i) => !fixed.has(i));
  const m = free.length;
  if (pr.n < m + 1) throw new RangeError(`denseLevenbergMarquardt: ${pr.n} points cannot determine ${m} free parameters`);
  const clip = (v: number, i: number) => Math.min(o.max?.[i] ?? Infinity, Math.max(o.min?.[i] ?? -Infinity, v));
  let p = initial.slice();
  let cost = ss(pr, p);
  let lambda = 1e-3;
  let iterations = 0;
  const w: Work = {
    jtj: new Float64Array(m * m),
    jtr: new Float64Array(m),
    row: new Float64Array(k),
    jac: new Float64Array(m * pr.n),
    res: new Float64Array(pr.n),
    a: new Float64Array(m * m),
    d: new Float64Array(m),
    b: new Float64Array(m * m),
    rs: new Float64Array(m),
  };
  normalEquations(pr, p, free, w);
  for (; iterations < (o.maxIterations ?? 50); iterations++) {
    let accepted = false;
    for (let tries = 0; tries < 12 && !accepted; tries++) {
      const a = w.a;
      a.set(w.jtj);
      for (let j = 0; j < m; j++) a[j * m + j] *= 1 + lambda;
      const step = scaledSolve(a, w.jtr, m, w.d, w.b, w.rs);
      if (!step) {
        lambda *= 10;
        continue;
      }
      const q = p.slice();
      free.forEach((pi, j) => (q[pi] = clip(p[pi] + step[j], pi)));
      const c = ss(pr, q);
      if (c < cost) {
        const gain = cost - c;
        p = q;
        const done = gain <= 1e-10 * cost;
        cost = c;
        lambda = Math.max(lambda / 10, 1e-9);
        accepted = true;
        normalEquations(pr, p, free, w);
        if (done) return finish(pr, p, free, cost, iterations + 1, w.jtj);
      } else lambda *= 10;
    }
    if (!accepted) break;
  }
  return finish(pr, p, free, cost, iterations, w.jtj);
}

function finish(pr: DenseProblem, p: number[], free: number[], cost: number, iterations: number, jtj: Float64Array): DenseFit {
  const m = free.length;
  const s2 = cost / Math.max(1, pr.n - m);
  const stdErr = new Array<number>(p.length).fill(0);
  for (let j = 0; j < m; j++) {
    const e = new Float64Array(m);
    e[j] = 1;
    const col = scaledSolve(jtj, e, m);
    stdErr[free[j]] = col ? Math.sqrt(Math.max(0, col[j] * s2)) : Number.POSITIVE_INFINITY;
  }
  return { params: p, stdErr, ssRes: cost, iterations };
}
