/**
 * Geometric phase analysis (GPA) of a lattice image: strain and rotation maps.
 *
 * Method: Hÿtch, Snoeck & Kilaas, Ultramicroscopy 74, 131 (1998). Fourier
 * transform the image, pick two non-collinear Bragg spots g1, g2, multiply the
 * transform by a Gaussian mask around each spot, shift the spot to the origin
 * and inverse transform: H_g(r) = A_g(r)·exp(i P_g(r)). The local reciprocal
 * vector is g + ∇P_g/2π. ∇P_g is taken without unwrapping from the complex
 * field, in the discrete form of ∇P = Im(conj(H)·∇H)/|H|²: ∂P/∂x ≈
 * arg(H(x+1)·conj(H(x−1)))/2, exact for a linear phase. The reference vectors
 * are the mean local g over the reference region (the phase ramp there is
 * thereby subtracted).
 *
 * Variant: with G the 2×2 matrix whose rows are g1, g2, the local deformation
 * relative to the reference lattice is F = G_local⁻¹·G_ref (exact, no small-
 * strain expansion). F is split by the 2×2 polar decomposition F = R(ω)·U;
 * strain ε = U − I and rotation ω (rad). For small strain these reduce to
 * Hÿtch's ε = sym(∇u), ω = antisym(∇u); the polar split keeps a lattice
 * rotation from leaking into the strain at second order.
 *
 * Frames: exx, eyy, exy in pixel axes (x right, y down); inPlane, outOfPlane,
 * shear in the interface frame of geometry.ts (growth axis tilted by
 * frameTilt_deg). Strains are fractions (0.01 = 1 %), relative to the
 * reference region. Maps cover the input image; the image is padded with its
 * mean to a power-of-two size for the transforms. For the uncertainty of
 * region means, the maps carry the pixel-noise level (imageNoise.ts) and a
 * per-spot phase-noise field (strainMeanUncertainty.ts). Returns { ok: false,
 * reason } when two usable spots cannot be found or the input is not usable.
 */
import { fft2dInPlace, fft2dReal, padToPowerOfTwo, type ComplexImage } from "./fft2d.ts";
import { growthNormal, inPlaneDirection, type Vec2 } from "./geometry.ts";
import type { GrowthAxis, PixelRect } from "../../model/imageInputs.ts";
import { findBraggPeaks } from "./latticeSpacing.ts";
import { whiteNoiseVariance } from "./imageNoise.ts";
import { degToRad, radToDeg } from "../numeric/angle.ts";

export interface GpaOptions {
  /** Reference (unstrained) region in pixels; default the image less a border of 3 resolution lengths. */
  reference?: PixelRect;
  /** Bragg spots to use, cycles/pixel (default: found automatically). */
  g1?: Vec2;
  g2?: Vec2;
  /** Gaussian mask standard deviation, cycles/pixel (default 0.15 × the shorter |g|). */
  maskSigma?: number;
  growthAxis?: GrowthAxis;
  /** Tilt of the interface frame, degrees (default: from the reference g vectors, see gpaFrameTilt). */
  frameTilt_deg?: number;
  minPeriod_px?: number;
  maxPeriod_px?: number;
}

export interface GpaMaps {
  ok: true;
  width: number;
  height: number;
  /** Reference Bragg vectors after refinement, cycles/pixel. */
  g1: Vec2;
  g2: Vec2;
  maskSigma: number;
  /** Spatial standard deviation of the mask's smoothing, pixels: 1/(2π·maskSigma). */
  resolution_px: number;
  reference: PixelRect;
  growthAxis: GrowthAxis;
  frameTilt_deg: number;
  exx: Float32Array;
  eyy: Float32Array;
  exy: Float32Array;
  /** Lattice rotation relative to the reference, rad (positive: x axis toward y). */
  rotation: Float32Array;
  inPlane: Float32Array;
  outOfPlane: Float32Array;
  shear: Float32Array;
  /** min over the two spots of |H_g| / mean |H_g| in the reference: low values mark unreliable pixels. */
  amplitude: Float32Array;
  /** Standard deviation of the white pixel noise, from the periodogram (imageNoise.ts), image units. */
  pixelNoise: number;
  /**
   * Per spot, q = (σ_H/√2)·H/|H|² (real and imaginary maps): the phase noise has
   * Cov(δP(r), δP(r')) = ρ(r − r')·Re(q̄(r)·q(r')) (strainMeanUncertainty.ts).
   */
  phaseNoise: { re: Float32Array; im: Float32Array }[];
}

