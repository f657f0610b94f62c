/**
 * Two-dimensional discrete Fourier transform on power-of-two grids.
 *
 * Method: row–column decomposition (a 1-D FFT of every row, then of every
 * column) with the radix-4 FFT of the `fft.js` package. Forward transform
 * F(k) = Σ f(r)·exp(−2πi k·r/N); the inverse divides by the number of pixels,
 * so ifft2d(fft2d(f)) = f. Frequencies are in cycles per pixel; bin k along an
 * axis of length N is the signed frequency signedBin(k, N)/N.
 *
 * Optional Hann window w(x) = sin²(π(x + ½)/N) per axis (Blackman & Tukey,
 * "The Measurement of Power Spectra", 1958), which suppresses the streaks from
 * the image's edges at the cost of a wider peak.
 *
 * Throws RangeError when a size is not a power of two ≥ 2 or the arrays do not
 * match the size (programming errors).
 */
import { fftOfSize, nextPowerOfTwo } from "../numeric/fft.ts";

export interface ComplexImage {
  width: number;
  height: number;
  re: Float64Array;
  im: Float64Array;
}

export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 2 && (n & (n - 1)) === 0;
}

/** Largest power of two ≤ n (n ≥ 2), else 0. */
export function largestPowerOfTwoAtMost(n: number): number {
  if (!(n >= 2)) return 0;
  return 2 ** Math.floor(Math.log2(n));
}

/** Signed frequency index of bin k on an axis of length n: k for k < n/2, else k − n. */
export function signedBin(k: number, n: number): number {
  return k < n / 2 ? k : k - n;
}

export interface ImageRegion {
  pixels: Float32Array;
  width: number;
  height: number;
  /** Position of the region's first pixel in the source image. */
  x0: number;
  y0: number;
}

/** Centred crop to the largest power-of-two size along each axis. */
export function cropToPowerOfTwo(pixels: ArrayLike<number>, width: number, height: number): ImageRegion {
  const w = largestPowerOfTwoAtMost(width);
  const h = largestPowerOfTwoAtMost(height);
  if (w === 0 || h === 0) throw new RangeError(`cropToPowerOfTwo: image ${width}×${height} is too small`);
  const x0 = Math.floor((width - w) / 2);
  const y0 = Math.floor((height - h) / 2);
  const out = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) out[y * w + x] = pixels[(y + y0) * width + x + x0];
  }
  return { pixels: out, width: w, height: h, x0, y0 };
}

/** Pad (image at the top-left corner) to the next power of two per axis, filling with the image mean. */
export function padToPowerOfTwo(pixels: ArrayLike<number>, width: number, height: number): ImageRegion {
  const w = nextPowerOfTwo(width);
  const h = nextPowerOfTwo(height);
  let mean = 0;
  for (let i = 0; i < width * height; i++) mean += pixels[i];
  mean /= width * height || 1;
  const out = new Float32Array(w * h).fill(mean);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) out[y * w + x] = pixels[y * width + x];
  }
  return { pixels: out, width: w, height: h, x0: 0, y0: 0 };
}

/** One-axis Hann window weights sin²(π(i + ½)/n), i = 0…n−1. */
export function hannWindow(n: number): Float64Array {
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) w[i] = Math.sin((Math.PI * (i + 0.5)) / n) ** 2;
  return w;
}

/**
 * 1-D transforms of every row (alongRows) or every column. A line that is all zeros is left as it
 * is (its transform is zero). Columns are gathered and scattered in blocks of COLUMN_BLOCK, so
 * each row of the image is read in contiguous runs; every line's transform is the same as alone.
 */
function transformAxis(data: ComplexImage, alongRows: boolean, inverse: boolean): void {
  if (alongRows) transformRows(data, inverse);
  else transformColumns(data, inverse);
}

function transformRows(data: ComplexImage, inverse: boolean): void {
  const { width: n, height, re, im } = data;
  const fft = fftOfSize(n);
  const input = new Float64Array(2 * n);
  const output = new Float64Array(2 * n);
  for (let line = 0; line < height; line++) {
    const base = line * n;
    let nonzero = false;
    for (let i = 0; i < n; i++) {
      const r = re[base + i];
      const m = im[base + i];
      input[2 * i] = r;
      input[2 * i + 1] = m;
      if (r !== 0 || m !== 0) nonzero = true;
    }
    if (!nonzero) continue;
    if (inverse) fft.inverseTransform(output, input);
    else fft.transform(output, input);
    for (let i = 0; i < n; i++) {
      re[base + i] = output[2 * i];
      im[base + i] = output[2 * i + 1];
    }
  }
}

