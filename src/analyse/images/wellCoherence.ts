/**
 * Coherence of a quantum well from geometric-phase strain maps.
 *
 * Definition: with ε̄ the mean of a strain map over a region, the well's
 * lattice parameter relative to the reference region is
 *   mismatch = (1 + ε̄_well)/(1 + ε̄_ref) − 1,
 * for the in-plane map (parallel to the interfaces; ≈ 0 for a coherent,
 * pseudomorphic well) and the out-of-plane map (along growth; for a coherent
 * well the tetragonal distortion ε⊥ = −D·ε∥ with D = 2C12/C11, REFERENCES §3).
 * Averages use pixels inside the well band shrunk by a margin of twice the GPA
 * resolution (and at least 15 % of the thickness), away from the image border
 * (3 resolutions) and with lattice-fringe amplitude ≥ minAmplitude. The
 * default reference is the lower barrier: a band as thick as the well (at
 * least 20 px) below the well, on the substrate side.
 *
 * Uncertainty: the pixel noise propagated at first order through the GPA
 * chain into the combination (1 + ε̄_well)/(1 + ε̄_ref) − 1
 * (strainMeanUncertainty.ts; GUM, JCGM 100:2008 §5.1). It replaced the standard
 * error of each region's map values with N/(4π·r²) effective samples, which a
 * Monte Carlo over noisy images showed to be 5–7× (in-plane) and 2–3×
 * (out-of-plane) too large: a strain map's spread holds structure that is not
 * noise, and its noise, a phase derivative, nearly cancels in a region mean.
 * Not included: the uncertainty of the well band's edges and of the tilt, and
 * systematic GPA errors (mask size, reference choice). Results in per cent.
 *
 * Verdict: coherent unless |in-plane mismatch| > inPlaneTolerance_pct or,
 * when an expected out-of-plane value is given, |out-of-plane − expected| >
 * outOfPlaneTolerance_pct. Returns { ok: false, reason } when a region has too
 * few usable pixels.
 */
import type { GpaMaps } from "./geometricPhase.ts";
import { growthCoordinate, growthNormal, inPlaneDirection, type Vec2 } from "./geometry.ts";
import { strainMeanUncertainty } from "./strainMeanUncertainty.ts";
import { degToRad } from "../numeric/angle.ts";

export interface WellCoherenceOptions {
  /** Growth coordinates (pixels, geometry.ts) of the well's lower and upper interfaces. */
  well: { bottom_px: number; top_px: number };
  /** Interface tilt for the growth coordinate, degrees (default: the maps' frame tilt). */
  tilt_deg?: number;
  /** Reference band in growth coordinates (default: the lower barrier, see the module comment). */
  reference?: { bottom_px: number; top_px: number };
  /** Out-of-plane strain expected from the stack and elastic constants, % (e.g. −2.006). */
  expectedOutOfPlane_pct?: number | null;
  /** Default 0.25 %. */
  inPlaneTolerance_pct?: number;
  /** Default 0.5 %. */
  outOfPlaneTolerance_pct?: number;
  /** Minimum relative fringe amplitude of a usable pixel (default 0.3). */
  minAmplitude?: number;
}

export interface ValueWithUncertainty {
  value: number;
  uncertainty: number;
}

export type WellCoherenceResult =
  | {
      ok: true;
      /** Well vs reference, in-plane, %. */
      inPlaneMismatch_pct: ValueWithUncertainty;
      /** Well vs reference, out-of-plane, %. */
      outOfPlaneStrain_pct: ValueWithUncertainty;
      expectedOutOfPlane_pct: number | null;
      coherent: boolean;
      /** Plain-words reasons when coherent is false. */
      findings: string[];
      wellPixels: number;
      referencePixels: number;
      reference: { bottom_px: number; top_px: number };
    }
  | { ok: false; reason: string };

interface RegionStats {
  n: number;
  pixels: number[];
  inMean: number;
  outMean: number;
}

