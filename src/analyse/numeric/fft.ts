/**
 * Shared helpers for the radix-4 FFT of the `fft.js` package (power-of-two
 * sizes ≥ 2), used by the 1/B spectrum of quantum oscillations and the 2-D
 * image transforms.
 */
import FFT from "fft.js";

/** Smallest power of two ≥ n, and at least 2 (the smallest size fft.js accepts). Exact for any size (no logarithms). */
export function nextPowerOfTwo(n: number): number {
  let m = 2;
  while (m < n) m *= 2;
  return m;
}

const FFTS = new Map<number, FFT>();

/**
 * One fft.js instance per size: building its twiddle tables is a large share of
 * a transform's cost; transforms are synchronous, so sharing is safe.
 * Throws (from fft.js) when `size` is not a power of two ≥ 2.
 */
export function fftOfSize(size: number): FFT {
  let f = FFTS.get(size);
  if (!f) {
    f = new FFT(size);
    FFTS.set(size, f);
  }
  return f;
}