function transformColumns(data: ComplexImage, inverse: boolean): void {
  const { width, height: n, re, im } = data;
  const fft = fftOfSize(n);
  const block = Math.min(COLUMN_BLOCK, width);
  // Block buffers side by side: column b's element i at (b·n + i)·2.
  const inputs = new Float64Array(2 * n * block);
  const outputs = new Float64Array(2 * n * block);
  const input = new Float64Array(2 * n);
  const output = new Float64Array(2 * n);
  const nonzero = new Uint8Array(block);
  for (let first = 0; first < width; first += block) {
    const lines = Math.min(block, width - first);
    nonzero.fill(0);
    for (let i = 0; i < n; i++) {
      const base = i * width + first;
      for (let b = 0; b < lines; b++) {
        const r = re[base + b];
        const m = im[base + b];
        const o = 2 * (b * n + i);
        inputs[o] = r;
        inputs[o + 1] = m;
        if (r !== 0 || m !== 0) nonzero[b] = 1;
      }
    }
    for (let b = 0; b < lines; b++) {
      if (!nonzero[b]) continue;
      input.set(inputs.subarray(2 * b * n, 2 * (b + 1) * n));
      if (inverse) fft.inverseTransform(output, input);
      else fft.transform(output, input);
      outputs.set(output, 2 * b * n);
    }
    for (let i = 0; i < n; i++) {
      const base = i * width + first;
      for (let b = 0; b < lines; b++) {
        if (!nonzero[b]) continue;
        const o = 2 * (b * n + i);
        re[base + b] = outputs[o];
        im[base + b] = outputs[o + 1];
      }
    }
  }
}

/** Columns transformed together per pass over the image (see transformAxis). */
const COLUMN_BLOCK = 16;

/** In-place 2-D FFT (forward, or inverse with 1/(W·H) normalisation). */
export function fft2dInPlace(data: ComplexImage, inverse = false): ComplexImage {
  const { width, height, re, im } = data;
  if (!isPowerOfTwo(width) || !isPowerOfTwo(height)) {
    throw new RangeError(`fft2d: size ${width}×${height} is not a power of two on both axes`);
  }
  if (re.length !== width * height || im.length !== width * height) {
    throw new RangeError("fft2d: array length does not match width×height");
  }
  transformAxis(data, true, inverse);
  transformAxis(data, false, inverse);
  return data;
}

export interface RealFftOptions {
  /** Multiply by a separable Hann window first (default false). */
  window?: boolean;
  /** Subtract the image mean first (default true). */
  subtractMean?: boolean;
}

/** Forward 2-D FFT of a real image. */
export function fft2dReal(pixels: ArrayLike<number>, width: number, height: number, options: RealFftOptions = {}): ComplexImage {
  const n = width * height;
  if (pixels.length !== n) throw new RangeError("fft2dReal: pixel count does not match width×height");
  let mean = 0;
  if (options.subtractMean ?? true) {
    for (let i = 0; i < n; i++) mean += pixels[i];
    mean /= n;
  }
  const re = new Float64Array(n);
  const wx = options.window ? hannWindow(width) : null;
  const wy = options.window ? hannWindow(height) : null;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const w = wx && wy ? wx[x] * wy[y] : 1;
      re[y * width + x] = (pixels[y * width + x] - mean) * w;
    }
  }
  return fft2dInPlace({ width, height, re, im: new Float64Array(n) });
}

/** Inverse 2-D FFT (returns a new complex image; the input is not changed). */
export function ifft2d(spectrum: ComplexImage): ComplexImage {
  return fft2dInPlace({ width: spectrum.width, height: spectrum.height, re: spectrum.re.slice(), im: spectrum.im.slice() }, true);
}

/** Power spectrum |F|² (same layout as the transform, DC at index 0). */
export function powerSpectrum(spectrum: ComplexImage): Float64Array {
  const out = new Float64Array(spectrum.re.length);
  for (let i = 0; i < out.length; i++) out[i] = spectrum.re[i] ** 2 + spectrum.im[i] ** 2;
  return out;
}
