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
 * linearLeastSquares for many solves that share their first columns and the
 * data y: fixedColumnsSolver(fixed, y)(extra) gives exactly (bit for bit) what
 * linearLeastSquares([...fixed, ...extra], y) gives, with the sums that involve
 * only the fixed columns and y (their norms, Gram entries and products with y)
 * computed once. Every sum runs over the points in the same order as there,
 * so each number is the same. Throws RangeError when lengths differ.
 */
export function fixedColumnsSolver(fixed: Float64Array[], y: ArrayLike<number>): (extra: Float64Array[]) => LinearSolution | null {
  const mf = fixed.length;
  const n = y.length;
  for (const c of fixed) if (c.length !== n) throw new RangeError(`linearLeastSquares: column of ${c.length} values for ${n} data`);
  const squares = new Float64Array(mf);
  const withY = new Float64Array(mf);
  const gram = new Float64Array(mf * mf);
  for (let j = 0; j < mf; j++) {
    const cj = fixed[j];
    let s = 0;
    for (let i = 0; i < n; i++) s += cj[i] * cj[i];
    squares[j] = s;
    s = 0;
    for (let i = 0; i < n; i++) s += cj[i] * y[i];
    withY[j] = s;
    for (let l = 0; l <= j; l++) {
      const cl = fixed[l];
      let t = 0;
      for (let i = 0; i < n; i++) t += cj[i] * cl[i];
      gram[j * mf + l] = t;
    }
  }
  // The fixed columns row by row (rows[i·mf + l] = fixed[l][i]), read point by point below.
  const rows = new Float64Array(n * mf);
  for (let l = 0; l < mf; l++) for (let i = 0; i < n; i++) rows[i * mf + l] = fixed[l][i];
  return (extra) => {
    const me = extra.length;
    const m = mf + me;
    for (const c of extra) if (c.length !== n) throw new RangeError(`linearLeastSquares: column of ${c.length} values for ${n} data`);
    // The sums of the extra columns, all in one pass over the points (each sum still runs over i in order from 0):
    // acc[e·(m + 1) + l] = Σ extra_e·column_l for l ≤ mf + e (the square of extra_e at l = mf + e), acc[e·(m + 1) + m] = Σ extra_e·y.
    const w = m + 1;
    const acc = new Float64Array(me * w);
    if (me === 4) fourExtraSums(extra, rows, mf, y, acc);
    else
      for (let i = 0; i < n; i++) {
        const yi = y[i];
        for (let e = 0; e < me; e++) {
          const v = extra[e][i];
          const o = e * w;
          for (let l = 0; l < mf; l++) acc[o + l] += v * rows[i * mf + l];
          for (let l = 0; l <= e; l++) acc[o + mf + l] += v * extra[l][i];
          acc[o + m] += v * yi;
        }
      }
    const norm = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      const s = j < mf ? squares[j] : acc[(j - mf) * w + j];
      norm[j] = s > 0 ? 1 / Math.sqrt(s) : 0;
    }
    const g = new Float64Array(m * m);
    const r = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      r[j] = (j < mf ? withY[j] : acc[(j - mf) * w + m]) * norm[j];
      for (let l = 0; l <= j; l++) {
        const t = j < mf ? gram[j * mf + l] : acc[(j - mf) * w + l];
        g[j * m + l] = g[l * m + j] = t * norm[j] * norm[l];
      }
    }
    const coef = choleskySolve(g, r, m);
    if (!coef) return null;
    for (let j = 0; j < m; j++) coef[j] *= norm[j];
    let ssRes = 0;
    if (me === 4) {
      // As below, the four extra terms written out (the same sum, term by term in column order).
      const [ca, cb, cc, cd] = extra;
      const [ka, kb, kc, kd] = [coef[mf], coef[mf + 1], coef[mf + 2], coef[mf + 3]];
      for (let i = 0; i < n; i++) {
        let f = 0;
        for (let l = 0, o = i * mf; l < mf; l++) f += rows[o + l] * coef[l];
        f += ca[i] * ka;
        f += cb[i] * kb;
        f += cc[i] * kc;
        f += cd[i] * kd;
        ssRes += (y[i] - f) ** 2;
      }
    } else
      for (let i = 0; i < n; i++) {
        let f = 0;
        for (let l = 0; l < mf; l++) f += rows[i * mf + l] * coef[l];
        for (let e = 0; e < me; e++) f += extra[e][i] * coef[mf + e];
        ssRes += (y[i] - f) ** 2;
      }
    return { coef, ssRes };
  };
}

/**
 * The sums of fixedColumnsSolver for four extra columns a, b, c, d, written
 * out (one pass, the running sums in registers): as its general loop, each sum
 * over i in order from 0.
 */
function fourExtraSums(extra: Float64Array[], rows: Float64Array, mf: number, y: ArrayLike<number>, acc: Float64Array): void {
  const [ca, cb, cc, cd] = extra;
  const n = y.length;
  const m = mf + 4;
  const w = m + 1;
  let aa = 0,
    ba = 0,
    bb = 0,
    ca_ = 0,
    cb_ = 0,
    cc_ = 0,
    da = 0,
    db = 0,
    dc = 0,
    dd = 0;
  let ay = 0,
    by = 0,
    cy = 0,
    dy = 0;
  const cross = new Float64Array(4 * mf);
  for (let i = 0; i < n; i++) {
    const a = ca[i];
    const b = cb[i];
    const c = cc[i];
    const d = cd[i];
    const yi = y[i];
    for (let l = 0, o = i * mf; l < mf; l++) {
      const f = rows[o + l];
      cross[l] += a * f;
      cross[mf + l] += b * f;
      cross[2 * mf + l] += c * f;
      cross[3 * mf + l] += d * f;
    }
    aa += a * a;
    ay += a * yi;
    ba += b * a;
    bb += b * b;
    by += b * yi;
    ca_ += c * a;
    cb_ += c * b;
    cc_ += c * c;
    cy += c * yi;
    da += d * a;
    db += d * b;
    dc += d * c;
    dd += d * d;
    dy += d * yi;
  }
  for (let e = 0; e < 4; e++) for (let l = 0; l < mf; l++) acc[e * w + l] = cross[e * mf + l];
  acc[mf] = aa;
  acc[m] = ay;
  acc[w + mf] = ba;
  acc[w + mf + 1] = bb;
  acc[w + m] = by;
  acc[2 * w + mf] = ca_;
  acc[2 * w + mf + 1] = cb_;
  acc[2 * w + mf + 2] = cc_;
  acc[2 * w + m] = cy;
  acc[3 * w + mf] = da;
  acc[3 * w + mf + 1] = db;
  acc[3 * w + mf + 2] = dc;
  acc[3 * w + mf + 3] = dd;
  acc[3 * w + m] = dy;
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