export type GpaResult = GpaMaps | { ok: false; reason: string };

/** Picks g1 (strongest spot) and g2 (strongest spot at 30°–150° to g1). */
export function pickSpots(peaks: { g: Vec2; contrast: number }[], minContrast = 20): [Vec2, Vec2] | null {
  const strong = peaks.filter((p) => p.contrast >= minContrast);
  if (strong.length < 2) return null;
  const g1 = strong[0].g;
  const n1 = Math.hypot(g1.x, g1.y);
  const g2 = strong.slice(1).find((p) => Math.abs(g1.x * p.g.y - g1.y * p.g.x) / n1 / Math.hypot(p.g.x, p.g.y) >= 0.5);
  return g2 ? [g1, g2.g] : null;
}

/**
 * Interface-frame tilt (degrees) from the reference g vectors: the smallest
 * angle between either g's line and the growth normal or the in-plane axis,
 * when within 10°; otherwise 0.
 */
export function gpaFrameTilt(g1: Vec2, g2: Vec2, axis: GrowthAxis): number {
  let best = Number.POSITIVE_INFINITY;
  for (const g of [g1, g2]) {
    for (const b of [growthNormal(axis), inPlaneDirection(axis)]) {
      let a = Math.atan2(b.x * g.y - b.y * g.x, b.x * g.x + b.y * g.y);
      if (a > Math.PI / 2) a -= Math.PI;
      if (a <= -Math.PI / 2) a += Math.PI;
      if (Math.abs(a) < Math.abs(best)) best = a;
    }
  }
  const deg = radToDeg(best);
  return Math.abs(deg) <= 10 ? deg : 0;
}

/** Demodulated complex field H_g for the spot nearest bin g (Gaussian mask σ, cycles/pixel), and Σ m² of the mask. */
function braggField(spectrum: ComplexImage, g: Vec2, sigma: number): { field: ComplexImage; carrier: Vec2; maskPower: number } {
  const { width: w, height: h } = spectrum;
  const kx0 = Math.round(g.x * w);
  const ky0 = Math.round(g.y * h);
  const re = new Float64Array(w * h);
  const im = new Float64Array(w * h);
  const sx = sigma * w;
  const sy = sigma * h;
  const rx = Math.min(Math.floor(w / 2) - 1, Math.ceil(4 * sx));
  const ry = Math.min(Math.floor(h / 2) - 1, Math.ceil(4 * sy));
  let maskPower = 0;
  for (let dy = -ry; dy <= ry; dy++) {
    const src = (((ky0 + dy) % h) + h) % h;
    const dst = ((dy % h) + h) % h;
    for (let dx = -rx; dx <= rx; dx++) {
      const m = Math.exp(-0.5 * ((dx / sx) ** 2 + (dy / sy) ** 2));
      maskPower += m * m;
      const s = src * w + ((((kx0 + dx) % w) + w) % w);
      const d = dst * w + (((dx % w) + w) % w);
      re[d] = spectrum.re[s] * m;
      im[d] = spectrum.im[s] * m;
    }
  }
  return { field: fft2dInPlace({ width: w, height: h, re, im }, true), carrier: { x: kx0 / w, y: ky0 / h }, maskPower };
}

