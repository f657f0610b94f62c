/**
 * Linear least squares min ‖A·c − y‖₂ by Householder QR (Golub & Van Loan,
 * Matrix Computations, 4th ed., §5.2–5.3: A = QR, c = R⁻¹·Qᵀy), for a tall
 * matrix with a few columns. The arithmetic is that of the JAMA QR
 * decomposition (Hicks et al., JAMA, NIST/MathWorks 1998) step by step — the
 * column norms by the overflow-safe hypot recurrence, the reflections, then
 * back substitution — which is also what ml-matrix's `solve(A, y)` runs for a
 * non-square A, so the coefficients equal those to the last bit; here the
 * matrix is one Float64Array (column-major) and no Matrix objects are made,
 * which matters when it runs for every field sweep.
 *
 * `a` holds column j at a[j·m … j·m + m − 1] and is overwritten (the
 * reflections); `y` (length m) is not changed. Returns the n coefficients.
 * Throws RangeError when the sizes do not agree and Error("Matrix is rank
 * deficient") when a column is a combination of the others (a zero diagonal of R).
 */
export function householderLeastSquares(a: Float64Array, m: number, n: number, y: ArrayLike<number>): Float64Array {
  if (a.length !== m * n || y.length !== m) throw new RangeError(`householderLeastSquares: a ${a.length}-value matrix for ${m} × ${n}, ${y.length} data`);
  const rdiag = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const ck = k * m;
    let nrm = 0;
    for (let i = k; i < m; i++) nrm = hypotenuse(nrm, a[ck + i]);
    if (nrm !== 0) {
      if (a[ck + k] < 0) nrm = -nrm;
      for (let i = k; i < m; i++) a[ck + i] = a[ck + i] / nrm;
      a[ck + k] = a[ck + k] + 1;
      for (let j = k + 1; j < n; j++) {
        const cj = j * m;
        let s = 0;
        for (let i = k; i < m; i++) s += a[ck + i] * a[cj + i];
        s = -s / a[ck + k];
        for (let i = k; i < m; i++) a[cj + i] = a[cj + i] + s * a[ck + i];
      }
    }
    rdiag[k] = -nrm;
  }
  for (let k = 0; k < n; k++) if (rdiag[k] === 0) throw new Error("Matrix is rank deficient");
  const x = Float64Array.from(y);
  for (let k = 0; k < n; k++) {
    const ck = k * m;
    let s = 0;
    for (let i = k; i < m; i++) s += a[ck + i] * x[i];
    s = -s / a[ck + k];
    for (let i = k; i < m; i++) x[i] = x[i] + s * a[ck + i];
  }
  for (let k = n - 1; k >= 0; k--) {
    x[k] = x[k] / rdiag[k];
    for (let i = 0; i < k; i++) x[i] = x[i] - x[k] * a[k * m + i];
  }
  return x.slice(0, n);
}

/** √(a² + b²) without overflow or underflow, as JAMA computes it. */
function hypotenuse(a: number, b: number): number {
  if (Math.abs(a) > Math.abs(b)) {
    const r = b / a;
    return Math.abs(a) * Math.sqrt(1 + r * r);
  }
  if (b !== 0) {
    const r = a / b;
    return Math.abs(b) * Math.sqrt(1 + r * r);
  }
  return 0;
}
