/**
 * Greyscale PNG encoding (pngjs PNG.sync.write, colour type 0) shared by the
 * page micrographs (strainMapImage.ts) and the synthetic micrograph files
 * (src/synth/micrographPng.ts). Callers map their intensities to grey levels;
 * this module only packs the levels into a PNG.
 */
import { PNG, type PackerOptions } from "pngjs";

/**
 * Encoder options for the pictures on wafer pages: every row filtered with
 * the Paeth predictor (PNG specification, ISO/IEC 15948 §9.4, filter type 4)
 * instead of pngjs' default of trying all five filters on every row and
 * keeping the one with the smallest sum of absolute differences (the
 * specification's suggested heuristic). The pixels are the same (lossless
 * either way); on the demo's strain maps and micrographs the files are
 * within 0.2 % of the adaptive size and encoding takes half the CPU time
 * (measured for issue 20; docs/scaling.md). Files that are data (the
 * synthetic micrographs the demo generator writes) keep the default, so
 * their bytes do not change.
 */
export const PAGE_PNG: PackerOptions = { filterType: 4 };

/**
 * PNG of row-major grey levels: integers 0–255 for bitDepth 8, 0–65535 for
 * bitDepth 16 (no scaling, no clamping here; values outside the range wrap as
 * in a Uint8/Uint16 store). 8-bit images go through pngjs' RGBA input with
 * r = g = b = level and opaque alpha; 16-bit images are written from a native
 * Uint16Array with inputColorType 0. `options`: pngjs encoder options (PAGE_PNG
 * for page pictures). Throws RangeError when levels.length is
 * not width × height (programming error).
 */
export function encodeGreyPng(levels: ArrayLike<number>, width: number, height: number, bitDepth: 8 | 16 = 8, options: PackerOptions = {}): Buffer {
  if (levels.length !== width * height) throw new RangeError("encodeGreyPng: level count does not match width×height");
  const png = new PNG({ width, height });
  if (bitDepth === 16) {
    png.data = Buffer.from(Uint16Array.from(levels).buffer);
    return PNG.sync.write(png, { ...options, colorType: 0, inputColorType: 0, bitDepth: 16 });
  }
  for (let i = 0; i < width * height; i++) {
    png.data[4 * i] = png.data[4 * i + 1] = png.data[4 * i + 2] = levels[i];
    png.data[4 * i + 3] = 255;
  }
  return PNG.sync.write(png, { ...options, colorType: 0 });
}
