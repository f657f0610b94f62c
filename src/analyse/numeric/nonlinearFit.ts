/**
 * Nonlinear least squares by Levenberg–Marquardt, with parameter standard errors.
 *
 * Method: Levenberg (1944), Marquardt (1963), as implemented by the
 * `ml-levenberg-marquardt` package. The wrapper fits in scaled parameters
 * (each divided by a caller-given scale, so every parameter is O(1) and the
 * library's absolute step and tolerance make sense), then computes the
 * covariance at the solution as s²·(JᵀJ)⁻¹ with s² = SS_res/(n − k) and a
 * central-difference Jacobian (common practice; Press et al., Numerical
 * Recipes, 3rd ed., §15.5). R² = 1 − SS_res/SS_tot.
 *
 * Parameters listed in `fixed` are held at their initial value and get a
 * standard error of 0. Throws RangeError when there are fewer points than free
 * parameters.
 */
import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { Matrix, inverse } from "ml-matrix";

export type Model = (params: number[]) => (x: number) => number;
/** Partial derivatives ∂f/∂p_i of the model at x, for all parameters (fixed ones included). */
export type ModelJacobian = (params: number[]) => (x: number) => ArrayLike<number>;

export interface NonlinearFitOptions {
  initial: number[];
  /** Typical magnitude of each parameter (defaults to |initial| or 1). */
  scale?: number[];
  min?: number[];
  max?: number[];
  /** Indices of parameters held fixed. */
  fixed?: number[];
  maxIterations?: number;
  /**
   * Analytic Jacobian of the model, used in the Levenberg–Marquardt steps
   * instead of central differences (one model evaluation per step instead of
   * 2k + 1). The standard errors still use the central-difference Jacobian.
   */
  jacobian?: ModelJacobian;
}

export interface NonlinearFit {
  params: number[];
  stdErr: number[];
  r2: number;
  ssRes: number;
  iterations: number;
  n: number;
}

/** Iterations per pass, and the relative change of SS_res below which the fit has converged. */
const PASS_ITERATIONS = 20;
const RELATIVE_TOLERANCE = 1e-10;

/**
 * ml-levenberg-marquardt stops only on an absolute error tolerance, which a
 * fit to real data never reaches, so it would always run to maxIterations.
 * This runs it in passes of PASS_ITERATIONS and stops once a pass improves the
 * sum of squared residuals by less than RELATIVE_TOLERANCE of itself (a
 * relative-reduction test, as in Moré's MINPACK lmder; common practice).
 */
function runToConvergence(
  xs: number[],
  ys: number[],
  model: (u: number[]) => (x: number) => number,
  u0: number[],
  o: { minValues?: number[]; maxValues?: number[]; maxIterations: number; jacobianFunction?: (u: number[]) => (x: number) => number[] },
): { parameterValues: number[]; parameterError: number; iterations: number } {
  let u = u0;
  let best = Infinity;
  let iterations = 0;
  while (iterations < o.maxIterations) {
    const r = levenbergMarquardt({ x: xs, y: ys }, model, {
      initialValues: u,
      minValues: o.minValues,
      maxValues: o.maxValues,
      damping: 1e-2,
      gradientDifference: 1e-6,
      centralDifference: true,
      maxIterations: Math.min(PASS_ITERATIONS, o.maxIterations - iterations),
      errorTolerance: 1e-14,
      improvementThreshold: 1e-6,
      jacobianFunction: o.jacobianFunction,
    });
    iterations += Math.max(1, r.iterations);
    const improved = r.parameterError < best;
    if (improved) u = r.parameterValues;
    const converged = !improved || best - r.parameterError <= RELATIVE_TOLERANCE * best;
    if (improved) best = r.parameterError;
    if (converged || r.iterations < PASS_ITERATIONS) break;
  }
  return { parameterValues: u, parameterError: best, iterations };
}

/** The Jacobian in the fitter's scaled free parameters: ∂f/∂u_j = ∂f/∂p_i · scale_i. */
function scaledJacobian(jacobian: ModelJacobian, toFull: (u: number[]) => number[], free: number[], scale: number[]) {
  return (u: number[]) => {
    const d = jacobian(toFull(u));
    // The fitter copies each row out at once, so one buffer serves every point.
    const row = new Array<number>(free.length);
    return (x: number): number[] => {
      const g = d(x);
      for (let j = 0; j < free.length; j++) row[j] = g[free[j]] * scale[free[j]];
      return row;
    };
  };
}

export function nonlinearFit(model: Model, x: ArrayLike<number>, y: ArrayLike<number>, options: NonlinearFitOptions): NonlinearFit {
  const k = options.initial.length;
  const fixed = new Set(options.fixed ?? []);
  const free = [...Array(k).keys()].filter((i) => !fixed.has(i));
  const n = x.length;
  if (n < free.length + 1) {
    throw new RangeError(`nonlinearFit: ${n} points cannot determine ${free.length} free parameters`);
  }
  const scale = options.initial.map((v, i) => {
    const s = options.scale?.[i] ?? Math.abs(v);
    return s > 0 && Number.isFinite(s) ? s : 1;
  });
  const toFull = (u: number[]): number[] => {
    const p = options.initial.slice();
    free.forEach((i, j) => (p[i] = u[j] * scale[i]));
    return p;
  };
  const xs = Array.from(x);
  const ys = Array.from(y);
  const scaledModel = (u: number[]) => model(toFull(u));
  const u0 = free.map((i) => options.initial[i] / scale[i]);
  const result = runToConvergence(xs, ys, scaledModel, u0, {
    minValues: options.min ? free.map((i) => options.min![i] / scale[i]) : undefined,
    maxValues: options.max ? free.map((i) => options.max![i] / scale[i]) : undefined,
    maxIterations: options.maxIterations ?? 300,
    jacobianFunction: options.jacobian && scaledJacobian(options.jacobian, toFull, free, scale),
  });
  const params = toFull(result.parameterValues);
  const f = model(params);
  let ssRes = 0;
  let mean = 0;
  for (const v of ys) mean += v;
  mean /= n;
  let ssTot = 0;
  for (let i = 0; i < n; i++) {
    const r = ys[i] - f(xs[i]);
    ssRes += r * r;
    ssTot += (ys[i] - mean) ** 2;
  }
  const stdErr = new Array(k).fill(0);
  if (n > free.length && free.length > 0) {
    const J = new Matrix(n, free.length);
    free.forEach((pi, j) => {
      const h = 1e-6 * scale[pi];
      const up = params.slice();
      const dn = params.slice();
      up[pi] += h;
      dn[pi] -= h;
      const fu = model(up);
      const fd = model(dn);
      for (let i = 0; i < n; i++) J.set(i, j, (fu(xs[i]) - fd(xs[i])) / (2 * h));
    });
    const s2 = ssRes / (n - free.length);
    try {
      const cov = inverse(J.transpose().mmul(J)).mul(s2);
      free.forEach((pi, j) => (stdErr[pi] = Math.sqrt(Math.max(0, cov.get(j, j)))));
    } catch {
      free.forEach((pi) => (stdErr[pi] = Number.POSITIVE_INFINITY));
    }
  }
  return { params, stdErr, r2: ssTot === 0 ? 1 : 1 - ssRes / ssTot, ssRes, iterations: result.iterations, n };
}
