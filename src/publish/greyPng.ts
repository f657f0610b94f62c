/**
 * Greyscale PNG encoding (pngjs PNG.sync.write, colour type 0) shared by the
 * page micrographs (strainMapImage.ts) and the synthetic micrograph files
 * (src/synth/micrographPng.ts). Callers map their intensities to grey levels;
 * this module only packs the levels into a PNG.
 */
import { PNG } from "pngjs";

/**
 * PNG of row-major grey levels: integers 0–255 for bitDepth 8, 0–65535 for
 * bitDepth 16 (no scaling, no clamping here; values outside the range wrap as
 * in a Uint8/Uint16 store). 8-bit images go through pngjs' RGBA input with
 * r = g = b = level and opaque alpha; 16-bit images are written from a native
 * Uint16Array with inputColorType 0. Throws RangeError when levels.length is
 * not width × height (programming error).
 */
export function encodeGreyPng(levels: ArrayLike<number>, width: number, height: number, bitDepth: 8 | 16 = 8): Buffer {
  if (levels.length !== width * height) throw new RangeError("encodeGreyPng: level count does not match width×height");
  const png = new PNG({ width, height });
  if (bitDepth === 16) {
    png.data = Buffer.from(Uint16Array.from(levels).buffer);
    return PNG.sync.write(png, { colorType: 0, inputColorType: 0, bitDepth: 16 });
  }
  for (let i = 0; i < width * height; i++) {
    png.data[4 * i] = png.data[4 * i + 1] = png.data[4 * i + 2] = levels[i];
    png.data[4 * i + 3] = 255;
  }
  return PNG.sync.write(png, { colorType: 0 });
}
