/**
 * Z-contrast (HAADF) profile across a quantum well and its interface widths.
 *
 * Method: (1) the fringe period along the growth direction comes from the
 * image's Bragg spot nearest the growth axis (latticeSpacing.ts); (2) the tilt
 * of the interfaces comes from the structure tensor of the image blurred over
 * one lattice period (interfaceTilt); tilts beyond ±maxTilt are refused;
 * (3) the image is averaged along the tilted interface direction into p(s)
 * (1-pixel bins, linear weight sharing) and smoothed twice over one lattice period,
 * which removes the atomic-plane modulation; (4) the well is the darker band
 * (a Si well between SiGe barriers is darker in HAADF: Ge is heavier)
 * around the profile minimum, below half-way between the minimum and the
 * 90th-percentile level (simple-statistics quantile, type 7); (5) each interface is fitted with the logistic edge
 * of sigmoidFit.ts (REFERENCES §10), 10–90 % width = 2·ln 9·τ. The two moving
 * averages add 2·p²/12 to the edge's variance (π²τ²/3 for a logistic); this
 * is removed: τ² ← τ_fit² − p²/(2π²).
 *
 * Uncertainty: pixel noise is taken as independent with one variance σ²; the
 * projected, twice-smoothed profile then has correlated points with a known
 * covariance σ²·S·V·Sᵀ (growthProfile.ts), and the standard error of τ_fit is the
 * least-squares sandwich covariance under that correlation, with σ² estimated
 * from the residuals over tr((I − H)·S·V·Sᵀ) (correlatedNoiseCovariance.ts). It
 * is propagated to the deconvolved τ and the 10–90 % width at first order (GUM,
 * JCGM 100:2008 §5.1). Not included: the scatter of the tilt and the period
 * estimates, and noise correlated between pixels (scan noise), which would
 * need its own covariance.
 *
 * Units: s and z in the growth coordinate of geometry.ts (from the image
 * centre, + toward the surface); widths and positions in metres, tilt in
 * degrees. Returns { ok: false, reason } when there is no clear well or a fit
 * fails.
 */
import { fitSigmoidEdge, LN9, sigmoidAt, sigmoidJacobian } from "../numeric/sigmoidFit.ts";
import { correlatedNoiseCovariance } from "../numeric/correlatedNoiseCovariance.ts";
import { cropToPowerOfTwo } from "./fft2d.ts";
import { growthNormal } from "./geometry.ts";
import type { GrowthAxis } from "../../model/imageInputs.ts";
import { projectProfile, smoothingMatrix, smoothOverPeriod } from "./growthProfile.ts";
import { interfaceTilt } from "./interfaceTilt.ts";
import { latticeSpacing } from "./latticeSpacing.ts";
import { degToRad } from "../numeric/angle.ts";
import { median, quantile } from "simple-statistics";

export interface ZContrastOptions {
  pixelSize_m: number;
  growthAxis: GrowthAxis;
  /** Lattice period along the growth axis, pixels (default: from the Fourier transform). */
  period_px?: number;
  /** Largest tilt corrected, degrees (default 5); beyond it the result is { ok: false }. */
  maxTilt_deg?: number;
  /** Tilt above which the image is flagged as tilted, degrees (default 1; the estimate scatters by ~0.2° on noisy images). */
  tiltThreshold_deg?: number;
  /** Use this tilt instead of searching, degrees. */
  tilt_deg?: number;
  /** Fit a linear background under each edge (default false). */
  backgroundSlope?: boolean;
}

export interface InterfaceEdgeFit {
  /** Growth coordinate of the edge centre, pixels and metres. */
  centre_px: number;
  centre_m: number;
  width10to90_m: number;
  width10to90StdErr_m: number;
  tau_m: number;
  r2: number;
  /** The fitted curve over the fitted window, for plotting (z in m). */
  curve: { z_m: number[]; value: number[] };
}

export type ZContrastResult =
  | {
      ok: true;
      tilt_deg: number;
      tilted: boolean;
      period_px: number | null;
      /** Profile along the growth axis: bin positions (m), raw and period-smoothed mean intensity. */
      z_m: number[];
      raw: number[];
      smoothed: number[];
      well: { bottom_px: number; top_px: number; thickness_m: number };
      /** Lower (substrate-side) and upper (surface-side) interface of the well. */
      bottom: InterfaceEdgeFit;
      top: InterfaceEdgeFit;
    }
  | { ok: false; reason: string };

/** Period (pixels) of the fringes parallel to the interfaces, or null when none within 10° of the growth axis. */
function growthPeriod(pixels: ArrayLike<number>, width: number, height: number, axis: GrowthAxis): number | null {
  if (width < 16 || height < 16) return null;
  const crop = cropToPowerOfTwo(pixels, width, height);
  const n = growthNormal(axis);
  const r = latticeSpacing(crop.pixels, crop.width, crop.height, { direction: n });
  if (!r.ok) return null;
  const cos = Math.abs(r.g.x * n.x + r.g.y * n.y) * r.period_px;
  return cos >= Math.cos(degToRad(10)) ? r.period_px : null;
}

