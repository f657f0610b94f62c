/**
 * PNG pictures of strain maps and micrographs for the wafer pages.
 *
 * Strain maps use the diverging scale of colourScales.ts (ColorBrewer RdBu
 * reversed, from d3-scale-chromatic, as a 256-entry table), symmetric about
 * zero: compression (negative) blue, zero white, tension (positive) red;
 * values beyond ±limit take the end colours, missing values mid grey. Below the map a
 * colour bar strip runs from −limit (left) to +limit (right) with a dark tick
 * at zero; the limit is returned so the page can label the bar. Interfaces
 * are drawn as near-black lines of constant growth coordinate (geometry.ts:
 * growthCoordinate, evaluated with the normal computed once per picture).
 * `maxSide` block-averages by an integer factor so the page copy stays light;
 * omit it for the full-resolution copy.
 *
 * Strain maps are drawn in STRAIN_LEVELS (65) colour levels of the scale, the
 * colour bar in the same levels, and written as an indexed-colour PNG
 * (indexedPng.ts: one byte per pixel, a palette of the levels); micrographs
 * as 8-bit greyscale with greyPng.ts. Throws RangeError for mismatched sizes (programming error).
 */
import { growthNormal } from "../analyse/images/geometry.ts";
import type { GrowthAxis } from "../model/imageInputs.ts";
import { encodeGreyPng, PAGE_PNG } from "./greyPng.ts";
import { encodeIndexedPng } from "./indexedPng.ts";
import { quantile } from "simple-statistics";
import { divergingRgb, type RGB } from "./colourScales.ts";

const LINE: RGB = [20, 20, 20];

/**
 * Colour levels of the strain scale (odd, so zero strain has a level of its own: the white centre):
 * t ∈ [−1, 1] is rounded to one of STRAIN_LEVELS evenly spaced values, each drawn in the scale's
 * colour there. The map and its colour bar go through the same rounding, so the bar shows exactly the
 * levels the map can take.
 */
export const STRAIN_LEVELS = 65;
const MISSING_ENTRY = STRAIN_LEVELS;
const LINE_ENTRY = STRAIN_LEVELS + 1;
const WHITE_ENTRY = STRAIN_LEVELS + 2;
/** Palette: the levels from −1 to +1, then missing (grey), interface line and white. */
const PALETTE = new Uint8Array(3 * (STRAIN_LEVELS + 3));
for (let l = 0; l < STRAIN_LEVELS; l++) PALETTE.set(divergingRgb((2 * l) / (STRAIN_LEVELS - 1) - 1), 3 * l);
PALETTE.set(divergingRgb(Number.NaN), 3 * MISSING_ENTRY);
PALETTE.set(LINE, 3 * LINE_ENTRY);
PALETTE.set([255, 255, 255], 3 * WHITE_ENTRY);

/** Palette entry of t ∈ [−1, 1] (clamped; non-finite → the missing grey). */
function strainLevel(t: number): number {
  return Number.isFinite(t) ? Math.round(((Math.min(1, Math.max(-1, t)) + 1) / 2) * (STRAIN_LEVELS - 1)) : MISSING_ENTRY;
}

/** Colour of t ∈ [−1, 1] on the diverging scale (clamped; non-finite → grey). */
export const divergingColour = divergingRgb;

/** Block-average by an integer factor so the long side is ≤ maxSide (NaN-aware). */
export function downsample(map: ArrayLike<number>, width: number, height: number, maxSide?: number) {
  if (map.length !== width * height) throw new RangeError("downsample: map length does not match width×height");
  const factor = maxSide && maxSide > 0 ? Math.max(1, Math.ceil(Math.max(width, height) / maxSide)) : 1;
  const w = Math.ceil(width / factor);
  const h = Math.ceil(height / factor);
  const out = new Float32Array(w * h);
  for (let by = 0; by < h; by++) {
    for (let bx = 0; bx < w; bx++) {
      let s = 0;
      let n = 0;
      for (let y = by * factor; y < Math.min(height, (by + 1) * factor); y++) {
        for (let x = bx * factor; x < Math.min(width, (bx + 1) * factor); x++) {
          const v = map[y * width + x];
          if (Number.isFinite(v)) {
            s += v;
            n++;
          }
        }
      }
      out[by * w + bx] = n ? s / n : Number.NaN;
    }
  }
  return { map: out, width: w, height: h, factor };
}

