/**
 * Encodes a synthetic micrograph as a greyscale PNG (8- or 16-bit), the way a
 * microscope export would store it: intensities stretched linearly between
 * their 0.1 % and 99.9 % levels onto the full grey range, written by pngjs as
 * colour type 0 (grey). Independent of the page pictures' encoder.
 */
import { PNG } from "pngjs";

/** PNG of row-major grey levels (0–255 or 0–65535); 8-bit goes through pngjs' RGBA input, 16-bit through a native Uint16Array. */
function greyPng(levels: Float64Array, width: number, height: number, bitDepth: 8 | 16): Buffer {
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

/** Greyscale PNG of row-major pixels; throws RangeError when the sizes disagree. */
export function micrographPng(pixels: ArrayLike<number>, width: number, height: number, bitDepth: 8 | 16 = 8): Buffer {
  if (pixels.length !== width * height) throw new RangeError("micrographPng: pixel count does not match width×height");
  const sorted = Float64Array.from(pixels).sort();
  const lo = sorted[Math.floor(0.001 * (sorted.length - 1))];
  const hi = sorted[Math.floor(0.999 * (sorted.length - 1))];
  const max = bitDepth === 16 ? 65535 : 255;
  const level = (v: number) => Math.round(max * Math.max(0, Math.min(1, hi > lo ? (v - lo) / (hi - lo) : 0.5)));
  const levels = new Float64Array(width * height);
  for (let i = 0; i < levels.length; i++) levels[i] = level(pixels[i]);
  return greyPng(levels, width, height, bitDepth);
}
