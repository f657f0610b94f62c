/**
 * Intensity profile along the growth axis of a lattice image.
 *
 * Method: every pixel's intensity is shared linearly between the two 1-pixel
 * bins of its growth coordinate s (geometry.ts) along the tilted growth
 * direction, and each bin's weighted mean is the profile value (averaging
 * along the interface direction). The atomic-plane modulation is then removed
 * by a moving average over one lattice period, applied twice. Units: s in
 * pixels, intensity in the image's units.
 *
 * Noise: for independent pixel noise of variance σ², bin k's mean has variance
 * σ²·Σw²/(Σw)² and neighbouring bins, which share pixels through the linear
 * weights, covariance σ²·Σw_k·w_{k+1}/(Σw_k·Σw_{k+1}) (derived); projectProfile
 * returns both per unit σ², and smoothingMatrix the linear operator of
 * smoothOverPeriod, so a fit to the smoothed profile can carry the correlation.
 */
import { growthHalfExtent, growthNormal } from "./geometry.ts";
import type { GrowthAxis } from "../../model/imageInputs.ts";

/** Mean intensity in 1-pixel bins of the growth coordinate s, tilted by tilt (rad); trims sparse end bins. */
export function projectProfile(pixels: ArrayLike<number>, width: number, height: number, axis: GrowthAxis, tilt: number) {
  const n = growthNormal(axis, tilt);
  const half = growthHalfExtent(width, height, axis, tilt);
  const s0 = -Math.ceil(half);
  const bins = 2 * Math.ceil(half) + 2;
  const sum = new Float64Array(bins);
  const wt = new Float64Array(bins);
  const sq = new Float64Array(bins);
  const cross = new Float64Array(bins);
  const cx = (width - 1) / 2;
  const cy = (height - 1) / 2;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const u = n.x * (x - cx) + n.y * (y - cy) - s0;
      const k = Math.floor(u);
      const f = u - k;
      const v = pixels[y * width + x];
      sum[k] += (1 - f) * v;
      wt[k] += 1 - f;
      sum[k + 1] += f * v;
      wt[k + 1] += f;
      sq[k] += (1 - f) ** 2;
      sq[k + 1] += f * f;
      cross[k] += (1 - f) * f;
    }
  }
  let maxW = 0;
  for (const w of wt) maxW = Math.max(maxW, w);
  const s: number[] = [];
  const value: number[] = [];
  /** Variance of each bin and covariance with the next kept bin, per unit pixel variance. */
  const variance: number[] = [];
  const covarianceNext: number[] = [];
  for (let k = 0; k < bins; k++) {
    if (wt[k] >= 0.5 * maxW) {
      s.push(s0 + k);
      value.push(sum[k] / wt[k]);
      variance.push(sq[k] / wt[k] ** 2);
      covarianceNext.push(k + 1 < bins && wt[k + 1] >= 0.5 * maxW ? cross[k] / (wt[k] * wt[k + 1]) : 0);
    }
  }
  return { s, value, variance, covarianceNext };
}

/**
 * The matrix S (n × n) with smoothOverPeriod(v) = S·v for any v of length n (its columns are the
 * responses to unit vectors). Each column is nonzero only within two window reaches of its
 * diagonal, so it is computed there alone, with the same weights and normalisations as
 * periodAverage (the terms left out are exact zeros).
 */
export function smoothingMatrix(n: number, period: number | null): number[][] {
  const S = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  if (!period || period < 1.5) {
    for (let j = 0; j < n; j++) S[j][j] = 1;
    return S;
  }
  const { weights, r } = periodWeights(period);
  // Normalisation of output i: the summed weights of the samples inside 0..n−1.
  const norm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let w = 0;
    for (let j = -r; j <= r; j++) {
      const k = i + j;
      if (k >= 0 && k < n) w += weights[j + r];
    }
    norm[i] = w;
  }
  const first = new Float64Array(2 * r + 1);
  for (let j = 0; j < n; j++) {
    // First pass on the unit vector e_j: nonzero at i = j − r … j + r (only k = j contributes).
    const aLo = Math.max(0, j - r);
    const aHi = Math.min(n - 1, j + r);
    for (let i = aLo; i <= aHi; i++) first[i - aLo] = (weights[j - i + r] * 1) / norm[i];
    // Second pass: nonzero at i = j − 2r … j + 2r, summing the first pass in the order periodAverage does.
    const bLo = Math.max(0, j - 2 * r);
    const bHi = Math.min(n - 1, j + 2 * r);
    for (let i = bLo; i <= bHi; i++) {
      let sum = 0;
      for (let k = Math.max(aLo, i - r); k <= Math.min(aHi, i + r); k++) sum += weights[k - i + r] * first[k - aLo];
      S[i][j] = sum / norm[i];
    }
  }
  return S;
}

/** Window weights of periodAverage: each sample's overlap with [−period/2, period/2], at offsets −r…r. */
function periodWeights(period: number): { weights: number[]; r: number } {
  const half = period / 2;
  const r = Math.ceil(half + 0.5);
  const weights: number[] = [];
  for (let j = -r; j <= r; j++) weights.push(Math.min(1, Math.max(0, half - Math.abs(j) + 0.5)));
  return { weights, r };
}

/**
 * Moving average over a window of `period` samples (fractional: each sample
 * weighs its overlap with [−period/2, period/2]); ends use the available samples.
 */
export function periodAverage(values: number[], period: number | null): number[] {
  if (!period || period < 1.5) return values.slice();
  const { weights, r } = periodWeights(period);
  return values.map((_, i) => {
    let s = 0;
    let w = 0;
    for (let j = -r; j <= r; j++) {
      const k = i + j;
      if (k < 0 || k >= values.length) continue;
      s += weights[j + r] * values[k];
      w += weights[j + r];
    }
    return s / w;
  });
}

/**
 * The one-period moving average applied twice (a triangle two periods wide):
 * a period mismatch of a few per cent leaves ~1e-4 of the fringe modulation
 * instead of ~1e-2. Adds 2·p²/12 to the variance of an edge.
 */
export function smoothOverPeriod(values: number[], period: number | null): number[] {
  return periodAverage(periodAverage(values, period), period);
}
