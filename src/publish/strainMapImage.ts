/**
 * PNG pictures of strain maps and micrographs for the wafer pages.
 *
 * Strain maps use the diverging scale of colourScales.ts (ColorBrewer RdBu
 * reversed, from d3-scale-chromatic, as a 256-entry table), symmetric about
 * zero: compression (negative) blue, zero white, tension (positive) red;
 * values beyond ±limit take the end colours, missing values mid grey. Below the map a
 * colour bar strip runs from −limit (left) to +limit (right) with a dark tick
 * at zero; the limit is returned so the page can label the bar. Interfaces
 * are drawn as near-black lines of constant growth coordinate (geometry.ts).
 * `maxSide` block-averages by an integer factor so the page copy stays light;
 * omit it for the full-resolution copy.
 *
 * Encoding: 8-bit RGBA (strain) with pngjs PNG.sync.write, or 8-bit greyscale
 * (micrograph) with greyPng.ts. Throws RangeError for mismatched sizes (programming error).
 */
import { PNG } from "pngjs";
import { growthCoordinate } from "../analyse/images/geometry.ts";
import type { GrowthAxis } from "../model/imageInputs.ts";
import { encodeGreyPng, PAGE_PNG } from "./greyPng.ts";
import { quantile } from "simple-statistics";
import { divergingRgb, type RGB } from "./colourScales.ts";

const LINE: RGB = [20, 20, 20];

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

/** Renders a strain map as a PNG with colour bar and interface lines; see the module comment. */
export function renderStrainMap(map: ArrayLike<number>, width: number, height: number, options: StrainMapImageOptions = {}): StrainMapPicture {
  const small = downsample(map, width, height, options.maxSide);
  const limit = options.limit ?? Math.max(1e-4, absQuantile(map, 0.99));
  const bar = options.colourBarHeight ?? Math.max(6, Math.round(small.height / 16));
  const gap = 2;
  const png = new PNG({ width: small.width, height: small.height + gap + bar });
  const put = (x: number, y: number, c: RGB) => {
    const i = 4 * (y * small.width + x);
    [png.data[i], png.data[i + 1], png.data[i + 2], png.data[i + 3]] = [c[0], c[1], c[2], 255];
  };
  const f = small.factor;
  const lines = options.interfaces;
  const tilt = lines ? (lines.tilt_deg * Math.PI) / 180 : 0;
  for (let y = 0; y < small.height; y++) {
    for (let x = 0; x < small.width; x++) {
      let c = divergingColour(small.map[y * small.width + x] / limit);
      if (lines) {
        const s = growthCoordinate((x + 0.5) * f - 0.5, (y + 0.5) * f - 0.5, width, height, lines.growthAxis, tilt);
        if (lines.positions_px.some((p) => Math.abs(s - p) < 0.5 * f + 0.25)) c = LINE;
      }
      put(x, y, c);
    }
  }
  for (let y = small.height; y < small.height + gap; y++) for (let x = 0; x < small.width; x++) put(x, y, [255, 255, 255]);
  const zeroX = Math.round((small.width - 1) / 2);
  for (let y = small.height + gap; y < small.height + gap + bar; y++) {
    for (let x = 0; x < small.width; x++) {
      const t = small.width > 1 ? (2 * x) / (small.width - 1) - 1 : 0;
      put(x, y, x === zeroX ? LINE : divergingColour(t));
    }
  }
  return {
    png: PNG.sync.write(png, PAGE_PNG),
    width: png.width,
    height: png.height,
    factor: f,
    limit,
    colourBar: [small.height + gap, small.height + gap + bar],
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