/** q = (σ_H/√2)·H/|H|² over the first width×height pixels, σ_H² = σ²·Σm²/N_pad (strainMeanUncertainty.ts). */
function phaseNoiseField(f: ComplexImage, maskPower: number, variance: number, width: number, height: number) {
  const scale = Math.sqrt((variance * maskPower) / (f.width * f.height) / 2);
  const re = new Float32Array(width * height);
  const im = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * f.width + x;
      const a2 = f.re[i] ** 2 + f.im[i] ** 2;
      if (!(a2 > 0)) continue;
      re[y * width + x] = (scale * f.re[i]) / a2;
      im[y * width + x] = (scale * f.im[i]) / a2;
    }
  }
  return { re, im };
}

/** Local g maps (cycles/pixel) and amplitude over the first width×height pixels of the padded field. */
function localG(f: ComplexImage, carrier: Vec2, width: number, height: number) {
  const { width: W, height: H, re, im } = f;
  const gx = new Float64Array(width * height);
  const gy = new Float64Array(width * height);
  const amp = new Float64Array(width * height);
  const arg2 = (a: number, b: number) => Math.atan2(im[a] * re[b] - re[a] * im[b], re[a] * re[b] + im[a] * im[b]) / (4 * Math.PI);
  for (let y = 0; y < height; y++) {
    const row = y * W;
    const up = ((y - 1 + H) % H) * W;
    const down = ((y + 1) % H) * W;
    for (let x = 0; x < width; x++) {
      const i = row + x;
      const o = y * width + x;
      // Periodic neighbours: x ± 1 wraps only at the padded field's ends.
      const right = x + 1 < W ? i + 1 : row;
      const left = x > 0 ? i - 1 : row + W - 1;
      gx[o] = carrier.x + arg2(right, left);
      gy[o] = carrier.y + arg2(down + x, up + x);
      amp[o] = Math.hypot(re[i], im[i]);
    }
  }
  return { gx, gy, amp };
}

function regionMean(map: Float64Array, width: number, r: PixelRect): number {
  let s = 0;
  let n = 0;
  for (let y = r[1]; y < r[3]; y++) {
    for (let x = r[0]; x < r[2]; x++) {
      s += map[y * width + x];
      n++;
    }
  }
  return s / n;
}

/** GPA strain and rotation maps of a lattice image; see the module comment. */
export function geometricPhase(pixels: ArrayLike<number>, width: number, height: number, options: GpaOptions = {}): GpaResult {
  if (width < 32 || height < 32) return { ok: false, reason: `image ${width}×${height} is too small for GPA (need 32×32)` };
  if (pixels.length !== width * height) throw new RangeError("geometricPhase: pixel count does not match width×height");
  for (let i = 0; i < pixels.length; i++) if (!Number.isFinite(pixels[i])) return { ok: false, reason: "image contains non-finite pixel values" };
  const padded = padToPowerOfTwo(pixels, width, height);
  let spots: [Vec2, Vec2] | null = options.g1 && options.g2 ? [options.g1, options.g2] : null;
  if (!spots) {
    const peaks = findBraggPeaks(padded.pixels, padded.width, padded.height, { ...options, count: 12 });
    spots = pickSpots(peaks);
    if (!spots) return { ok: false, reason: "could not find two non-collinear lattice spots in the Fourier transform" };
  }
  const sigma = options.maskSigma ?? 0.15 * Math.min(Math.hypot(spots[0].x, spots[0].y), Math.hypot(spots[1].x, spots[1].y));
  const resolution = 1 / (2 * Math.PI * sigma);
  const border = Math.ceil(3 * resolution);
  const reference = options.reference ?? [border, border, width - border, height - border];
  const [rx0, ry0, rx1, ry1] = reference;
  if (!(rx0 >= 0 && ry0 >= 0 && rx1 <= width && ry1 <= height && rx1 - rx0 >= 4 && ry1 - ry0 >= 4)) {
    return { ok: false, reason: `reference region [${reference.join(", ")}] is empty or outside the ${width}×${height} image` };
  }
  const spectrum = fft2dReal(padded.pixels, padded.width, padded.height);
  const noiseVariance = whiteNoiseVariance(spectrum, width * height);
  const phaseNoise: { re: Float32Array; im: Float32Array }[] = [];
  const fields = spots.map((g) => {
    const { field, carrier, maskPower } = braggField(spectrum, g, sigma);
    phaseNoise.push(phaseNoiseField(field, maskPower, noiseVariance, width, height));
    return localG(field, carrier, width, height);
  });
  const ref = fields.map((f) => ({ x: regionMean(f.gx, width, reference), y: regionMean(f.gy, width, reference), a: regionMean(f.amp, width, reference) }));
  const det = ref[0].x * ref[1].y - ref[0].y * ref[1].x;
  if (Math.abs(det) < 1e-12 || !(ref[0].a > 0 && ref[1].a > 0))
    return { ok: false, reason: "the two lattice spots are collinear or absent in the reference region" };
  const axis = options.growthAxis ?? "up";
  const frameTilt_deg = options.frameTilt_deg ?? gpaFrameTilt(ref[0], ref[1], axis);
  const maps = strainMaps(fields, ref, width, height, axis, degToRad(frameTilt_deg));
  return {
    ok: true,
    width,
    height,
    g1: { x: ref[0].x, y: ref[0].y },
    g2: { x: ref[1].x, y: ref[1].y },
    maskSigma: sigma,
    resolution_px: resolution,
    reference,
    growthAxis: axis,
    frameTilt_deg,
    ...maps,
    pixelNoise: Math.sqrt(noiseVariance),
    phaseNoise,
  };
}

