/**
 * Standard uncertainty, from pixel noise, of a difference of region means of
 * GPA strain maps (wellCoherence.ts), by linear propagation (GUM, JCGM
 * 100:2008 §5.1) through the geometric-phase chain.
 *
 * Model: white pixel noise (imageNoise.ts) passes the Gaussian Bragg mask
 * (σ_k, cycles/pixel) into the complex field H_g = A·e^{iP} as circular noise
 * of variance σ_H² = σ²·Σm²/N_pad with autocorrelation ρ(d) = exp(−d²/4r²),
 * r = 1/(2πσ_k) (derived: the mask squared is a Gaussian of SD σ_k/√2).
 * The phase noise is δP = Im(δH·e^{−iP})/A, so Cov(δP(r), δP(r')) =
 * ρ(r − r')·Re(q̄(r)·q(r')) with q = (σ_H/√2)·H/|H|², which geometricPhase.ts
 * stores per spot. To first order (small strain, Hÿtch, Snoeck & Kilaas,
 * Ultramicroscopy 74, 131 (1998)) the local reciprocal vectors change by
 * δG = −G·∇u, so a strain component along the unit vector e is
 * ε_e = −Σ_j (eᵀG⁻¹)_j (δg_j·e), and δg_j is the central difference of δP_j
 * over 2 pixels divided by 2π (geometricPhase.ts' localG). A region mean of
 * ε_e is therefore a linear functional Σ c_j(r)·δP_j(r), whose variance is
 * Re Σ_r conj(c_j q_j)(r)·[ρ ∗ (c_j q_j)](r), summed over the two spots
 * (their masks do not overlap, so their noises are independent).
 *
 * Why not the spread of the map inside the region: a strain map is a phase
 * derivative, whose noise has no power at zero frequency — its region mean is
 * set by the phase at the region's edges — and the map's spread also holds
 * real structure (fringe residue, the interfaces' smoothing), not noise.
 */
import type { GpaMaps } from "./geometricPhase.ts";
import type { Vec2 } from "./geometry.ts";

/** A region as pixel indices, with the weight each pixel's strain carries in the combination. */
export interface WeightedRegion {
  pixels: number[];
  weight: number;
}

/** Pixels of an image listed by row: row y's entries are rowStart[y] … rowStart[y + 1] − 1 of xs (column) and index. */
interface SparsePixels {
  rowStart: Int32Array;
  xs: Int32Array;
  index: Int32Array;
}

/**
 * Σ_a Σ_b v_a·v_b·k(x_a − x_b)·k(y_a − y_b) over the listed pixels (values v), with
 * k(d) = exp(−d²/(4r²)) truncated at |d| ≤ 6r: that is Σ v·(K ∗ v) for the separable Gaussian
 * blur K (unnormalised, truncated at 6r per axis, nothing outside the image) of the image that is
 * v on the listed pixels and zero elsewhere. Computed row by row: each row holding listed pixels
 * is blurred along x once, then dotted with every row within reach, weighted by k of the row
 * offset. Listed pixels whose value is zero add exact zeros.
 */
function blurQuadraticForm(p: SparsePixels, vs: Float64Array, width: number, height: number, r: number): number {
  const reach = Math.ceil(6 * r);
  const k = new Float64Array(2 * reach + 1);
  for (let i = 0; i < k.length; i++) k[i] = Math.exp(-((i - reach) ** 2) / (4 * r * r));
  const { rowStart, xs } = p;
  const blurred = new Float64Array(width);
  let total = 0;
  for (let y1 = 0; y1 < height; y1++) {
    const a0 = rowStart[y1];
    const a1 = rowStart[y1 + 1];
    if (a0 === a1) continue;
    blurred.fill(0);
    for (let a = a0; a < a1; a++) {
      const x = xs[a];
      const val = vs[a];
      if (val === 0) continue;
      const lo = Math.max(-reach, -x);
      const hi = Math.min(reach, width - 1 - x);
      for (let d = lo; d <= hi; d++) blurred[x + d] += k[d + reach] * val;
    }
    const yLo = Math.max(0, y1 - reach);
    const yHi = Math.min(height - 1, y1 + reach);
    for (let y2 = yLo; y2 <= yHi; y2++) {
      const b1 = rowStart[y2 + 1];
      let dot = 0;
      for (let b = rowStart[y2]; b < b1; b++) dot += vs[b] * blurred[xs[b]];
      total += k[y2 - y1 + reach] * dot;
    }
  }
  return total;
}

/** The pixels of c (width × height) with |c| > threshold, by row. */
function pixelsAbove(c: Float64Array, width: number, height: number, threshold: number): SparsePixels {
  const rowStart = new Int32Array(height + 1);
  let count = 0;
  for (let i = 0; i < c.length; i++) if (Math.abs(c[i]) > threshold) count++;
  const xs = new Int32Array(count);
  const index = new Int32Array(count);
  let n = 0;
  for (let y = 0; y < height; y++) {
    rowStart[y] = n;
    for (let x = 0, i = y * width; x < width; x++, i++) {
      if (Math.abs(c[i]) > threshold) {
        xs[n] = x;
        index[n++] = i;
      }
    }
  }
  rowStart[height] = n;
  return { rowStart, xs, index };
}

/**
 * Standard uncertainty of Σ_regions weight·mean(ε_e) for the unit direction e
 * (pixel axes), from the maps' phase-noise fields (see the module comment).
 * Returns NaN when the maps carry no noise model.
 */
export function strainMeanUncertainty(maps: GpaMaps, e: Vec2, regions: WeightedRegion[]): number {
  const { width, height } = maps;
  const G = [
    [maps.g1.x, maps.g1.y],
    [maps.g2.x, maps.g2.y],
  ];
  const det = G[0][0] * G[1][1] - G[0][1] * G[1][0];
  // eᵀG⁻¹, with G⁻¹ = [[G11, −G01], [−G10, G00]]/det.
  const alpha = [(e.x * G[1][1] - e.y * G[1][0]) / det, (-e.x * G[0][1] + e.y * G[0][0]) / det];
  let variance = 0;
  const c = new Float64Array(width * height);
  maps.phaseNoise.forEach((q, j) => {
    c.fill(0);
    // Weight on δP_j of each region pixel's −α_j·(δg_j·e) = −α_j·[e_x(δP(x+1) − δP(x−1)) + e_y(δP(y+1) − δP(y−1))]/(4π).
    for (const region of regions) {
      const w = (-alpha[j] * region.weight) / (4 * Math.PI * region.pixels.length);
      for (const i of region.pixels) {
        c[i + 1] += w * e.x;
        c[i - 1] -= w * e.x;
        c[i + width] += w * e.y;
        c[i - width] -= w * e.y;
      }
    }
    // Inside a region the stencils cancel; drop their rounding residue so the blur runs over the edges only.
    let cMax = 0;
    for (let i = 0; i < c.length; i++) cMax = Math.max(cMax, Math.abs(c[i]));
    const edges = pixelsAbove(c, width, height, 1e-9 * cMax);
    const vRe = new Float64Array(edges.index.length);
    const vIm = new Float64Array(edges.index.length);
    edges.index.forEach((i, a) => {
      vRe[a] = c[i] * q.re[i];
      vIm[a] = c[i] * q.im[i];
    });
    variance += blurQuadraticForm(edges, vRe, width, height, maps.resolution_px) + blurQuadraticForm(edges, vIm, width, height, maps.resolution_px);
  });
  return Math.sqrt(Math.max(0, variance));
}
