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
import FFT from "fft.js";

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

function nextPow2(n: number): number {
  let m = 1;
  while (m < n) m *= 2;
  return m;
}

/**
 * Resample a signal given at ascending |B| (T) onto `count` points uniform in 1/B.
 * Throws RangeError for fewer than 2 points or count < 2.
 */
export function resampleInverseField(field: number[], value: number[], count: number): UniformTrace {
  if (field.length < 2 || count < 2) throw new RangeError("resampleInverseField: need 2 or more points");
  const u = field.map((b) => 1 / b).reverse();
  const v = value.slice().reverse();
  const u0 = u[0];
  const step = (u[u.length - 1] - u0) / (count - 1);
  const grid: number[] = [];
  const out: number[] = [];
  let j = 0;
  for (let k = 0; k < count; k++) {
    const x = k === count - 1 ? u[u.length - 1] : u0 + k * step;
    while (j < u.length - 2 && u[j + 1] < x) j++;
    const t = (x - u[j]) / (u[j + 1] - u[j]);
    grid.push(x);
    out.push(v[j] + t * (v[j + 1] - v[j]));
  }
  return { inverseField: grid, value: out };
}

const FFTS = new Map<number, FFT>();
/** One fft.js instance per size: building its twiddle tables is a large share of a transform's cost; transforms are synchronous, so sharing is safe. */
function fftOfSize(m: number): FFT {
  let f = FFTS.get(m);
  if (!f) FFTS.set(m, (f = new FFT(m)));
  return f;
}

const BUFFERS = new Map<number, { input: Float64Array; out: Float64Array }>();
/** Reused work buffers per transform size (allocating 2·m numbers per sweep was a large share of the cost). */
function buffersOfSize(m: number): { input: Float64Array; out: Float64Array } {
  let b = BUFFERS.get(m);
  if (!b) BUFFERS.set(m, (b = { input: new Float64Array(m), out: new Float64Array(2 * m) }));
  return b;
}

export interface SpectrumResult {
  spectrum: Spectrum;
  /** Bin spacing after zero-padding, T. */
  binWidth: number;
}

/**
 * Amplitude spectrum of a uniformly sampled trace (sample step `step` in T⁻¹),
 * Hann-windowed and zero-padded to `padFactor`× the next power of two.
 */
export function amplitudeSpectrum(values: number[], step: number, padFactor = 8): SpectrumResult {
  const n = values.length;
  const m = nextPow2(n) * padFactor;
  const mean = values.reduce((s, v) => s + v, 0) / n;
  const { input, out } = buffersOfSize(m);
  input.fill(0);
  out.fill(0);
  let wSum = 0;
  for (let i = 0; i < n; i++) {
    const w = n > 1 ? 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (n - 1)) : 1;
    wSum += w;
    input[i] = (values[i] - mean) * w;
  }
  const fft = fftOfSize(m);
  fft.realTransform(out, input);
  const frequency: number[] = [];
  const amplitude: number[] = [];
  const binWidth = 1 / (m * step);
  for (let k = 0; k <= m / 2; k++) {
    frequency.push(k * binWidth);
    amplitude.push((2 * Math.hypot(out[2 * k], out[2 * k + 1])) / wSum);
  }
  return { spectrum: { frequency, amplitude }, binWidth };
}

export interface SpectrumPeak {
  /** Interpolated peak frequency, T. */
  frequency: number;
  /** Amplitude at the peak bin. */
  amplitude: number;
  /** Peak amplitude over the median amplitude of the searched band. */
  peakToMedian: number;
}

/**
 * Dominant peak in the band fMin ≤ f ≤ fMax (T): the largest interior local
 * maximum (a monotonic low-frequency leakage tail is therefore never taken for a
 * peak). Returns null when the band holds no local maximum.
 * fMax should not exceed the Nyquist frequency of the original (unresampled)
 * data, 1/(2·largest 1/B step): above it the interpolated trace holds no
 * information and would make the median meaninglessly small.
 */
export function dominantPeak(s: SpectrumResult, fMin: number, fMax = Number.POSITIVE_INFINITY): SpectrumPeak | null {
  const a = s.spectrum.amplitude;
  const kLo = Math.max(1, Math.ceil(fMin / s.binWidth));
  const kHi = Math.min(a.length - 1, Math.floor(fMax / s.binWidth));
  if (kLo >= kHi - 2) return null;
  let k = -1;
  for (let i = kLo + 1; i < kHi; i++) {
    if (a[i] > a[i - 1] && a[i] >= a[i + 1] && (k < 0 || a[i] > a[k])) k = i;
  }
  if (k < 0 || !(a[k] > 0)) return null;
  const band = a.slice(kLo, kHi + 1).sort((x, y) => x - y);
  const median = band[Math.floor(band.length / 2)];
  const [l, c, r] = [a[k - 1], a[k], a[k + 1]].map((v) => Math.log(Math.max(v, 1e-300)));
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
 * largest amplitude of each bucket (so peaks survive), for charts.
 */
export function downsampleSpectrum(s: Spectrum, fMax: number, maxPoints = 400): Spectrum {
  const idx = s.frequency.map((f, i) => i).filter((i) => s.frequency[i] <= fMax);
  const per = Math.max(1, Math.ceil(idx.length / maxPoints));
  const frequency: number[] = [];
  const amplitude: number[] = [];
  for (let b = 0; b < idx.length; b += per) {
    let best = idx[b];
    for (let j = b; j < Math.min(b + per, idx.length); j++) if (s.amplitude[idx[j]] > s.amplitude[best]) best = idx[j];
    frequency.push(s.frequency[best]);
    amplitude.push(s.amplitude[best]);
  }
  return { frequency, amplitude };
}
