/**
 * Largest-Triangle-Three-Buckets downsampling for display (Steinarsson,
 * "Downsampling Time Series for Visual Representation", MSc thesis, University
 * of Iceland, 2013). Keeps the first and last points and, from each bucket, the
 * point forming the largest triangle with the previous kept point and the next
 * bucket's mean, so peaks and oscillations survive. Returns indices into x.
 */
export function lttbIndices(x: ArrayLike<number>, y: ArrayLike<number>, threshold: number): number[] {
  const n = x.length;
  if (threshold >= n || threshold < 3) return Array.from({ length: n }, (_, i) => i);
  const out = [0];
  const every = (n - 2) / (threshold - 2);
  let a = 0;
  for (let i = 0; i < threshold - 2; i++) {
    const nextStart = Math.floor((i + 1) * every) + 1;
    const nextEnd = Math.min(Math.floor((i + 2) * every) + 1, n);
    let avgX = 0;
    let avgY = 0;
    for (let j = nextStart; j < nextEnd; j++) {
      avgX += x[j];
      avgY += y[j];
    }
    const len = Math.max(1, nextEnd - nextStart);
    avgX /= len;
    avgY /= len;
    const start = Math.floor(i * every) + 1;
    const end = Math.floor((i + 1) * every) + 1;
    let best = start;
    let bestArea = -1;
    for (let j = start; j < end; j++) {
      const area = Math.abs((x[a] - avgX) * (y[j] - y[a]) - (x[a] - x[j]) * (avgY - y[a]));
      if (area > bestArea) {
        bestArea = area;
        best = j;
      }
    }
    out.push(best);
    a = best;
  }
  out.push(n - 1);
  return out;
}

/** Downsamples paired arrays to at most `threshold` points with LTTB. */
export function lttb(x: ArrayLike<number>, y: ArrayLike<number>, threshold: number): { x: number[]; y: number[] } {
  const idx = lttbIndices(x, y, threshold);
  return { x: idx.map((i) => x[i]), y: idx.map((i) => y[i]) };
}
