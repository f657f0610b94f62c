/**
 * Field (anti)symmetrisation of magnetoresistance.
 *
 * ρxx(B) ← [ρxx(B) + ρxx(−B)]/2 and Rxy(B) ← [Rxy(B) − Rxy(−B)]/2 remove the
 * admixture of Hall voltage into Rxx (and of Rxx into Rxy) caused by
 * misaligned contacts. The basis is Onsager–Casimir reciprocity,
 * R_mn,kl(B) = R_kl,mn(−B) (Büttiker, Phys. Rev. Lett. 57, 1761 (1986)).
 *
 * Both branches are interpolated linearly onto the |B| values of the positive
 * branch that lie inside the range both signs cover (plus B = 0 when measured).
 * A sweep with one field sign only is returned unsymmetrised with
 * `symmetrised: false` (the validator has already warned).
 */
import { bracket } from "../numeric/interpolate.ts";

export interface SymmetrisedTrace {
  /** |B| grid, T, ascending. */
  b: Float64Array;
  /** Even part (parity "even") or odd part (parity "odd") at each |B|. */
  y: Float64Array;
  symmetrised: boolean;
}

/** Indices of `idx` ordered by key(i) = sign·B[i] ascending, stable (equal keys keep their order), as sortByX orders. */
function sortIndices(idx: Int32Array, B: ArrayLike<number>, sign: 1 | -1): Int32Array {
  const key = (i: number) => sign * B[i];
  let ascending = true;
  let descending = true;
  for (let k = 1; k < idx.length && (ascending || descending); k++) {
    const a = sign * B[idx[k - 1]];
    const b = sign * B[idx[k]];
    if (!(a <= b)) ascending = false;
    if (!(a > b)) descending = false;
  }
  if (ascending) return idx;
  // Strictly descending (a branch swept towards zero): no ties, so the sorted order is the reverse.
  if (descending) return idx.reverse();
  return new Int32Array(Array.from(idx).sort((a, b) => key(a) - key(b)));
}

/**
 * The part of symmetrisation that depends only on the field column: the two
 * branches sorted by |B|, the common |B| grid, and where each grid point falls
 * on the negative branch. Computed once per sweep and shared by its traces.
 */
export interface FieldBranches {
  /** Input indices of B ≥ 0, ascending in B; of B ≤ 0, ascending in |B|. */
  posIdx: Int32Array;
  negIdx: Int32Array;
  posX: Float64Array;
  negX: Float64Array;
  /** Points with B > 0, B < 0. */
  posCount: number;
  negCount: number;
  /** Positions in posIdx of the grid (|B| inside the range both signs cover), first and last + 1. */
  from: number;
  to: number;
  /** Per grid point: bracketing negative-branch positions and the linear weight (lo === hi: take lo). */
  lo: Int32Array;
  hi: Int32Array;
  t: Float64Array;
}

/** Splits and sorts a field column (T) for symmetriseBranches. */
export function fieldBranches(B: ArrayLike<number>): FieldBranches {
  let nPos = 0;
  let nNeg = 0;
  for (let i = 0; i < B.length; i++) {
    if (B[i] >= 0) nPos++;
    if (B[i] <= 0) nNeg++;
  }
  let posIdx: Int32Array = new Int32Array(nPos);
  let negIdx: Int32Array = new Int32Array(nNeg);
  let posCount = 0;
  let negCount = 0;
  for (let i = 0, p = 0, q = 0; i < B.length; i++) {
    if (B[i] >= 0) posIdx[p++] = i;
    if (B[i] <= 0) negIdx[q++] = i;
    if (B[i] > 0) posCount++;
    if (B[i] < 0) negCount++;
  }
  posIdx = sortIndices(posIdx, B, 1);
  negIdx = sortIndices(negIdx, B, -1);
  const posX = new Float64Array(posIdx.length);
  for (let k = 0; k < posIdx.length; k++) posX[k] = B[posIdx[k]];
  const negX = new Float64Array(negIdx.length);
  for (let k = 0; k < negIdx.length; k++) negX[k] = -B[negIdx[k]];
  let from = 0;
  let to = 0;
  if (posCount >= 2 && negCount >= 2) {
    const top = Math.min(posX[posX.length - 1], negX[negX.length - 1]);
    const bottom = Math.max(posX[0], negX[0]);
    while (from < posX.length && posX[from] < bottom) from++;
    to = from;
    while (to < posX.length && posX[to] <= top) to++;
  }
  const lo = new Int32Array(to - from);
  const hi = new Int32Array(to - from);
  const t = new Float64Array(to - from);
  if (ascendingGrid(negX) && ascendingGrid(posX)) {
    // The grid points ascend, so where they fall on negX only moves up: one walk instead of a bisection per point.
    for (let g = 0, last = 0; g < to - from; g++) last = walkInto(negX, posX[from + g], last, g, lo, hi, t);
  } else for (let g = 0; g < to - from; g++) bracketInto(negX, posX[from + g], g, lo, hi, t);
  return { posIdx, negIdx, posX, negX, posCount, negCount, from, to, lo, hi, t };
}

