/**
 * Variance of white pixel noise in a lattice image, from its periodogram.
 *
 * Method: for independent pixel noise of variance σ² over N pixels, each
 * periodogram ordinate |F(k)|² (unnormalised transform, fft2d.ts) is
 * exponentially distributed with mean N·σ², so its median is ln 2·N·σ²
 * (periodogram ordinates ~ σ²χ²₂/2; e.g. Priestley, Spectral Analysis and
 * Time Series, 1981, §6.1 — from memory). The median over the whole
 * spectrum ignores the few bins holding the lattice's spots and the image's
 * slow contrast: σ̂² = median |F(k)|² / (ln 2 · N). A padded transform (mean
 * padding) is passed with N the number of image pixels. Noise that is not
 * white (scan noise, detector blur) is not described by one σ².
 */
import type { ComplexImage } from "./fft2d.ts";
import { median } from "simple-statistics";

/** σ̂² of the pixel noise from the transform of an image with `pixels` noisy pixels (see the module comment). */
export function whiteNoiseVariance(spectrum: ComplexImage, pixels: number): number {
  const { re, im } = spectrum;
  const power = new Float64Array(re.length);
  for (let i = 0; i < power.length; i++) power[i] = re[i] * re[i] + im[i] ** 2;
  // simple-statistics reads the array by index only; a typed array selects faster than a number[].
  return median(power as unknown as number[]) / (Math.LN2 * pixels);
}
