/**
 * Shubnikov–de Haas density of a 2D electron gas from ρ_xx(B).
 *
 * The oscillations are periodic in 1/B with frequency f (T): Δ(1/B) = g_s·g_v·e/(h·n),
 * so n_SdH = g_s·g_v·e·f/h (REFERENCES §7; Si(001), g = 4: n[cm⁻²] = 9.6720e10·f[T]).
 * This spectrum only seeds the least-squares fit of the whole oscillation
 * (oscillationFit.ts), which gives the reported n_SdH and τ_q.
 * Method: symmetrised ρ_xx(|B|) restricted to [minField, maxField]; smooth
 * background removed as a least-squares polynomial in B (default order 2, which
 * also follows the curved magnetoresistance of a parallel channel; orders above
 * 3 also absorb the large, slow high-field swings of strongly damped
 * oscillations, which then lose their spectral peak); resampled uniformly in 1/B; Hann
 * window; zero-padded (4×); FFT; dominant peak with sub-bin interpolation
 * (inverseFieldSpectrum.ts). Skipped, never guessed, when the peak lies below
 * three periods across the 1/B range (f·Δ(1/B) < 3), or is not clearly above the
 * spectrum's median (default 6×) in the band from one period across the range
 * up to the data's own Nyquist frequency 1/(2·largest 1/B step), or when the
 * spectrum below the peak (more than 1.5 resolution widths 1/Δ(1/B) lower) holds
 * an amplitude above `maxLowFrequencyRatio` (default 10) times the peak's: the
 * "peak" is then a side lobe of a slow swing spanning fewer than the minimum
 * number of periods (a low density whose oscillation is too slow for the window).
 * When the whole window fails these tests, they are repeated once over the part
 * of the window where the oscillation is visible (its RMS over a third of the
 * 1/B range ≥ 10 % of the largest): a strongly damped oscillation lives at the
 * high-field end only, where the Hann window hides it.
 * Units: B in T, ρ in Ω, f in T, n in m⁻².
 */
import { ELEMENTARY_CHARGE, PLANCK } from "../../physics/constants.ts";
import { amplitudeSpectrum, dominantPeak, downsampleSpectrum, resampleInverseField, type Spectrum } from "./inverseFieldSpectrum.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";
import { Matrix, solve } from "ml-matrix";
import { fields, under } from "../bulk.ts";
import { householderLeastSquares } from "../numeric/householderLeastSquares.ts";

export interface SdhOptions {
  /** Lower field limit, T (default: the lowest |B| > 0 in the sweep). */
  minField?: number;
  /** Upper field limit, T (default: the highest |B|). */
  maxField?: number;
  /** g_s·g_v (Si(001) default 4). */
  degeneracy?: number;
  /** Order of the background polynomial in B (default 2, 0–4). */
  backgroundOrder?: number;
  /** Fewest periods across the 1/B range (default 3). */
  minPeriods?: number;
  /** Smallest peak/median spectrum amplitude (default 6). */
  minPeakToMedian?: number;
  /** Largest allowed (amplitude below the peak)/(peak amplitude) (default 10). */
  maxLowFrequencyRatio?: number;
}

export interface SdhResult {
  ok: true;
  /** Oscillation frequency in 1/B, T. */
  frequency: number;
  /** Spectral resolution 1/Δ(1/B), T (the unpadded bin width). */
  frequencyResolution: number;
  /** n_SdH = g·e·f/h, m⁻². */
  density: number;
  /** Periods across the analysed 1/B range, f·Δ(1/B). */
  periods: number;
  peakToMedian: number;
  fieldRange: [number, number];
  background: { variable: "B"; order: number };
  /** Spectrum for charts (≤ 400 points up to 3 f). */
  spectrum: Spectrum;
  /** Background-free oscillation Δρ_xx (Ω) on a grid uniform in 1/B (T⁻¹). */
  trace: { inverseField: number[]; oscillation: number[] };
}

/** Sheet density from an SdH frequency: n = g·e·f/h, m⁻² (f in T). */
export function sdhDensity(frequency: number, degeneracy = 4): number {
  return (degeneracy * ELEMENTARY_CHARGE * frequency) / PLANCK;
}

/** SdH frequency of a density: f = h·n/(g·e), T (n in m⁻²). */
export function sdhFrequency(density: number, degeneracy = 4): number {
  return (PLANCK * density) / (degeneracy * ELEMENTARY_CHARGE);
}

