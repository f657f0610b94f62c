/**
 * Within-wafer uniformity of one metric over a wafer's devices.
 *
 * Definitions:
 *   mean  = Σx/n
 *   s     = sqrt(Σ(x − mean)²/(n − 1))  — the SAMPLE standard deviation (Bessel's n − 1)
 *   CV    = 100 · s / |mean|  in percent (coefficient of variation; undefined when mean = 0)
 *   range = max − min
 * Computed with simple-statistics (mean, sampleStandardDeviation, min, max).
 * Units: mean, s, min, max and range carry the unit of the input values; CV is in %.
 */
import { max, mean, min, sampleStandardDeviation } from "simple-statistics";

export interface Uniformity {
  ok: true;
  n: number;
  mean: number;
  /** Sample standard deviation (n − 1); null when n < 2 (see `cvReason`). */
  standardDeviation: number | null;
  /** Coefficient of variation in %, 100·s/|mean|; null with `cvReason` when it cannot be formed. */
  cvPercent: number | null;
  cvReason?: string;
  range: number;
  min: number;
  max: number;
}

export interface UniformityFailure {
  ok: false;
  reason: string;
}

/**
 * Uniformity figures for the device values of one wafer and one metric.
 * Returns `{ ok: false, reason }` for no values or any non-finite value (filter missing devices
 * first); for n = 1 gives mean/min/max/range but no standard deviation or CV (with `cvReason`);
 * for mean = 0 gives no CV (with `cvReason`). Never throws for data reasons.
 */
export function uniformity(values: readonly number[]): Uniformity | UniformityFailure {
  if (values.length === 0) return { ok: false, reason: "no device values" };
  const bad = values.findIndex((v) => !Number.isFinite(v));
  if (bad >= 0) return { ok: false, reason: `device value #${bad + 1} is not a finite number (${values[bad]})` };
  const xs = [...values];
  const lo = min(xs);
  const hi = max(xs);
  const m = mean(xs);
  const base = { ok: true as const, n: xs.length, mean: m, range: hi - lo, min: lo, max: hi };
  if (xs.length < 2) {
    return {
      ...base,
      standardDeviation: null,
      cvPercent: null,
      cvReason: "only one device: a standard deviation needs at least 2 values",
    };
  }
  const s = sampleStandardDeviation(xs);
  if (m === 0) {
    return { ...base, standardDeviation: s, cvPercent: null, cvReason: "the mean is zero, so the coefficient of variation is undefined" };
  }
  const cv = (100 * s) / Math.abs(m);
  if (!Number.isFinite(cv)) {
    return { ...base, standardDeviation: s, cvPercent: null, cvReason: "the mean is too close to zero for a finite coefficient of variation" };
  }
  return { ...base, standardDeviation: s, cvPercent: cv };
}
