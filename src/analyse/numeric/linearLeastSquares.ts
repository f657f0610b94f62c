/**
 * Small dense linear least squares: minimise Σ_i (y_i − Σ_j a_ij·c_j)² for a
 * few columns (≤ ~10), by the normal equations AᵀA·c = Aᵀy with column
 * scaling and a Cholesky factorisation (common practice; Golub & Van Loan,
 * Matrix Computations, 4th ed., §5.3). Columns are given column-major as
 * Float64Arrays of equal length. Returns null when AᵀA is not positive
 * definite (collinear or empty columns); throws RangeError when lengths differ.
 */
export interface LinearSolution {
  /** Coefficients c_j. */
  coef: Float64Array;
  /** Residual sum of squares Σ (y − A·c)². */
  ssRes: number;
}

export function linearLeastSquares(columns: Float64Array[], y: ArrayLike<number>): LinearSolution | null {
  const m = columns.length;
  const n = y.length;
  for (const c of columns) if (c.length !== n) throw new RangeError(`linearLeastSquares: column of ${c.length} values for ${n} data`);
  const norm = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    let s = 0;
    const c = columns[j];
    for (let i = 0; i < n; i++) s += c[i] * c[i];
    norm[j] = s > 0 ? 1 / Math.sqrt(s) : 0;
  }
  const g = new Float64Array(m * m);
  const r = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const cj = columns[j];
    let s = 0;
    for (let i = 0; i < n; i++) s += cj[i] * y[i];
    r[j] = s * norm[j];
    for (let l = 0; l <= j; l++) {
      const cl = columns[l];
      let t = 0;
      for (let i = 0; i < n; i++) t += cj[i] * cl[i];
      g[j * m + l] = g[l * m + j] = t * norm[j] * norm[l];
    }
  }
  const coef = choleskySolve(g, r, m);
  if (!coef) return null;
  for (let j = 0; j < m; j++) coef[j] *= norm[j];
  let ssRes = 0;
  for (let i = 0; i < n; i++) {
    let f = 0;
    for (let j = 0; j < m; j++) f += columns[j][i] * coef[j];
    ssRes += (y[i] - f) ** 2;
  }
  return { coef, ssRes };
}

/**
 * Solves G·x = r for a symmetric positive-definite m×m matrix G (row-major,
 * overwritten by its Cholesky factor L, lower triangle). Returns null when G
 * is not positive definite (a pivot ≤ 1e-13 of the matrix's scale).
 */
export function choleskySolve(g: Float64Array, r: ArrayLike<number>, m: number): Float64Array | null {
  let top = 0;
  for (let j = 0; j < m; j++) top = Math.max(top, g[j * m + j]);
  for (let j = 0; j < m; j++) {
    let d = g[j * m + j];
    for (let k = 0; k < j; k++) d -= g[j * m + k] ** 2;
    if (!(d > 1e-13 * top)) return null;
    d = Math.sqrt(d);
    g[j * m + j] = d;
    for (let i = j + 1; i < m; i++) {
      let s = g[i * m + j];
      for (let k = 0; k < j; k++) s -= g[i * m + k] * g[j * m + k];
      g[i * m + j] = s / d;
    }
  }
  const z = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let s = r[i];
    for (let k = 0; k < i; k++) s -= g[i * m + k] * z[k];
    z[i] = s / g[i * m + i];
  }
  const x = new Float64Array(m);
  for (let i = m - 1; i >= 0; i--) {
    let s = z[i];
    for (let k = i + 1; k < m; k++) s -= g[k * m + i] * x[k];
    x[i] = s / g[i * m + i];
  }
  return x;
}