function polynomialBackground(b: number[], rho: number[], order: number): number[] {
  const mid = (b[0] + b[b.length - 1]) / 2;
  const half = (b[b.length - 1] - b[0]) / 2 || 1;
  const t = b.map((x) => (x - mid) / half);
  const k = order + 1;
  const m = b.length;
  // Column-major: column j holds t^j (Householder QR least squares, as ml-matrix's solve does it).
  if (m <= k) {
    // As many points as coefficients (or fewer): ml-matrix's square solver (LU), as before.
    const sq = new Matrix(m, k);
    t.forEach((x, i) => {
      for (let j = 0; j < k; j++) sq.set(i, j, x ** j);
    });
    const c = solve(sq, Matrix.columnVector(rho)).to1DArray();
    return t.map((x) => c.reduce((s, cj, j) => s + cj * x ** j, 0));
  }
  // t^j once (column-major), for the solve (which overwrites its copy) and for the background itself.
  const powers = new Float64Array(m * k);
  for (let i = 0; i < m; i++) for (let j = 0; j < k; j++) powers[j * m + i] = t[i] ** j;
  const coef = householderLeastSquares(powers.slice(), m, k, rho);
  const out = new Array<number>(m);
  for (let i = 0; i < m; i++) {
    let s = 0;
    for (let j = 0; j < k; j++) s = s + coef[j] * powers[j * m + i];
    out[i] = s;
  }
  return out;
}

/**
 * |B| > 0 inside [lo, hi] with finite values, ascending (stable: equal fields
 * keep their input order), points at the same field averaged.
 */
export function cleanSweep(field: ArrayLike<number>, rho: ArrayLike<number>, lo: number, hi: number) {
  const keep: number[] = [];
  let ascending = true;
  for (let i = 0; i < field.length; i++) {
    const b = Math.abs(field[i]);
    if (Number.isFinite(b) && Number.isFinite(rho[i]) && b > 0 && b >= lo && b <= hi) {
      if (keep.length && Math.abs(field[keep[keep.length - 1]]) > b) ascending = false;
      keep.push(i);
    }
  }
  // The symmetrised trace is already ascending; otherwise a stable sort by |B|.
  if (!ascending) keep.sort((p, q) => Math.abs(field[p]) - Math.abs(field[q]));
  const b: number[] = [];
  const r: number[] = [];
  const c: number[] = [];
  for (const i of keep) {
    const x = Math.abs(field[i]);
    const y = rho[i];
    const last = b.length - 1;
    if (last >= 0 && b[last] === x) {
      r[last] = (r[last] * c[last] + y) / (c[last] + 1);
      c[last]++;
    } else {
      b.push(x);
      r.push(y);
      c.push(1);
    }
  }
  return { b, r };
}

/**
 * SdH analysis of one symmetrised sweep. field in T (sign ignored, any order),
 * rhoXX in Ω. Returns { ok: false, reason } for too few points, too few periods
 * or no clear peak. Throws RangeError when the arrays differ in length.
 */
export function shubnikovDeHaas(field: ArrayLike<number>, rhoXX: ArrayLike<number>, options: SdhOptions = {}): SdhResult | Skipped {
  if (field.length !== rhoXX.length) throw new RangeError(`shubnikovDeHaas: ${field.length} fields, ${rhoXX.length} values`);
  const { b, r } = cleanSweep(field, rhoXX, options.minField ?? 0, options.maxField ?? Number.POSITIVE_INFINITY);
  const first = spectrumOfWindow(b, r, options);
  if (first.ok || b.length < 16) return first;
  // A strongly damped oscillation lives at the high-field end only, where the Hann window is small;
  // its spectrum then shows the burst's slow envelope. Retry on the part where it is visible.
  const lo = visibleFrom(b, r, Math.max(0, Math.min(4, Math.round(options.backgroundOrder ?? 2))));
  if (!(lo > b[0] * 1.05)) return first;
  const k = b.findIndex((x) => x >= lo);
  const second = spectrumOfWindow(b.slice(k), r.slice(k), options);
  return second.ok ? second : first;
}

/**
 * Lowest field (T) where the background-free oscillation is still visible:
 * its RMS over a third of the 1/B range is ≥ 10 % of the largest such RMS.
 */
function visibleFrom(b: number[], r: number[], order: number): number {
  const bg = polynomialBackground(b, r, order);
  const trace = resampleInverseField(
    b,
    r.map((v, i) => v - bg[i]),
    256,
  );
  const v = trace.value;
  const w = Math.floor(v.length / 3);
  const rms: number[] = [];
  let sum = 0;
  for (let i = 0; i < v.length; i++) {
    sum += v[i] * v[i];
    if (i >= w) sum -= v[i - w] * v[i - w];
    if (i >= w - 1) rms.push(Math.sqrt(Math.max(0, sum) / w));
  }
  const top = Math.max(...rms);
  let last = 0;
  rms.forEach((x, i) => {
    if (x >= 0.1 * top) last = i;
  });
  // rms[i] covers samples i … i + w − 1 (ascending 1/B); its low-field end is the largest 1/B.
  return 1 / trace.inverseField[Math.min(v.length - 1, last + w - 1)];
}

