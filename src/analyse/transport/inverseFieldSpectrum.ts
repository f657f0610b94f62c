/**
 * Spectrum of an oscillation that is periodic in 1/B (quantum oscillations).
 *
 * Steps: linear interpolation onto a uniform grid in u = 1/B; mean removed; Hann
 * window; zero-padding to a power of two (8× the grid); real FFT (fft.js, radix-4
 * Cooley–Tukey); amplitude |X_k|·2/Σw (the oscillation amplitude, same unit as
 * the input). The dominant peak is located with Gaussian (log-parabolic)
 * three-bin interpolation (e.g. Gasior & Gonzalez, CERN-AB-2004-023, 2004).
 * Frequencies are in T (cycles per unit of 1/B).
 */
import { fftOfSize, nextPowerOfTwo } from "../numeric/fft.ts";
import { quickselect } from "simple-statistics";

export interface UniformTrace {
  /** Uniform grid in 1/B, T⁻¹, ascending. */
  inverseField: number[];
  /** Interpolated signal on that grid. */
  value: number[];
}

export interface Spectrum {
  /** Frequency, T. */
  frequency: number[];
  /** Amplitude, unit of the signal. */
  amplitude: number[];
}

/**
 * Resample a signal given at ascending |B| (T) onto `count` points uniform in 1/B.
 * Throws RangeError for fewer than 2 points or count < 2.
 */
export function resampleInverseField(field: ArrayLike<number>, value: ArrayLike<number>, count: number): UniformTrace {
  const n = field.length;
  if (n < 2 || count < 2) throw new RangeError("resampleInverseField: need 2 or more points");
  // u[j] = 1/B in ascending order (the field reversed); v[j] the matching value.
  const u = new Float64Array(n);
  for (let j = 0; j < n; j++) u[j] = 1 / field[n - 1 - j];
  const u0 = u[0];
  const uLast = u[n - 1];
  const step = (uLast - u0) / (count - 1);
  const grid = new Array<number>(count);
  const out = new Array<number>(count);
  let j = 0;
  for (let k = 0; k < count; k++) {
    const x = k === count - 1 ? uLast : u0 + k * step;
    while (j < n - 2 && u[j + 1] < x) j++;
    const t = (x - u[j]) / (u[j + 1] - u[j]);
    const vj = value[n - 1 - j];
    grid[k] = x;
    out[k] = vj + t * (value[n - 2 - j] - vj);
  }
  return { inverseField: grid, value: out };
}

interface WorkBuffers {
  input: Float64Array;
  out: Float64Array;
  /** Leading entries of `input` that may be non-zero (the rest are zero). */
  used: number;
}
const BUFFERS = new Map<number, WorkBuffers>();
/** Reused work buffers per transform size (allocating 2·m numbers per sweep was a large share of the cost). */
function buffersOfSize(m: number): WorkBuffers {
  let b = BUFFERS.get(m);
  if (!b) {
    b = { input: new Float64Array(m), out: new Float64Array(2 * m), used: 0 };
    BUFFERS.set(m, b);
  }
  return b;
}

const WINDOWS = new Map<number, { w: Float64Array; sum: number }>();
/** Hann window of n points, w_i = 0.5 − 0.5·cos(2πi/(n − 1)) (1 for n = 1), and its sum; kept per n. */
function hannWindow(n: number): { w: Float64Array; sum: number } {
  let h = WINDOWS.get(n);
  if (!h) {
    if (WINDOWS.size >= 32) WINDOWS.clear();
    const w = new Float64Array(n);
    let sum = 0;
    for (let i = 0; i < n; i++) {
      w[i] = n > 1 ? 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (n - 1)) : 1;
      sum += w[i];
    }
    h = { w, sum };
    WINDOWS.set(n, h);
  }
  return h;
}

export interface SpectrumResult {
  /** Amplitude of bin k (frequency k·binWidth), unit of the signal; bins 0 … min(m/2, ⌈maxFrequency/binWidth⌉). */
  amplitude: Float64Array;
  /** Bin spacing after zero-padding, T. */
  binWidth: number;
  /** Highest frequency of the full spectrum (the padded grid's Nyquist frequency, (m/2)·binWidth), T. */
  nyquist: number;
}

/**
 * Amplitude spectrum of a uniformly sampled trace (sample step `step` in T⁻¹),
 * Hann-windowed and zero-padded to `padFactor`× the next power of two.
 * Amplitudes are computed only up to `maxFrequency` (T, default: all bins up
 * to the padded grid's Nyquist frequency); the transform itself is the same.
 */
