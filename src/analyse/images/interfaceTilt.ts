/**
 * Tilt of the interfaces in a lattice image, from the structure tensor.
 */
import { growthNormal } from "./geometry.ts";
import type { GrowthAxis } from "../../model/imageInputs.ts";
import { radToDeg } from "../numeric/angle.ts";

/**
 * Separable Gaussian blur (σ in pixels, edges clamped). Each line is copied once into a buffer
 * extended by r clamped samples at either end, so the inner sum needs no bounds; the sums are
 * taken in the same order as a direct clamped convolution.
 */
function gaussianBlur(pixels: ArrayLike<number>, width: number, height: number, sigma: number): Float64Array {
  const r = Math.ceil(3 * sigma);
  const k = new Float64Array(2 * r + 1);
  for (let i = 0; i < k.length; i++) k[i] = Math.exp(-((i - r) ** 2) / (2 * sigma * sigma));
  let norm = 0;
  for (let i = 0; i < k.length; i++) norm += k[i];
  const taps = k.length;
  const tmp = new Float64Array(width * height);
  const out = new Float64Array(width * height);
  const line = new Float64Array(Math.max(width, height) + 2 * r);
  for (let y = 0; y < height; y++) {
    const row = y * width;
    for (let j = 0; j < width + 2 * r; j++) line[j] = pixels[row + Math.min(width - 1, Math.max(0, j - r))];
    for (let x = 0; x < width; x++) {
      let s = 0;
      for (let j = 0; j < taps; j++) s += k[j] * line[x + j];
      tmp[row + x] = s / norm;
    }
  }
  for (let x = 0; x < width; x++) {
    for (let j = 0; j < height + 2 * r; j++) line[j] = tmp[Math.min(height - 1, Math.max(0, j - r)) * width + x];
    for (let y = 0; y < height; y++) {
      let s = 0;
      for (let j = 0; j < taps; j++) s += k[j] * line[y + j];
      out[y * width + x] = s / norm;
    }
  }
  return out;
}

/**
 * Interface tilt (degrees) from the structure tensor of the image blurred over
 * one lattice period (Bigün & Granlund, Proc. ICCV 1987; Kass & Witkin,
 * Comput. Vis. Graph. Image Process. 37, 362 (1987)): the dominant gradient
 * direction ½·atan2(2Jxy, Jxx − Jyy) is the interface normal; the tilt is its
 * signed angle from the growth axis, folded into (−90°, 90°].
 */
export function interfaceTilt(pixels: ArrayLike<number>, width: number, height: number, axis: GrowthAxis, period: number | null): number {
  const sigma = Math.max(2, period ?? 2);
  const b = gaussianBlur(pixels, width, height, sigma);
  const m = Math.ceil(3 * sigma) + 1;
  let jxx = 0;
  let jyy = 0;
  let jxy = 0;
  for (let y = m; y < height - m; y++) {
    for (let x = m; x < width - m; x++) {
      const gx = (b[y * width + x + 1] - b[y * width + x - 1]) / 2;
      const gy = (b[(y + 1) * width + x] - b[(y - 1) * width + x]) / 2;
      jxx += gx * gx;
      jyy += gy * gy;
      jxy += gx * gy;
    }
  }
  const normal = 0.5 * Math.atan2(2 * jxy, jxx - jyy);
  const n = growthNormal(axis);
  let a = normal - Math.atan2(n.y, n.x);
  while (a > Math.PI / 2) a -= Math.PI;
  while (a <= -Math.PI / 2) a += Math.PI;
  return radToDeg(a);
}
