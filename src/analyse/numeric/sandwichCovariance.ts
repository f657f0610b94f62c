/**
 * Covariance of least-squares estimates when each point's variance is known
 * but not equal: the "sandwich" form C = (JᵀJ)⁻¹·(Jᵀ·diag(σ²)·J)·(JᵀJ)⁻¹
 * for an unweighted fit with Jacobian J (n × k) at the solution. With σ² from
 * a model (here the Poisson variance of the fitted counts) it is the
 * model-based sandwich; Huber (Proc. 5th Berkeley Symp. 1, 221 (1967)) and
 * White (Econometrica 48, 817 (1980)) put the squared residuals in its place,
 * which also covers a wrong model — the caller scales for that (rsmPeakFind.ts). Used
 * for fits to counts, whose variance is the expected count (Poisson), where the
 * pooled s²·(JᵀJ)⁻¹ understates the scatter of a peak's centre: the centre is
 * set by the high-count points, the pooled variance by the many low-count ones.
 *
 * Returns the k × k covariance as nested arrays. Throws (ml-matrix) when JᵀJ is
 * singular — a programming or degenerate-data error the caller catches.
 */
import { Matrix, inverse } from "ml-matrix";

/** Sandwich covariance from Jacobian rows and per-point variances (see module comment). */
export function sandwichCovariance(rows: ArrayLike<number>[], variances: ArrayLike<number>): number[][] {
  const k = rows[0]?.length ?? 0;
  const a = Matrix.zeros(k, k);
  const b = Matrix.zeros(k, k);
  rows.forEach((g, i) => {
    for (let p = 0; p < k; p++) {
      for (let q = 0; q < k; q++) {
        const gg = g[p] * g[q];
        a.set(p, q, a.get(p, q) + gg);
        b.set(p, q, b.get(p, q) + gg * variances[i]);
      }
    }
  });
  const ai = inverse(a);
  return ai.mmul(b).mmul(ai).to2DArray();
}