/** Index range [iB, iT] of the dark band around the profile minimum, or a reason. */
function darkBand(p: number[]): { iB: number; iT: number } | { reason: string } {
  const hi = quantile(p, 0.9);
  let iMin = 0;
  for (let i = 1; i < p.length; i++) if (p[i] < p[iMin]) iMin = i;
  const lo = p[iMin];
  const absDiffs = p.slice(1).map((v, i) => Math.abs(v - p[i]));
  const noise = (absDiffs.length ? median(absDiffs) : 0) * 1.4826 + 1e-12;
  if (hi - lo < 10 * noise) return { reason: "no darker well band stands out of the profile noise" };
  const thr = (hi + lo) / 2;
  let iB = iMin;
  let iT = iMin;
  while (iB > 0 && p[iB - 1] < thr) iB--;
  while (iT < p.length - 1 && p[iT + 1] < thr) iT++;
  if (iB === 0 || iT === p.length - 1) return { reason: "the darker well band reaches the edge of the image" };
  return { iB, iT };
}

/** Noise model of the smoothed profile: its covariance per unit pixel variance is S·V_raw·Sᵀ (growthProfile.ts). */
interface ProfileNoise {
  /** Rows of S·V_raw (full profile indices). */
  sv: number[][];
  /** Smoothing matrix S (full profile indices). */
  smooth: number[][];
  /** Per row of sv and of smooth, the first and last index that can be nonzero (both matrices are banded). */
  svBand: Int32Array[];
  smoothBand: Int32Array[];
  /** Index in the full profile of the first trimmed point. */
  offset: number;
}

/** First and last index of each row's nonzero entries (first > last for an all-zero row). */
function rowBands(m: number[][]): Int32Array[] {
  const lo = new Int32Array(m.length);
  const hi = new Int32Array(m.length);
  m.forEach((row, i) => {
    let a = 0;
    while (a < row.length && row[a] === 0) a++;
    let b = row.length - 1;
    while (b >= a && row[b] === 0) b--;
    lo[i] = a;
    hi[i] = b;
  });
  return [lo, hi];
}

/**
 * Noise covariance (per unit pixel variance) of the smoothed points from..to (trimmed indices):
 * the dot products of rows of S·V_raw with rows of S, taken over the overlap of their bands
 * (the products left out are exact zeros).
 */
function windowCovariance(noise: ProfileNoise, from: number, to: number): number[][] {
  const rows = Array.from({ length: to - from + 1 }, (_, i) => i + from + noise.offset);
  const [svLo, svHi] = noise.svBand;
  const [sLo, sHi] = noise.smoothBand;
  return rows.map((a) =>
    rows.map((b) => {
      const x = noise.sv[a];
      const y = noise.smooth[b];
      const end = Math.min(svHi[a], sHi[b]);
      let c = 0;
      for (let m = Math.max(svLo[a], sLo[b]); m <= end; m++) c += x[m] * y[m];
      return c;
    }),
  );
}

function fitEdge(
  s: number[],
  p: number[],
  from: number,
  to: number,
  options: ZContrastOptions,
  period: number | null,
  noise: ProfileNoise,
): InterfaceEdgeFit | string {
  const z = s.slice(from, to + 1);
  const v = p.slice(from, to + 1);
  if (z.length < 8) return "too few profile points around an interface";
  let fit: ReturnType<typeof fitSigmoidEdge>;
  try {
    fit = fitSigmoidEdge(z, v, { slope: options.backgroundSlope ?? false });
  } catch (e) {
    return `interface fit failed: ${(e as Error).message}`;
  }
  const inside = fit.centre > z[0] && fit.centre < z[z.length - 1];
  if (!inside || !Number.isFinite(fit.tau) || !Number.isFinite(fit.width10to90StdErr)) return "interface fit did not converge inside its window";
  // Standard error of τ_fit: the smoothed points are correlated (two moving averages over a
  // period, neighbouring bins sharing pixels), so the pooled s²(JᵀJ)⁻¹ of the fit is replaced by
  // the sandwich covariance with that correlation and its residual scale (correlatedNoiseCovariance.ts).
  const free = options.backgroundSlope ? [0, 1, 2, 3, 4] : [0, 1, 2, 3];
  let tauFitStdErr: number;
  try {
    const rows = z.map((zz) => {
      const d = sigmoidJacobian(fit, zz);
      return free.map((k) => d[k]);
    });
    const c = correlatedNoiseCovariance(
      rows,
      windowCovariance(noise, from, to),
      v.map((vv, i) => vv - sigmoidAt(fit, z[i])),
    );
    tauFitStdErr = Math.sqrt(Math.max(0, c.covariance[3][3]));
  } catch {
    return "interface fit is degenerate (singular normal matrix)";
  }
  const px = options.pixelSize_m;
  const boxVar = period ? period ** 2 / (2 * Math.PI ** 2) : 0;
  const floor = fit.tau ** 2 - boxVar < (0.25 * fit.tau) ** 2;
  const tau = floor ? 0.25 * fit.tau : Math.sqrt(fit.tau ** 2 - boxVar);
  // First-order propagation (GUM, JCGM 100:2008, eq. 10) through τ = √(τ_fit² − p²/(2π²)):
  // dτ/dτ_fit = τ_fit/τ (≥ 1: removing the smoothing enlarges the relative error); on the floor τ = τ_fit/4.
  const dTau = floor ? 0.25 : fit.tau / tau;
  return {
    centre_px: fit.centre,
    centre_m: fit.centre * px,
    width10to90_m: 2 * LN9 * tau * px,
    width10to90StdErr_m: 2 * LN9 * dTau * tauFitStdErr * px,
    tau_m: tau * px,
    r2: fit.r2,
    curve: {
      z_m: z.map((zz) => zz * px),
      value: z.map((zz) => sigmoidAt(fit, zz)),
    },
  };
}

