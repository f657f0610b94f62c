/**
 * Lowest eigenvalue and eigenvector of a real symmetric tridiagonal matrix.
 *
 * Method: bisection on the Sturm sequence count, then inverse iteration
 * (Wilkinson, "The Algebraic Eigenvalue Problem", Oxford 1965, §5.37–5.47 and
 * §9.47; Golub & Van Loan, "Matrix Computations", 4th ed. 2013, §8.4.1
 * (bisection, Sturm sequence) and §8.2.2 (inverse iteration)).
 *  - count(λ): the number of eigenvalues below λ equals the number of negative
 *    pivots q_i of the LDLᵀ factorisation of T − λI:
 *    q_1 = d_1 − λ, q_i = d_i − λ − e_{i−1}²/q_{i−1} (a zero pivot is nudged
 *    to a tiny negative number, the usual safeguard).
 *  - bisection between the Gershgorin bounds keeps [lo, hi] with count(lo) = 0
 *    and count(hi) ≥ 1 until hi − lo is below `tolerance` (absolute, in the
 *    matrix's unit) or the floating-point resolution of the bounds.
 *  - inverse iteration solves (T − lo·I) v_{k+1} = v_k by the Thomas algorithm
 *    (tridiagonal Gaussian elimination without pivoting). count(lo) = 0 means
 *    T − lo·I is positive definite, so elimination without pivoting is stable;
 *    its smallest eigenvalue λ₁ − lo is tiny, so 3 iterations converge the
 *    vector to double precision whenever λ₂ − λ₁ ≫ hi − lo.
 * Written here because no maintained JavaScript package offers a symmetric
 * tridiagonal eigensolver (general dense solvers cost O(n³) for n ≈ 4000).
 *
 * `upperBound` (optional): a value known to lie at or above the lowest
 * eigenvalue, such as the Rayleigh quotient vᵀTv/vᵀv of any trial vector
 * (Courant–Fischer min-max theorem; Golub & Van Loan §8.1.1); when the Sturm
 * count confirms it (count ≥ 1), bisection starts from it instead of the
 * Gershgorin upper bound, which for a fine finite-difference grid lies far
 * above the lowest eigenvalue (saving ~log2 of the ratio in steps).
 * `diagonal` has n entries, `offDiagonal` n − 1 (element i couples i and i+1).
 * Returns the eigenvalue and the eigenvector normalised to Σ v_i² = 1 with a
 * non-negative sum. Throws RangeError for n < 1, mismatched lengths or
 * non-finite entries (programming errors).
 */

export interface GroundState {
  value: number;
  vector: Float64Array;
}

/** Number of eigenvalues of the tridiagonal matrix strictly below λ (Sturm count). */
export function sturmCount(d: ArrayLike<number>, e: ArrayLike<number>, lambda: number): number {
  let count = 0;
  let q = d[0] - lambda;
  const tiny = 1e-300;
  if (q < 0) count++;
  for (let i = 1; i < d.length; i++) {
    if (q === 0) q = -tiny;
    q = d[i] - lambda - (e[i - 1] * e[i - 1]) / q;
    if (q < 0) count++;
  }
  return count;
}

export function tridiagonalGroundState(diagonal: ArrayLike<number>, offDiagonal: ArrayLike<number>, tolerance = 0, upperBound?: number): GroundState {
  const n = diagonal.length;
  if (n < 1) throw new RangeError("tridiagonalGroundState: empty matrix");
  if (offDiagonal.length !== n - 1)
    throw new RangeError(`tridiagonalGroundState: ${n} diagonal entries need ${n - 1} off-diagonal ones, got ${offDiagonal.length}`);
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.abs(offDiagonal[i - 1]) : 0) + (i < n - 1 ? Math.abs(offDiagonal[i]) : 0);
    if (!Number.isFinite(diagonal[i]) || !Number.isFinite(r)) throw new RangeError(`tridiagonalGroundState: non-finite entry at row ${i}`);
    lo = Math.min(lo, diagonal[i] - r);
    hi = Math.max(hi, diagonal[i] + r);
  }
  // Gershgorin: every eigenvalue lies in [lo, hi]; widen a little so count(lo) = 0 and count(hi) = n.
  // (Relative to the matrix's scale, not to 1: in SI units (J) a pad of 1e-12 would dwarf every eigenvalue.)
  const scale = Math.max(Math.abs(lo), Math.abs(hi));
  const pad = 1e-10 * (scale > 0 ? scale : 1);
  lo -= pad;
  hi += pad;
  if (upperBound !== undefined && upperBound > lo && upperBound < hi && sturmCount(diagonal, offDiagonal, upperBound) >= 1) hi = upperBound;
  // The Sturm count is exact for a matrix within a few ulps of ‖T‖ of this one (backward stable), so
  // bisecting below that resolution gains nothing.
  const resolution = Math.max(tolerance, 4 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi)));
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (!(mid > lo && mid < hi) || hi - lo <= resolution) break;
    if (sturmCount(diagonal, offDiagonal, mid) >= 1) hi = mid;
    else lo = mid;
  }
  const vector = inverseIteration(diagonal, offDiagonal, lo, 3);
  return { value: 0.5 * (lo + hi), vector };
}

/** Inverse iteration with shift σ below the lowest eigenvalue (T − σI positive definite), Thomas algorithm. */
function inverseIteration(d: ArrayLike<number>, e: ArrayLike<number>, shift: number, iterations: number): Float64Array {
  const n = d.length;
  // Factorise once: pivots p_i and multipliers m_i of T − σI.
  const pivot = new Float64Array(n);
  const mult = new Float64Array(n);
  pivot[0] = d[0] - shift;
  for (let i = 1; i < n; i++) {
    mult[i] = e[i - 1] / pivot[i - 1];
    pivot[i] = d[i] - shift - mult[i] * e[i - 1];
  }
  let v = new Float64Array(n).fill(1 / Math.sqrt(n));
  for (let k = 0; k < iterations; k++) {
    const y = new Float64Array(n);
    y[0] = v[0];
    for (let i = 1; i < n; i++) y[i] = v[i] - mult[i] * y[i - 1];
    const x = new Float64Array(n);
    x[n - 1] = y[n - 1] / pivot[n - 1];
    for (let i = n - 2; i >= 0; i--) x[i] = (y[i] - e[i] * x[i + 1]) / pivot[i];
    let norm = 0;
    let sum = 0;
    for (let i = 0; i < n; i++) {
      norm += x[i] * x[i];
      sum += x[i];
    }
    const s = (sum < 0 ? -1 : 1) / Math.sqrt(norm);
    for (let i = 0; i < n; i++) x[i] *= s;
    v = x;
  }
  return v;
}
