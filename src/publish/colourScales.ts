/**
 * The colour scales of the site's maps, taken from d3-scale-chromatic (a
 * maintained package) and sampled once into 256-entry look-up tables, so a
 * picture of a million pixels costs one table read per pixel.
 *
 * - Sequential (wafer maps, reciprocal-space maps): viridis, perceptually
 *   uniform in CAM02-UCS and readable in grey and with the common colour-vision
 *   deficiencies (van der Walt & Smith, matplotlib colormaps, 2015; d3's
 *   `interpolateViridis`). Dark is low, yellow is high.
 * - Diverging (strain maps, symmetric about zero): ColorBrewer RdBu reversed,
 *   blue for compression (negative), white at zero, red for tension (positive);
 *   lightness falls equally on both sides of the centre (Harrower & Brewer,
 *   Cartographic Journal 40, 27 (2003); d3's `interpolateRdBu`).
 *
 * Indices: t ∈ [0, 1] (sequential) or [−1, 1] (diverging) maps to entry
 * round(t'·255); values outside are clamped; a non-finite value returns the
 * missing colour (mid grey).
 */
import { interpolateRdBu, interpolateViridis } from "d3-scale-chromatic";

export type RGB = [number, number, number];

export const LUT_SIZE = 256;
export const MISSING_RGB: RGB = [128, 128, 128];

/** "rgb(r, g, b)" or "#rrggbb" (what d3 returns) → [r, g, b]. */
export function parseCssColour(css: string): RGB {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(css);
  if (hex) return [1, 2, 3].map((k) => parseInt(hex[k], 16)) as RGB;
  const rgb = /^rgb\((\d+),\s*(\d+),\s*(\d+)\)$/.exec(css);
  if (rgb) return [1, 2, 3].map((k) => Number(rgb[k])) as RGB;
  throw new Error(`colourScales: unexpected colour string from d3-scale-chromatic: ${css}`);
}

function table(interpolate: (t: number) => string): Uint8Array {
  const lut = new Uint8Array(3 * LUT_SIZE);
  for (let i = 0; i < LUT_SIZE; i++) lut.set(parseCssColour(interpolate(i / (LUT_SIZE - 1))), 3 * i);
  return lut;
}

/** viridis, entry i at t = i/255. */
export const SEQUENTIAL_LUT = table(interpolateViridis);
/** RdBu reversed (blue → white → red), entry i at t = i/255 of [−1, 1] → [0, 1]. */
export const DIVERGING_LUT = table((t) => interpolateRdBu(1 - t));

function entry(lut: Uint8Array, u: number): RGB {
  const i = Math.round(Math.min(1, Math.max(0, u)) * (LUT_SIZE - 1));
  return [lut[3 * i], lut[3 * i + 1], lut[3 * i + 2]];
}

/** Sequential colour of t ∈ [0, 1] (clamped). */
export function sequentialRgb(t: number): RGB {
  return Number.isFinite(t) ? entry(SEQUENTIAL_LUT, t) : MISSING_RGB;
}

/** Diverging colour of t ∈ [−1, 1] (clamped). */
export function divergingRgb(t: number): RGB {
  return Number.isFinite(t) ? entry(DIVERGING_LUT, (t + 1) / 2) : MISSING_RGB;
}

export function hex(c: RGB): string {
  return `#${c.map((v) => v.toString(16).padStart(2, "0")).join("")}`;
}

/** Relative luminance (sRGB, WCAG 2 definition), for choosing dark or light text on a fill. */
export function luminance(c: RGB): number {
  const lin = (v: number) => {
    const s = v / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(c[0]) + 0.7152 * lin(c[1]) + 0.0722 * lin(c[2]);
}

/** Dark or white text, whichever contrasts more with the fill (WCAG contrast ratio). */
export function textOn(c: RGB): string {
  const l = luminance(c);
  return (l + 0.05) / 0.05 >= 1.05 / (l + 0.05) ? "#111111" : "#ffffff";
}

/** SVG <stop> elements sampling a scale at n + 1 evenly spaced offsets (a colour bar's gradient). */
export function gradientStops(colour: (t: number) => RGB, from: number, to: number, n = 16): string {
  return Array.from(
    { length: n + 1 },
    (_, k) => `<stop offset="${(k / n).toFixed(4).replace(/\.?0+$/, "") || "0"}" stop-color="${hex(colour(from + ((to - from) * k) / n))}"/>`,
  ).join("");
}