type Field = { gx: Float64Array; gy: Float64Array; amp: Float64Array };

/** Per-pixel F = G_local⁻¹·G_ref, polar split F = R·U, ε = U − I, then the interface frame. */
function strainMaps(fields: Field[], ref: { x: number; y: number; a: number }[], width: number, height: number, axis: GrowthAxis, tilt: number) {
  const n = width * height;
  const out = {
    exx: new Float32Array(n),
    eyy: new Float32Array(n),
    exy: new Float32Array(n),
    rotation: new Float32Array(n),
    inPlane: new Float32Array(n),
    outOfPlane: new Float32Array(n),
    shear: new Float32Array(n),
    amplitude: new Float32Array(n),
  };
  const nv = growthNormal(axis, tilt);
  const tv = inPlaneDirection(axis, tilt);
  const [f1, f2] = fields;
  const [r1, r2] = ref;
  for (let i = 0; i < n; i++) {
    const a = f1.gx[i],
      b = f1.gy[i],
      c = f2.gx[i],
      d = f2.gy[i];
    const det = a * d - b * c;
    if (!(Math.abs(det) > 0) || !Number.isFinite(det)) continue; // no lattice signal: strain 0, amplitude 0
    // F = G_local⁻¹ · G_ref, with G_local⁻¹ = [[d, −b], [−c, a]] / det.
    const F00 = (d * r1.x - b * r2.x) / det;
    const F01 = (d * r1.y - b * r2.y) / det;
    const F10 = (-c * r1.x + a * r2.x) / det;
    const F11 = (-c * r1.y + a * r2.y) / det;
    const w = Math.atan2(F10 - F01, F00 + F11);
    const cw = Math.cos(w),
      sw = Math.sin(w);
    const exx = cw * F00 + sw * F10 - 1;
    const eyy = -sw * F01 + cw * F11 - 1;
    const exy = cw * F01 + sw * F11;
    out.exx[i] = exx;
    out.eyy[i] = eyy;
    out.exy[i] = exy;
    out.rotation[i] = w;
    out.inPlane[i] = tv.x * tv.x * exx + 2 * tv.x * tv.y * exy + tv.y * tv.y * eyy;
    out.outOfPlane[i] = nv.x * nv.x * exx + 2 * nv.x * nv.y * exy + nv.y * nv.y * eyy;
    out.shear[i] = tv.x * nv.x * exx + (tv.x * nv.y + tv.y * nv.x) * exy + tv.y * nv.y * eyy;
    out.amplitude[i] = Math.min(f1.amp[i] / r1.a, f2.amp[i] / r2.a);
  }
  return out;
}
