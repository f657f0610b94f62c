/**
 * Ge fraction on the (001) atomic layers around the well, built from the
 * two-interface logistic model that the depth-profile analysis fitted
 * (depthProfile.ts), for the valley-splitting prediction (valleySplitting.ts).
 *
 * Why the model and not the measured bins: the valley coupling is set by the
 * profile's Fourier component at 2·k0 (period ≈ 0.33 nm); bins of 0.1–0.5 nm
 * and counting noise cannot resolve it (Losert et al., Phys. Rev. B 108,
 * 125405 (2023); Paquelet Wuetz et al., Nat. Commun. 13, 7730 (2022)).
 *
 * Model (depth d in nm, growth axis z = −d):
 *   x(d) = x_top − (x_top − x_w)·L((d − c_top)/τ_top) + (x_bot − x_w)·L((d − c_bot)/τ_bot),
 *   L(u) = 1/(1 + e^(−u)),
 * with c, τ the fitted centres and logistic τ of the top and bottom edges,
 * x_top, x_bot their fitted barrier plateaus (at the centres), and x_w the
 * median of the measured Ge over the middle half of the well (between the
 * centres). Layers sit at d_l = l·a0/4 for integer l (z0 fixed at depth 0),
 * from c_top − 6 nm to c_bot + 6 nm. The three levels are clipped to [0, 1]
 * before use (fractions; counting noise can put the median of a pure-Si well
 * slightly below 0). Clipping the levels, not x(d) point by point, keeps x
 * smooth: a kink where x(d) crossed 0 would add a spurious 2·k0 component.
 *
 * Departure of the measurement from the model (a spike, a graded well):
 * residuals r_i = measured − model over the same depth range are averaged
 * over runs of 5 points; where |mean| > 4·max(s, 0.001)/√5, s the
 * point-to-point noise of the profile (1.4826·MAD of first differences / √2:
 * robust, common practice; the floor of 0.001 = 0.1 at.% keeps a noiseless or
 * rounded profile from reporting departures of no consequence), the run is
 * reported. Such features are not in the prediction.
 * Pure; never throws for data.
 */
import type { InterfaceFit } from "./depthProfile.ts";

export interface LayerProfile {
  /** Depth of each (001) layer, nm. */
  depth: number[];
  /** Ge fraction of each layer from the model, 1. */
  ge: number[];
  xTop: number;
  xBottom: number;
  xWell: number;
  /** The model x(d) at any depth (nm) (in [0, 1] whenever x_w lies below both plateaus; clipped otherwise). */
  at: (depthNm: number) => number;
}

export interface ProfileDeparture {
  /** Point-to-point noise of the measured Ge fraction, 1. */
  noise: number;
  /** Largest |5-point mean residual|, 1, and where (nm). */
  largest: number;
  largestDepth: number;
  /** Depth ranges (nm) where the measurement departs from the model by more than its noise. */
  ranges: [number, number][];
}

/** Window of the layer sum on either side of the well, nm. */
export const LAYER_MARGIN_NM = 6;
const RUN = 5;
/** Smallest noise level assumed when judging departures, Ge fraction (0.1 at.%). */
const NOISE_FLOOR = 0.001;

const logistic = (u: number) => 1 / (1 + Math.exp(-u));
const median = (v: number[]) => {
  const s = v.slice().sort((a, b) => a - b);
  const n = s.length;
  return n === 0 ? NaN : n % 2 ? s[(n - 1) >> 1] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
};

/** The layer profile (see module comment); undefined when the well's middle half holds no measured point. */
export function layerProfile(
  depth: readonly number[],
  ge: readonly number[],
  top: InterfaceFit,
  bottom: InterfaceFit,
  latticeNm: number,
): LayerProfile | undefined {
  const quarter = (bottom.centre - top.centre) / 4;
  const middle: number[] = [];
  depth.forEach((d, i) => {
    if (d >= top.centre + quarter && d <= bottom.centre - quarter && Number.isFinite(ge[i])) middle.push(ge[i]);
  });
  if (middle.length === 0) return undefined;
  const clip = (v: number) => Math.min(1, Math.max(0, v));
  const xWell = clip(median(middle));
  const xTop = clip(top.barrierGe);
  const xBottom = clip(bottom.barrierGe);
  const at = (d: number) => {
    const x = xTop - (xTop - xWell) * logistic((d - top.centre) / top.tau) + (xBottom - xWell) * logistic((d - bottom.centre) / bottom.tau);
    return Math.min(1, Math.max(0, x));
  };
  const spacing = latticeNm / 4;
  const first = Math.ceil((top.centre - LAYER_MARGIN_NM) / spacing);
  const last = Math.floor((bottom.centre + LAYER_MARGIN_NM) / spacing);
  const layers: number[] = [];
  for (let l = first; l <= last; l++) layers.push(l * spacing);
  return { depth: layers, ge: layers.map(at), xTop, xBottom, xWell, at };
}

/** Where the measured profile departs from the layer model by more than its noise (see module comment). */
export function profileDeparture(depth: readonly number[], ge: readonly number[], model: LayerProfile): ProfileDeparture {
  const idx = depth
    .map((_, i) => i)
    .filter((i) => Number.isFinite(depth[i]) && Number.isFinite(ge[i]))
    .sort((a, b) => depth[a] - depth[b]);
  const diffs = idx.slice(1).map((i, k) => Math.abs(ge[i] - ge[idx[k]]));
  const noise = (1.4826 * median(diffs)) / Math.SQRT2;
  const lo = model.depth[0];
  const hi = model.depth[model.depth.length - 1];
  const inRange = idx.filter((i) => depth[i] >= lo && depth[i] <= hi);
  const resid = inRange.map((i) => ge[i] - model.at(depth[i]));
  const limit = (4 * Math.max(noise, NOISE_FLOOR)) / Math.sqrt(RUN);
  const ranges: [number, number][] = [];
  let largest = 0;
  let largestDepth = NaN;
  for (let k = 0; k + RUN <= resid.length; k++) {
    let s = 0;
    for (let j = k; j < k + RUN; j++) s += resid[j];
    const mean = Math.abs(s / RUN);
    const from = depth[inRange[k]];
    const to = depth[inRange[k + RUN - 1]];
    if (mean > largest) {
      largest = mean;
      largestDepth = 0.5 * (from + to);
    }
    if (!(mean > limit)) continue;
    const last = ranges[ranges.length - 1];
    if (last && from <= last[1]) last[1] = to;
    else ranges.push([from, to]);
  }
  return { noise, largest, largestDepth, ranges };
}
