/**
 * Covariance of unweighted least-squares estimates when the noise of the
 * fitted points is correlated with a known structure V and an unknown scale σ².
 *
 * Method: for a fit linearised at the solution with Jacobian J (n × k) and
 * noise covariance σ²·V, the ordinary least-squares estimate has covariance
 *   C = σ²·(JᵀJ)⁻¹·(JᵀVJ)·(JᵀJ)⁻¹
 * (the sandwich form for correlated errors; e.g. Seber & Wild, Nonlinear
 * Regression, Wiley 1989, §2.1 and ch. 6 — from memory). The scale comes from the
 * residuals r through the expectation of a quadratic form, E[εᵀAε] = σ²·tr(AV)
 * (derived), with A = I − H, H = J(JᵀJ)⁻¹Jᵀ the hat matrix:
 *   σ̂² = rᵀr / tr((I − H)·V) = rᵀr / (tr V − tr((JᵀJ)⁻¹·JᵀVJ)),
 * which for V = I is the usual SS_res/(n − k). Using s² = SS_res/(n − k) with
 * correlated points both misjudges σ² and ignores the correlation in the
 * middle factor. Throws (ml-matrix) when JᵀJ is singular.
 */
import { Matrix, inverse } from "ml-matrix";

export interface CorrelatedNoiseCovariance {
  /** k × k covariance of the parameters. */
  covariance: number[][];
  /** Estimated noise scale σ² (the variance V is given per unit σ²). */
  scale: number;
  /** Effective residual degrees of freedom tr((I − H)·V) / (mean diagonal of V). */
  dof: number;
}

/** See the module comment. rows: n Jacobian rows of length k; v: n × n noise covariance per unit σ²; residuals: n. */
export function correlatedNoiseCovariance(rows: ArrayLike<number>[], v: number[][], residuals: ArrayLike<number>): CorrelatedNoiseCovariance {
  const n = rows.length;
  const J = new Matrix(rows.map((r) => Array.from(r)));
  const V = new Matrix(v);
  const A = J.transpose().mmul(J);
  const Ai = inverse(A);
  const B = J.transpose().mmul(V).mmul(J);
  let trV = 0;
  for (let i = 0; i < n; i++) trV += v[i][i];
  const AiB = Ai.mmul(B);
  let trAiB = 0;
  for (let i = 0; i < AiB.rows; i++) trAiB += AiB.get(i, i);
  let ss = 0;
  for (let i = 0; i < n; i++) ss += residuals[i] ** 2;
  const denom = trV - trAiB;
  const scale = ss / denom;
  return { covariance: Ai.mmul(B).mmul(Ai).mul(scale).to2DArray(), scale, dof: (denom * n) / trV };
}
