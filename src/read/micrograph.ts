/**
 * Reading lattice-image files: PNG, 8- or 16-bit greyscale.
 *
 * Decoded with pngjs (PNG.sync.read with skipRescale, so 16-bit samples keep
 * their full range). Accepted: greyscale (colour type 0), greyscale with
 * alpha (type 4; the alpha channel is ignored), and RGB/RGBA (types 2/6)
 * whose red, green and blue samples are equal in every pixel (some programs
 * save grey images that way). Rejected with a MicrographFormatError: other
 * file formats (recognised by their first bytes), damaged PNGs, palette PNGs,
 * bit depths other than 8 and 16, and true-colour images.
 *
 * Output pixels are normalised to 0…1: value / (2^bitDepth − 1), row-major.
 *
 * Before anything is decoded, the pixel count declared in the IHDR chunk
 * (width × height, PNG specification §11.2.2) is checked against `maxPixels`
 * (the `max_image_pixels` analysis setting): a few kilobytes of compressed
 * zeros can declare 20000 × 20000 pixels, and decoding them costs gigabytes.
 * pngjs bounds the inflated data by the declared size, so this check bounds
 * the whole decode.
 */
import { PNG } from "pngjs";

/** Default of `max_image_pixels`: 4096 × 4096, the largest frame common STEM/TEM cameras record (measured: about 4 s and 250 MB to decode). */
export const DEFAULT_MAX_IMAGE_PIXELS = 4096 * 4096;

/** A lattice-image file that is not an 8- or 16-bit greyscale PNG. */
export class MicrographFormatError extends Error {
  readonly expected: string;
  readonly found: string;
  readonly fix: string;
  /** What is wrong, in a few words, for the problem's message. */
  readonly what: string;
  constructor(expected: string, found: string, fix: string, what = "not a greyscale PNG micrograph") {
    super(`expected ${expected}, found ${found}. ${fix}`);
    this.name = "MicrographFormatError";
    this.expected = expected;
    this.found = found;
    this.fix = fix;
    this.what = what;
  }
}

export interface Micrograph {
  width: number;
  height: number;
  bitDepth: 8 | 16 | 32 | 64;
  /** Row-major intensities normalised to 0…1 (raw / (2^bitDepth − 1) for integers; see tiffMicrograph.ts for floats). */
  pixels: Float32Array;
  /** How the grey values were stored. */
  storedAs: "grey" | "grey+alpha" | "rgb-equal" | "float" | "float-rescaled";
  /** The file format. */
  container: "png" | "tiff";
}

const EXPECTED = "a greyscale image: PNG (8- or 16-bit) or TIFF";
const FIX = "Export the micrograph as a greyscale PNG or TIFF.";
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** Names the format of non-PNG bytes from their first bytes. */
function describeBytes(b: Uint8Array): string {
  if (b.length === 0) return "an empty file";
  const hex = Array.from(b.subarray(0, 4), (v) => v.toString(16).padStart(2, "0").toUpperCase()).join(" ");
  const starts = (...sig: number[]) => sig.every((v, i) => b[i] === v);
  if (starts(0xff, 0xd8, 0xff)) return `JPEG data (first bytes ${hex})`;
  if (starts(0x49, 0x49, 0x2a, 0x00) || starts(0x4d, 0x4d, 0x00, 0x2a)) return `TIFF data (first bytes ${hex})`;
  if (starts(0x47, 0x49, 0x46, 0x38)) return `GIF data (first bytes ${hex})`;
  if (starts(0x42, 0x4d)) return `BMP data (first bytes ${hex})`;
  const text = b.subarray(0, 64).every((v) => v === 9 || v === 10 || v === 13 || (v >= 32 && v < 127));
  if (text) return "text, not image data";
  return `unrecognised data (first bytes ${hex})`;
}

/**
 * Reads width and height from the IHDR chunk, which must come first (after the
 * 8-byte signature: length, "IHDR", width and height as 4-byte big-endian
 * numbers), and refuses an image above `maxPixels` before it is decoded.
 * A file too short to hold the header is left for the decoder to call damaged.
 */
function checkDeclaredSize(buf: Buffer, maxPixels: number): void {
  if (buf.length < 24 || buf.toString("latin1", 12, 16) !== "IHDR") return;
  const width = buf.readUInt32BE(16);
  const height = buf.readUInt32BE(20);
  if (width * height <= maxPixels) return;
  const n = (v: number) => v.toLocaleString("en-US");
  throw new MicrographFormatError(
    `at most ${n(maxPixels)} pixels (the max_image_pixels setting)`,
    `${n(width)} × ${n(height)} = ${n(width * height)} pixels declared in the PNG header`,
    "Crop or downsample the micrograph, or raise max_image_pixels in analysis.yaml or the wafer's analysis: block (docs/formats.md, Limits).",
    "micrograph too large",
  );
}

/**
 * Decodes an 8- or 16-bit greyscale PNG of at most `maxPixels` pixels into
 * normalised pixels. Throws MicrographFormatError for anything else (see the
 * module comment).
 */
export function decodeMicrograph(bytes: Uint8Array, maxPixels: number = DEFAULT_MAX_IMAGE_PIXELS): Micrograph {
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (buf.length < 8 || !PNG_SIGNATURE.every((v, i) => buf[i] === v)) {
    throw new MicrographFormatError(EXPECTED, describeBytes(buf), FIX);
  }
  checkDeclaredSize(buf, maxPixels);
  let png: ReturnType<typeof PNG.sync.read>;
  try {
    png = PNG.sync.read(buf, { skipRescale: true });
  } catch (e) {
    throw new MicrographFormatError(EXPECTED, `a damaged PNG (${(e as Error).message})`, "Re-export the image file.");
  }
  const { width, height, depth } = png;
  const colorType: number = png.colorType; // the typings omit palette type 3
  if (colorType === 3 || png.palette) throw new MicrographFormatError(EXPECTED, "a palette (indexed-colour) PNG", FIX);
  if (depth !== 8 && depth !== 16) throw new MicrographFormatError(EXPECTED, `a ${depth}-bit PNG`, FIX);
  // After decoding, pngjs stores 4 samples per pixel (grey is copied to R, G, B).
  const data = png.data as unknown as ArrayLike<number>;
  const max = depth === 16 ? 65535 : 255;
  const pixels = new Float32Array(width * height);
  const colour = colorType === 2 || colorType === 6;
  for (let i = 0; i < width * height; i++) {
    const r = data[4 * i];
    if (colour && (data[4 * i + 1] !== r || data[4 * i + 2] !== r)) {
      const x = i % width;
      const y = Math.floor(i / width);
      throw new MicrographFormatError(EXPECTED, `a colour image (pixel (${x}, ${y}) has red, green, blue = ${r}, ${data[4 * i + 1]}, ${data[4 * i + 2]})`, FIX);
    }
    pixels[i] = r / max;
  }
  return {
    width,
    height,
    bitDepth: depth as 8 | 16,
    pixels,
    storedAs: colour ? "rgb-equal" : colorType === 4 ? "grey+alpha" : "grey",
    container: "png",
  };
}