/** Value below which a fraction q of the finite |values| lie. */
function absQuantile(map: ArrayLike<number>, q: number): number {
  const a: number[] = [];
  for (let i = 0; i < map.length; i++) if (Number.isFinite(map[i])) a.push(Math.abs(map[i]));
  return a.length ? quantile(a, q) : 0;
}

export interface InterfaceLines {
  growthAxis: GrowthAxis;
  tilt_deg: number;
  /** Growth coordinates of the interfaces in the full-size image, pixels. */
  positions_px: number[];
}

export interface StrainMapImageOptions {
  /** Colour limit (map units); default the 99th percentile of |map|, at least 1e-4. */
  limit?: number;
  maxSide?: number;
  interfaces?: InterfaceLines;
  /** Height of the colour bar strip, pixels (default max(6, height/16)). */
  colourBarHeight?: number;
}

export interface PngPicture {
  png: Buffer;
  width: number;
  height: number;
  /** Downsampling factor from the analysed image. */
  factor: number;
}

export interface StrainMapPicture extends PngPicture {
  limit: number;
  /** Rows of the colour bar strip, [from, to). */
  colourBar: [number, number];
}

/**
 * Renders a strain map as a PNG with colour bar and interface lines; see the module comment.
 * A map without pixels (width or height 0) has no picture: refused (the page says there is no map: imagesSection.ts).
 */
export function renderStrainMap(map: ArrayLike<number>, width: number, height: number, options: StrainMapImageOptions = {}): StrainMapPicture {
  if (!(width > 0 && height > 0)) throw new RangeError(`renderStrainMap: the map has no pixels (${width} × ${height}), so there is no picture to draw`);
  const small = downsample(map, width, height, options.maxSide);
  const limit = options.limit ?? Math.max(1e-4, absQuantile(map, 0.99));
  const bar = options.colourBarHeight ?? Math.max(6, Math.round(small.height / 16));
  const gap = 2;
  const pw = small.width;
  const ph = small.height + gap + bar;
  const indices = new Uint8Array(pw * ph);
  const f = small.factor;
  const lines = options.interfaces;
  // The growth coordinate of each pixel centre (geometry.ts: growthCoordinate), with the normal computed once.
  const normal = lines ? growthNormal(lines.growthAxis, (lines.tilt_deg * Math.PI) / 180) : { x: 0, y: 0 };
  const near = 0.5 * f + 0.25;
  const cx = (width - 1) / 2;
  const cy = (height - 1) / 2;
  for (let y = 0; y < small.height; y++) {
    for (let x = 0; x < pw; x++) {
      let c = strainLevel(small.map[y * pw + x] / limit);
      if (lines) {
        const s = normal.x * ((x + 0.5) * f - 0.5 - cx) + normal.y * ((y + 0.5) * f - 0.5 - cy);
        for (const p of lines.positions_px) if (Math.abs(s - p) < near) c = LINE_ENTRY;
      }
      indices[y * pw + x] = c;
    }
  }
  indices.fill(WHITE_ENTRY, small.height * pw, (small.height + gap) * pw);
  const zeroX = Math.round((pw - 1) / 2);
  for (let y = small.height + gap; y < ph; y++) {
    for (let x = 0; x < pw; x++) {
      const t = pw > 1 ? (2 * x) / (pw - 1) - 1 : 0;
      indices[y * pw + x] = x === zeroX ? LINE_ENTRY : strainLevel(t);
    }
  }
  return {
    png: encodeIndexedPng(indices, pw, ph, PALETTE),
    width: pw,
    height: ph,
    factor: f,
    limit,
    colourBar: [small.height + gap, ph],
  };
}

/** Greyscale 8-bit PNG of a micrograph, stretched between its 0.5 % and 99.5 % levels. */
export function renderMicrograph(pixels: ArrayLike<number>, width: number, height: number, maxSide?: number): PngPicture {
  const small = downsample(pixels, width, height, maxSide);
  const finite = Array.from(small.map).filter(Number.isFinite);
  const [lo, hi] = finite.length ? quantile(finite, [0.005, 0.995]) : [0, 1];
  const levels = Array.from(small.map, (v) => (Number.isFinite(v) && hi > lo ? Math.round(255 * Math.max(0, Math.min(1, (v - lo) / (hi - lo)))) : 128));
  return { png: encodeGreyPng(levels, small.width, small.height, 8, PAGE_PNG), width: small.width, height: small.height, factor: small.factor };
}