export function amplitudeSpectrum(values: ArrayLike<number>, step: number, padFactor = 8, maxFrequency = Number.POSITIVE_INFINITY): SpectrumResult {
  const n = values.length;
  const m = nextPowerOfTwo(n) * padFactor;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += values[i];
  mean /= n;
  const buf = buffersOfSize(m);
  const { input, out } = buf;
  if (buf.used > n) input.fill(0, n, buf.used);
  buf.used = n;
  const { w, sum: wSum } = hannWindow(n);
  for (let i = 0; i < n; i++) input[i] = (values[i] - mean) * w[i];
  const fft = fftOfSize(m);
  fft.realTransform(out, input);
  const binWidth = 1 / (m * step);
  const last = Math.min(m / 2, maxFrequency === Number.POSITIVE_INFINITY ? m / 2 : Math.ceil(maxFrequency / binWidth));
  const amplitude = new Float64Array(last + 1);
  for (let k = 0; k <= last; k++) {
    const re = out[2 * k];
    const im = out[2 * k + 1];
    amplitude[k] = (2 * Math.sqrt(re * re + im * im)) / wSum;
  }
  return { amplitude, binWidth, nyquist: (m / 2) * binWidth };
}

export interface SpectrumPeak {
  /** Interpolated peak frequency, T. */
  frequency: number;
  /** Amplitude at the peak bin. */
  amplitude: number;
  /** Peak amplitude over the median amplitude of the searched band. */
  peakToMedian: number;
}

let bandScratch = new Float64Array(0);

/**
 * Dominant peak in the band fMin ≤ f ≤ fMax (T): the largest interior local
 * maximum (a monotonic low-frequency leakage tail is therefore never taken for a
 * peak). Returns null when the band holds no local maximum.
 * fMax should not exceed the Nyquist frequency of the original (unresampled)
 * data, 1/(2·largest 1/B step): above it the interpolated trace holds no
 * information and would make the median meaninglessly small.
 * The median is the upper median (element ⌊N/2⌋ of the sorted band), found by
 * selection (Floyd–Rivest) rather than a full sort.
 */
export function dominantPeak(s: SpectrumResult, fMin: number, fMax = Number.POSITIVE_INFINITY): SpectrumPeak | null {
  const a = s.amplitude;
  const kLo = Math.max(1, Math.ceil(fMin / s.binWidth));
  const kHi = Math.min(a.length - 1, Math.floor(fMax / s.binWidth));
  if (kLo >= kHi - 2) return null;
  let k = -1;
  for (let i = kLo + 1; i < kHi; i++) {
    if (a[i] > a[i - 1] && a[i] >= a[i + 1] && (k < 0 || a[i] > a[k])) k = i;
  }
  if (k < 0 || !(a[k] > 0)) return null;
  const len = kHi - kLo + 1;
  if (bandScratch.length < len) bandScratch = new Float64Array(len);
  const band = bandScratch.subarray(0, len);
  band.set(a.subarray(kLo, kHi + 1));
  const mid = Math.floor(len / 2);
  quickselect(band as unknown as number[], mid);
  const median = band[mid];
  const l = Math.log(Math.max(a[k - 1], 1e-300));
  const c = Math.log(Math.max(a[k], 1e-300));
  const r = Math.log(Math.max(a[k + 1], 1e-300));
  const den = l - 2 * c + r;
  const delta = den < 0 ? (0.5 * (l - r)) / den : 0;
  return {
    frequency: (k + Math.max(-0.5, Math.min(0.5, delta))) * s.binWidth,
    amplitude: a[k],
    peakToMedian: median > 0 ? a[k] / median : Number.MAX_VALUE,
  };
}

/**
 * Reduce a spectrum to at most `maxPoints` points up to fMax (T), keeping the
 * largest amplitude of each bucket (so peaks survive), for charts. Needs the
 * amplitudes computed up to fMax (amplitudeSpectrum's maxFrequency).
 */
export function downsampleSpectrum(s: SpectrumResult, fMax: number, maxPoints = 400): Spectrum {
  const a = s.amplitude;
  let count = 0;
  while (count < a.length && count * s.binWidth <= fMax) count++;
  const per = Math.max(1, Math.ceil(count / maxPoints));
  const frequency: number[] = [];
  const amplitude: number[] = [];
  for (let b = 0; b < count; b += per) {
    let best = b;
    for (let j = b; j < Math.min(b + per, count); j++) if (a[j] > a[best]) best = j;
    frequency.push(best * s.binWidth);
    amplitude.push(a[best]);
  }
  return { frequency, amplitude };
}
