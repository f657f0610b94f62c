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

/** Gaussian blur with kernel exp(−d²/(4r²)) (unnormalised), separable, truncated at 6r. */
function blur(src: Float64Array, width: number, height: number, r: number): Float64Array {
  const reach = Math.ceil(6 * r);
  const k = Array.from({ length: 2 * reach + 1 }, (_, i) => Math.exp(-((i - reach) ** 2) / (4 * r * r)));
  const tmp = new Float64Array(src.length);
  const out = new Float64Array(src.length);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const v = src[y * width + x];
      if (v === 0) continue;
      for (let d = Math.max(-reach, -x); d <= Math.min(reach, width - 1 - x); d++) tmp[y * width + x + d] += k[d + reach] * v;
    }
  }
  for (let x = 0; x < width; x++) {
    for (let y = 0; y < height; y++) {
      const v = tmp[y * width + x];
      if (v === 0) continue;
      for (let d = Math.max(-reach, -y); d <= Math.min(reach, height - 1 - y); d++) out[(y + d) * width + x] += k[d + reach] * v;
    }
  }
  return out;
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
  maps.phaseNoise.forEach((q, j) => {
    const cRe = new Float64Array(width * height);
    const cIm = new Float64Array(width * height);
    // Weight on δP_j of each region pixel's −α_j·(δg_j·e) = −α_j·[e_x(δP(x+1) − δP(x−1)) + e_y(δP(y+1) − δP(y−1))]/(4π).
    const c = new Float64Array(width * height);
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
    for (let i = 0; i < c.length; i++) {
      if (Math.abs(c[i]) > 1e-9 * cMax) {
        cRe[i] = c[i] * q.re[i];
        cIm[i] = c[i] * q.im[i];
      }
    }
    const bRe = blur(cRe, width, height, maps.resolution_px);
    const bIm = blur(cIm, width, height, maps.resolution_px);
    for (let i = 0; i < c.length; i++) variance += cRe[i] * bRe[i] + cIm[i] * bIm[i];
  });
  return Math.sqrt(Math.max(0, variance));
}
