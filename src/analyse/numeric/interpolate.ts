/**
 * Piecewise-linear interpolation on an ascending grid (common practice).
 * Outside the grid the end values are NOT extrapolated: the result is NaN,
 * so callers must stay inside [x0, xN]. Example: interpolateLinear([0,1],[0,2],0.5) → 1.
 */
export function interpolateLinear(x: ArrayLike<number>, y: ArrayLike<number>, at: number): number {
  const n = x.length;
  if (n === 0 || at < x[0] || at > x[n - 1]) return NaN;
  const lo = bracket(x, at);
  const hi = Math.min(lo + 1, n - 1);
  if (x[hi] === x[lo]) return y[lo];
  const t = (at - x[lo]) / (x[hi] - x[lo]);
  return y[lo] + t * (y[hi] - y[lo]);
}

/**
 * Bisection on an ascending grid x: the index lo (0 … n − 2) of the interval
 * [x[lo], x[lo + 1]] that holds `at`, for x[0] ≤ at ≤ x[n − 1]; at = x[n − 1]
 * gives n − 2. For n ≤ 1 it returns 0. The caller checks the range (outside it
 * the first or last interval is returned). Never throws.
 */
export function bracket(x: ArrayLike<number>, at: number): number {
  let lo = 0;
  let hi = x.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid] <= at) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Sorts paired arrays by x ascending (copies). */
export function sortByX(x: ArrayLike<number>, y: ArrayLike<number>): { x: Float64Array; y: Float64Array } {
  // Already ascending (the usual sweep): the stable sort would keep every index in place.
  let ascending = true;
  let descending = true;
  for (let i = 1; i < x.length && (ascending || descending); i++) {
    if (!(x[i - 1] <= x[i])) ascending = false;
    if (!(x[i - 1] > x[i])) descending = false;
  }
  if (ascending || descending) {
    const n = x.length;
    const xs = new Float64Array(n);
    const ys = new Float64Array(n);
    // Strictly descending (a sweep run downwards): no ties, so the sorted order is the reverse.
    for (let i = 0; i < n; i++) {
      const k = ascending ? i : n - 1 - i;
      xs[i] = x[k];
      ys[i] = y[k];
    }
    return { x: xs, y: ys };
  }
  const idx = Array.from({ length: x.length }, (_, i) => i).sort((a, b) => x[a] - x[b]);
  return { x: Float64Array.from(idx, (i) => x[i]), y: Float64Array.from(idx, (i) => y[i]) };
}