function regionStats(maps: GpaMaps, lo: number, hi: number, tilt: number, minAmp: number): RegionStats {
  const { width, height } = maps;
  const border = Math.ceil(3 * maps.resolution_px);
  let n = 0;
  let si = 0,
    so = 0;
  const pixels: number[] = [];
  for (let y = border; y < height - border; y++) {
    for (let x = border; x < width - border; x++) {
      const s = growthCoordinate(x, y, width, height, maps.growthAxis, tilt);
      const i = y * width + x;
      if (s < lo || s > hi || !(maps.amplitude[i] >= minAmp)) continue;
      const a = maps.inPlane[i];
      const b = maps.outOfPlane[i];
      n++;
      si += a;
      so += b;
      pixels.push(i);
    }
  }
  return { n, pixels, inMean: si / n, outMean: so / n };
}

/** (1 + ε̄_w)/(1 + ε̄_r) − 1 in %, and its uncertainty along direction e (first-order weights ∂/∂ε̄_w, ∂/∂ε̄_r). */
function relative(maps: GpaMaps, w: RegionStats, r: RegionStats, key: "in" | "out", e: Vec2): ValueWithUncertainty {
  const mw = key === "in" ? w.inMean : w.outMean;
  const mr = key === "in" ? r.inMean : r.outMean;
  const value = ((1 + mw) / (1 + mr) - 1) * 100;
  const u = strainMeanUncertainty(maps, e, [
    { pixels: w.pixels, weight: 1 / (1 + mr) },
    { pixels: r.pixels, weight: -(1 + mw) / (1 + mr) ** 2 },
  ]);
  return { value, uncertainty: u * 100 };
}

/** Well vs reference lattice mismatch and coherence verdict; see the module comment. */
export function wellCoherence(maps: GpaMaps, options: WellCoherenceOptions): WellCoherenceResult {
  const { bottom_px, top_px } = options.well;
  if (!(Number.isFinite(bottom_px) && Number.isFinite(top_px) && top_px > bottom_px)) {
    return { ok: false, reason: "well band is missing or reversed (top must lie above bottom)" };
  }
  const tilt = degToRad(options.tilt_deg ?? maps.frameTilt_deg);
  const thickness = top_px - bottom_px;
  const margin = Math.max(2 * maps.resolution_px, 0.15 * thickness);
  if (thickness - 2 * margin < 2) {
    return { ok: false, reason: `well (${thickness.toFixed(1)} px) is too thin for the strain maps' resolution (${maps.resolution_px.toFixed(1)} px)` };
  }
  const reference = options.reference ?? { bottom_px: bottom_px - margin - Math.max(thickness, 20), top_px: bottom_px - margin };
  const minAmp = options.minAmplitude ?? 0.3;
  const w = regionStats(maps, bottom_px + margin, top_px - margin, tilt, minAmp);
  const r = regionStats(maps, reference.bottom_px, reference.top_px, tilt, minAmp);
  if (w.n < 50) return { ok: false, reason: `only ${w.n} usable strain-map pixels inside the well` };
  if (r.n < 50) return { ok: false, reason: `only ${r.n} usable strain-map pixels in the reference region` };
  // The maps' in-plane and out-of-plane components are taken in their own frame (frameTilt_deg).
  const frame = degToRad(maps.frameTilt_deg);
  const inPlane = relative(maps, w, r, "in", inPlaneDirection(maps.growthAxis, frame));
  const outOfPlane = relative(maps, w, r, "out", growthNormal(maps.growthAxis, frame));
  const findings: string[] = [];
  const tolIn = options.inPlaneTolerance_pct ?? 0.25;
  const tolOut = options.outOfPlaneTolerance_pct ?? 0.5;
  if (Math.abs(inPlane.value) > tolIn) {
    findings.push(`in-plane mismatch ${inPlane.value.toFixed(3)} % exceeds ±${tolIn} %: the well is not coherent with the reference`);
  }
  const expected = options.expectedOutOfPlane_pct ?? null;
  if (expected !== null && Math.abs(outOfPlane.value - expected) > tolOut) {
    findings.push(`out-of-plane strain ${outOfPlane.value.toFixed(3)} % differs from the expected ${expected.toFixed(3)} % by more than ${tolOut} %`);
  }
  return {
    ok: true,
    inPlaneMismatch_pct: inPlane,
    outOfPlaneStrain_pct: outOfPlane,
    expectedOutOfPlane_pct: expected,
    coherent: findings.length === 0,
    findings,
    wellPixels: w.n,
    referencePixels: r.n,
    reference,
  };
}