/** The spectral analysis of an ascending, clean window (see shubnikovDeHaas). */
function spectrumOfWindow(b: number[], r: number[], options: SdhOptions): SdhResult | Skipped {
  const order = Math.max(0, Math.min(4, Math.round(options.backgroundOrder ?? 2)));
  const minPeriods = options.minPeriods ?? 3;
  const need = Math.max(16, order + 8);
  if (b.length < need) return skipped(`only ${b.length} field points in the SdH range; need ${need}`);
  const bg = polynomialBackground(b, r, order);
  const delta = r.map((v, i) => v - bg[i]);
  const count = Math.min(1024, Math.max(256, 2 ** Math.ceil(Math.log2(b.length))));
  const trace = resampleInverseField(b, delta, count);
  const span = 1 / b[0] - 1 / b[b.length - 1];
  const step = span / (count - 1);
  let coarsest = 0;
  for (let i = 1; i < b.length; i++) coarsest = Math.max(coarsest, 1 / b[i - 1] - 1 / b[i]);
  const fMax = 1 / (2 * coarsest);
  // The peak lies below fMax and the chart reaches 3× the peak: no bin above 3·fMax is read.
  // 4× zero-padding: the peak only seeds the fit (oscillationFit.ts), which refines f.
  const spec = amplitudeSpectrum(trace.value, step, 4, 3 * fMax);
  const peak = dominantPeak(spec, 1 / span, fMax);
  if (!peak) return skipped("no oscillation peak in the spectrum above one period across the 1/B range");
  const periods = peak.frequency * span;
  if (periods < minPeriods) {
    return skipped(`only ${periods.toFixed(1)} oscillation periods between ${b[0]} T and ${b[b.length - 1]} T; need ${minPeriods}`);
  }
  const minRatio = options.minPeakToMedian ?? 6;
  if (peak.peakToMedian < minRatio) {
    return skipped(`spectral peak is only ${peak.peakToMedian.toFixed(1)}× the median amplitude; need ${minRatio}× (no clear oscillation)`);
  }
  const lowLimit = peak.frequency - 1.5 / span;
  let low = 0;
  for (let i = 1; i < spec.amplitude.length && i * spec.binWidth < lowLimit; i++) low = Math.max(low, spec.amplitude[i]);
  const maxLow = options.maxLowFrequencyRatio ?? 10;
  if (low > maxLow * peak.amplitude) {
    return skipped(
      `the spectrum is dominated by a slow swing (${(low / peak.amplitude).toFixed(0)}× the candidate peak at ${peak.frequency.toFixed(2)} T): the oscillation is too slow for fewer than ${minPeriods} periods to fit in this field window`,
    );
  }
  const density = sdhDensity(peak.frequency, options.degeneracy ?? 4);
  if (!allFinite(peak.frequency, density)) return skipped("SdH frequency is not finite");
  return {
    ok: true,
    frequency: peak.frequency,
    frequencyResolution: 1 / span,
    density,
    periods,
    peakToMedian: Math.min(peak.peakToMedian, 1e12),
    fieldRange: [b[0], b[b.length - 1]],
    background: { variable: "B", order },
    spectrum: downsampleSpectrum(spec, Math.min(3 * peak.frequency, spec.nyquist)),
    trace: { inverseField: trace.inverseField, oscillation: trace.value },
  };
}

export interface HallSdhMismatch {
  /** 100·(n_Hall − n_SdH)/n_SdH, %. */
  mismatchPercent: number;
  /** Its standard error from both densities' standard errors, %. */
  stdErrPercent: number;
  /** True when |mismatch| exceeds the tolerance and 3 standard errors: probable parallel conduction. */
  parallelConduction: boolean;
  tolerancePercent: number;
}

/**
 * Compare a Hall density with the SdH density of the same point (both m⁻²,
 * with standard errors, default 0). A Hall density that differs from the
 * well's SdH density by more than the tolerance (default 5 %) and by more
 * than three combined standard errors points to a parallel conducting
 * channel. The standard error of m = 100·(n_H/n_S − 1) is
 * 100·(n_H/n_S)·√((σ_H/n_H)² + (σ_S/n_S)²) (first-order propagation; common
 * practice). Throws RangeError unless both densities are finite and > 0.
 */
export function hallSdhMismatch(nHall: number, nSdh: number, tolerancePercent = 5, hallStdErr = 0, sdhStdErr = 0): HallSdhMismatch {
  if (!(nHall > 0 && nSdh > 0) || !allFinite(nHall, nSdh)) {
    throw new RangeError(`hallSdhMismatch: densities must be finite and > 0 (Hall ${nHall}, SdH ${nSdh})`);
  }
  const m = (100 * (nHall - nSdh)) / nSdh;
  const se = 100 * (nHall / nSdh) * Math.hypot(hallStdErr / nHall, sdhStdErr / nSdh);
  const stdErrPercent = Number.isFinite(se) ? se : Number.POSITIVE_INFINITY;
  return { mismatchPercent: m, stdErrPercent, parallelConduction: Math.abs(m) > tolerancePercent && Math.abs(m) > 3 * stdErrPercent, tolerancePercent };
}

/** The 1/B trace and spectrum drawn on the wafer page (src/analyse/bulk.ts). */
export const SDH_BULK = [
  ...under(["spectrum"], fields<SdhResult["spectrum"]>("frequency", "amplitude")),
  ...under(["trace"], fields<SdhResult["trace"]>("inverseField", "oscillation")),
];