/** True when x[k − 1] ≤ x[k] throughout and x holds no NaN. */
function ascendingGrid(x: Float64Array): boolean {
  for (let k = 1; k < x.length; k++) if (!(x[k - 1] <= x[k])) return false;
  return x.length === 0 || !Number.isNaN(x[0]);
}

/**
 * bracketInto for an ascending grid x without NaN and an `at` no lower than
 * the previous call's, walking up from `last` (the previous call's return, 0 at
 * first). On such a grid bracket's bisection gives 0 when at < x[0] or n ≤ 1,
 * else min(the last index with x ≤ at, n − 2): the same interval and weight.
 * Returns the index the walk reached (≤ the last index with x ≤ at).
 */
function walkInto(x: Float64Array, at: number, last: number, g: number, los: Int32Array, his: Int32Array, ts: Float64Array): number {
  const n = x.length;
  let k = last;
  while (k + 1 < n && x[k + 1] <= at) k++;
  const lo = n < 2 || !(x[0] <= at) ? 0 : Math.min(k, n - 2);
  const hi = Math.min(lo + 1, n - 1);
  if (x[hi] === x[lo]) {
    los[g] = his[g] = lo;
    return k;
  }
  los[g] = lo;
  his[g] = hi;
  ts[g] = (at - x[lo]) / (x[hi] - x[lo]);
  return k;
}

/** Where `at` falls on the ascending grid x (the bisection interpolateLinear uses), stored at grid point g. */
function bracketInto(x: Float64Array, at: number, g: number, los: Int32Array, his: Int32Array, ts: Float64Array): void {
  const lo = bracket(x, at);
  const hi = Math.min(lo + 1, x.length - 1);
  if (x[hi] === x[lo]) {
    los[g] = his[g] = lo;
    return;
  }
  los[g] = lo;
  his[g] = hi;
  ts[g] = (at - x[lo]) / (x[hi] - x[lo]);
}

/** symmetriseField for a trace y measured on the field column that `br` was made from. */
export function symmetriseBranches(br: FieldBranches, y: ArrayLike<number>, parity: "even" | "odd"): SymmetrisedTrace {
  if (br.posCount < 2 || br.negCount < 2) {
    const usePos = br.posCount >= br.negCount;
    const idx = usePos ? br.posIdx : br.negIdx;
    const sign = usePos || parity === "even" ? 1 : -1;
    const one = new Float64Array(idx.length);
    for (let k = 0; k < idx.length; k++) one[k] = sign * y[idx[k]];
    return { b: (usePos ? br.posX : br.negX).slice(), y: one, symmetrised: false };
  }
  const n = br.to - br.from;
  const out = new Float64Array(n);
  const { posIdx, negIdx, lo, hi, t } = br;
  for (let g = 0; g < n; g++) {
    const l = lo[g];
    const yl = y[negIdx[l]];
    const yn = hi[g] === l ? yl : yl + t[g] * (y[negIdx[hi[g]]] - yl);
    const yp = y[posIdx[br.from + g]];
    out[g] = parity === "even" ? (yp + yn) / 2 : (yp - yn) / 2;
  }
  return { b: br.posX.slice(br.from, br.to), y: out, symmetrised: true };
}

/**
 * Symmetrises (parity "even") or antisymmetrises ("odd") y(B), B in T. For
 * several traces on one field column, call fieldBranches once and
 * symmetriseBranches per trace (same results).
 */
export function symmetriseField(B: ArrayLike<number>, y: ArrayLike<number>, parity: "even" | "odd"): SymmetrisedTrace {
  return symmetriseBranches(fieldBranches(B), y, parity);
}