/**
 * Z-contrast profile of a HAADF image across one well: tilt, profile and
 * 10–90 % interface widths (see the module comment).
 */
export function zContrastProfile(pixels: ArrayLike<number>, width: number, height: number, options: ZContrastOptions): ZContrastResult {
  if (width < 16 || height < 16) return { ok: false, reason: `image ${width}×${height} is too small for a profile (need 16×16)` };
  if (!(options.pixelSize_m > 0)) throw new RangeError("zContrastProfile: pixelSize_m must be positive");
  for (let i = 0; i < pixels.length; i++) if (!Number.isFinite(pixels[i])) return { ok: false, reason: "image contains non-finite pixel values" };
  const axis = options.growthAxis;
  const period = options.period_px ?? growthPeriod(pixels, width, height, axis);
  const maxTilt = options.maxTilt_deg ?? 5;
  const tilt = options.tilt_deg ?? interfaceTilt(pixels, width, height, axis, period);
  if (Math.abs(tilt) > maxTilt) {
    return { ok: false, reason: `interfaces are tilted by ${tilt.toFixed(1)}°, more than the ${maxTilt}° that is corrected; rotate the image first` };
  }
  const full = projectProfile(pixels, width, height, axis, degToRad(tilt));
  // Drop the end bins, where the moving average runs out of samples.
  const trim = period ? Math.ceil(period) + 2 : 1;
  const smooth = smoothingMatrix(full.value.length, period);
  // Rows of S·V_raw, V_raw tridiagonal (variance, covarianceNext): each row is nonzero only one
  // index either side of S's band; elsewhere it is exactly zero.
  const smoothBand = rowBands(smooth);
  const cn = full.covarianceNext;
  const sv = smooth.map((row, a) => {
    const out = new Array<number>(row.length).fill(0);
    const end = Math.min(row.length - 1, smoothBand[1][a] + 1);
    for (let m = Math.max(0, smoothBand[0][a] - 1); m <= end; m++) {
      out[m] = (row[m - 1] ?? 0) * (cn[m - 1] ?? 0) + row[m] * full.variance[m] + (row[m + 1] ?? 0) * cn[m];
    }
    return out;
  });
  const noise: ProfileNoise = { sv, smooth, svBand: rowBands(sv), smoothBand, offset: trim };
  const smoothed = smoothOverPeriod(full.value, period).slice(trim, -trim);
  const prof = { s: full.s.slice(trim, -trim), value: full.value.slice(trim, -trim) };
  if (smoothed.length < 16) return { ok: false, reason: "profile is too short after smoothing" };
  const band = darkBand(smoothed);
  if ("reason" in band) return { ok: false, reason: band.reason };
  const { iB, iT } = band;
  const mid = Math.round((iB + iT) / 2);
  const reach = iT - iB;
  const bottom = fitEdge(prof.s, smoothed, Math.max(0, iB - reach), mid, options, period, noise);
  const top = fitEdge(prof.s, smoothed, mid, Math.min(smoothed.length - 1, iT + reach), options, period, noise);
  if (typeof bottom === "string") return { ok: false, reason: `lower interface: ${bottom}` };
  if (typeof top === "string") return { ok: false, reason: `upper interface: ${top}` };
  const px = options.pixelSize_m;
  return {
    ok: true,
    tilt_deg: tilt,
    tilted: Math.abs(tilt) > (options.tiltThreshold_deg ?? 1),
    period_px: period,
    z_m: prof.s.map((v) => v * px),
    raw: prof.value,
    smoothed,
    well: { bottom_px: bottom.centre_px, top_px: top.centre_px, thickness_m: (top.centre_px - bottom.centre_px) * px },
    bottom,
    top,
  };
}
