/**
 * Reading lattice-image files written as TIFF (TIFF 6.0 specification, Adobe
 * 1992; baseline plus the Deflate compression of the Adobe Technical Note of
 * 2002), as microscopes export them: one greyscale image (PhotometricInterpretation
 * 0 or 1, one sample per pixel), 8-, 16- or 32-bit unsigned integer, or 32- or
 * 64-bit IEEE float (SampleFormat 3), uncompressed or with the usual lossless
 * compressions (LZW = 5, Deflate = 8 or 32946, PackBits = 32773), stripped or
 * tiled, with or without the horizontal predictor.
 *
 * The file structure (the directories) is read by the maintained `utif2`
 * decoder (UTIF.decode); the strips or tiles are decompressed by tiffBlocks.ts,
 * which checks each against the size it must have (and every LZW code). This
 * module checks what a micrograph must be, bounds the pixel count before
 * anything is decompressed, and turns the samples into intensities:
 *   integers: value / (2^bits − 1), as for PNG;
 *   floats:   value / max, when no value is negative (keeps intensity ratios);
 *             (value − min) / (max − min) otherwise, and `rescaled` says so.
 *
 * Pixel size from the resolution tags (XResolution 282, YResolution 283,
 * ResolutionUnit 296: 2 = inch, 3 = centimetre; 1 = no unit): 1/XResolution in
 * the unit. A value outside 0.001–100 nm per pixel is not a micrograph's scale
 * (72 or 300 per inch are screen and printer defaults) and is ignored, with a
 * note saying why; so is a resolution with no unit, and one whose X and Y
 * differ by more than 1 % (the analysis assumes square pixels).
 */
import UTIF from "utif2";
import { DEFAULT_MAX_IMAGE_PIXELS } from "./micrograph.ts";
import { decodeBlocks } from "./tiffBlocks.ts";
import { MicrographFormatError, type Micrograph } from "./micrograph.ts";

const EXPECTED = "a greyscale TIFF (8-, 16- or 32-bit integer, or 32- or 64-bit float; uncompressed, LZW, Deflate or PackBits)";
const FIX = "Export the micrograph as a single greyscale TIFF or PNG.";

/** Plausible pixel sizes of a lattice image, nm (common practice: 0.005–0.5 nm for atomic resolution; generous either side). */
const PLAUSIBLE_NM: [number, number] = [0.001, 100];

export function isTiff(b: Uint8Array): boolean {
  return (
    b.length >= 4 && ((b[0] === 0x49 && b[1] === 0x49 && b[2] === 0x2a && b[3] === 0x00) || (b[0] === 0x4d && b[1] === 0x4d && b[2] === 0x00 && b[3] === 0x2a))
  );
}

type Ifd = UTIF.IFD;

function tag(ifd: Ifd, n: number): number[] | undefined {
  const v = ifd[`t${n}`];
  return Array.isArray(v) ? (v as number[]) : undefined;
}

function first(ifd: Ifd, n: number, fallback: number): number {
  const v = tag(ifd, n);
  return v && typeof v[0] === "number" ? v[0] : fallback;
}

export interface TiffPixelSize {
  /** nm per pixel read from the resolution tags, when they hold a plausible physical scale. */
  nm?: number;
  /** Why the tags were not used, when they exist but are not a scale. */
  note?: string;
}

/** A RATIONAL tag's value: utif2 gives it as [[numerator, denominator]] (or a plain number). */
function rational(ifd: Ifd, n: number): number | undefined {
  const v = tag(ifd, n) as unknown[] | undefined;
  if (!v || v.length === 0) return undefined;
  const pair = Array.isArray(v[0]) ? (v[0] as number[]) : (v as number[]);
  return pair.length >= 2 ? pair[0] / pair[1] : pair[0];
}

/** The pixel size the resolution tags declare (see the module comment). */
export function tiffPixelSize(ifd: Ifd): TiffPixelSize {
  const xr = rational(ifd, 282);
  const yr = rational(ifd, 283);
  if (xr === undefined) return {};
  const unit = first(ifd, 296, 2);
  const perUnitNm = unit === 2 ? 2.54e7 : unit === 3 ? 1e7 : undefined;
  if (perUnitNm === undefined) return { note: "the file's resolution tags have no physical unit (ResolutionUnit 1)" };
  if (!(xr > 0)) return { note: `the file's XResolution is ${xr}` };
  const nm = perUnitNm / xr;
  const unitName = unit === 2 ? "inch" : "cm";
  if (yr !== undefined && yr > 0 && Math.abs(xr - yr) > 0.01 * xr) {
    return { note: `the file's X and Y resolutions differ (${xr} and ${yr} per ${unitName}); square pixels are assumed` };
  }
  if (nm < PLAUSIBLE_NM[0] || nm > PLAUSIBLE_NM[1]) {
    return {
      note: `the file's resolution (${+xr.toPrecision(6)} pixels per ${unitName}, ${+nm.toPrecision(4)} nm per pixel) is not a micrograph scale, likely a display default`,
    };
  }
  return { nm };
}

export interface TiffMicrograph extends Micrograph {
  pixelSize: TiffPixelSize;
}

/**
 * Decodes a greyscale TIFF of at most `maxPixels` pixels into normalised
 * intensities. Throws MicrographFormatError for anything else.
 */
/** The most image file directories read from one file (a microscope writes one, or a few thumbnails). */
const MAX_DIRECTORIES = 64;

/**
 * Walks the chain of image file directories (TIFF 6.0 §2: each ends in the offset of the next, 0
 * for the last) before utif2 does, which would follow a chain that loops back on itself for ever:
 * every directory must lie inside the file, none may be visited twice, at most MAX_DIRECTORIES.
 */
function checkDirectoryChain(bytes: Uint8Array): void {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const le = bytes[0] === 0x49;
  const damaged = (found: string) =>
    new MicrographFormatError(EXPECTED, `a damaged TIFF (${found})`, "Re-export the image file.", "not a readable TIFF micrograph");
  if (bytes.length < 8) throw damaged("shorter than its 8-byte header");
  const seen = new Set<number>();
  let at = dv.getUint32(4, le);
  while (at !== 0) {
    if (seen.has(at)) throw damaged(`its image directories loop back to offset ${at}`);
    if (seen.size >= MAX_DIRECTORIES) throw damaged(`more than ${MAX_DIRECTORIES} image directories`);
    if (at < 8 || at + 2 > bytes.length) throw damaged(`an image directory at offset ${at}, outside the file's ${bytes.length} bytes`);
    seen.add(at);
    const count = dv.getUint16(at, le);
    const end = at + 2 + 12 * count;
    if (end + 4 > bytes.length) throw damaged(`an image directory of ${count} entries running past the end of the file`);
    at = dv.getUint32(end, le);
  }
}

export function decodeTiffMicrograph(bytes: Uint8Array, maxPixels: number = DEFAULT_MAX_IMAGE_PIXELS): TiffMicrograph {
  // utif2 reads strips through `data.buffer` at file offsets: give it a buffer of its own (a copy:
  // Buffer#slice would be a view into Node's shared pool, at a non-zero offset).
  const buf = new Uint8Array(bytes).buffer;
  let ifds: Ifd[];
  checkDirectoryChain(bytes);
  try {
    ifds = UTIF.decode(buf);
  } catch (e) {
    throw new MicrographFormatError(
      EXPECTED,
      `a damaged TIFF (${String((e as Error)?.message ?? e)})`,
      "Re-export the image file.",
      "not a readable TIFF micrograph",
    );
  }
  const images = ifds.filter((d) => tag(d, 256) && tag(d, 257));
  if (images.length === 0) throw new MicrographFormatError(EXPECTED, "a TIFF without an image", FIX, "not a readable TIFF micrograph");
  const ifd = images[0];
  const width = first(ifd, 256, 0);
  const height = first(ifd, 257, 0);
  const n = (v: number) => v.toLocaleString("en-US");
  if (!(width > 0 && height > 0))
    throw new MicrographFormatError(EXPECTED, `a TIFF of ${width} × ${height} pixels`, "Re-export the image file.", "not a readable TIFF micrograph");
  if (width * height > maxPixels) {
    throw new MicrographFormatError(
      `at most ${n(maxPixels)} pixels (the max_image_pixels setting)`,
      `${n(width)} × ${n(height)} = ${n(width * height)} pixels declared in the TIFF header`,
      "Crop or downsample the micrograph, or raise max_image_pixels in analysis.yaml or the wafer's analysis: block (docs/formats.md, Limits).",
      "micrograph too large",
    );
  }
  const photometric = first(ifd, 262, 1);
  const spp = first(ifd, 277, 1);
  const bits = tag(ifd, 258) ?? [1];
  const bps = bits[0];
  const format = first(ifd, 339, 1);
  const compression = first(ifd, 259, 1);
  if (photometric > 1 || spp !== 1) {
    const what =
      photometric === 2
        ? "an RGB colour TIFF"
        : photometric === 3
          ? "a palette (indexed-colour) TIFF"
          : `a TIFF with ${spp} samples per pixel (photometric ${photometric})`;
    throw new MicrographFormatError(EXPECTED, what, FIX, "not a greyscale micrograph");
  }
  const intOk = format === 1 && (bps === 8 || bps === 16 || bps === 32);
  const floatOk = format === 3 && (bps === 32 || bps === 64);
  if (!intOk && !floatOk) {
    const kind = format === 2 ? "signed integer" : format === 3 ? "float" : "unsigned integer";
    throw new MicrographFormatError(EXPECTED, `a ${bps}-bit ${kind} TIFF`, FIX, "not a greyscale micrograph of a sample type read here");
  }
  if (![1, 5, 8, 32946, 32773].includes(compression)) {
    throw new MicrographFormatError(
      EXPECTED,
      `a TIFF with compression ${compression} (not a lossless compression read here)`,
      "Export the micrograph uncompressed, or with LZW or Deflate compression.",
    );
  }
  // utif2 reads past the end of a cut-short file as zeros: every strip or tile must lie inside the file.
  const offsets = tag(ifd, 273) ?? tag(ifd, 324) ?? [];
  const counts = tag(ifd, 279) ?? tag(ifd, 325) ?? [];
  if (offsets.length === 0 || offsets.length !== counts.length || offsets.some((o, k) => !(o >= 8 && counts[k] > 0 && o + counts[k] <= bytes.length))) {
    throw new MicrographFormatError(
      EXPECTED,
      `a damaged or cut-short TIFF (its image data lie beyond the file's ${n(bytes.length)} bytes)`,
      "Copy the file again from the microscope computer, or re-export it.",
      "not a readable TIFF micrograph",
    );
  }
  // Every strip or tile is decompressed here with the size it must have (tiffBlocks.ts), never by utif2, which
  // decodes a random LZW stream into garbage, or a short strip into zeros, without complaint.
  const tile = tag(ifd, 322) ? { width: first(ifd, 322, 0), length: first(ifd, 323, 0) } : undefined;
  const data = decodeBlocks(bytes, {
    width,
    height,
    bps,
    compression,
    predictor: first(ifd, 317, 1),
    littleEndian: bytes[0] === 0x49,
    rowsPerStrip: first(ifd, 278, height),
    tile,
    offsets,
    counts,
    maxPixels,
  });
  const view = new DataView(data.buffer, data.byteOffset, data.byteLength);
  // decodeBlocks leaves the samples in the file's byte order.
  const le = bytes[0] === 0x49;
  const count = width * height;
  const pixels = new Float32Array(count);
  const read = (i: number): number =>
    bps === 8
      ? view.getUint8(i)
      : bps === 16
        ? view.getUint16(2 * i, le)
        : bps === 32
          ? format === 3
            ? view.getFloat32(4 * i, le)
            : view.getUint32(4 * i, le)
          : view.getFloat64(8 * i, le);
  let rescaled = false;
  if (format === 1) {
    const max = 2 ** bps - 1;
    for (let i = 0; i < count; i++) pixels[i] = read(i) / max;
  } else {
    let lo = Infinity;
    let hi = -Infinity;
    const values = new Float64Array(count);
    for (let i = 0; i < count; i++) {
      const v = read(i);
      if (!Number.isFinite(v)) {
        throw new MicrographFormatError(
          "finite intensities in every pixel",
          `${v} at pixel (${i % width}, ${Math.floor(i / width)})`,
          "Replace the missing pixels (for example by the local mean) before export.",
          "micrograph has non-finite pixels",
        );
      }
      values[i] = v;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (!(hi > lo))
      throw new MicrographFormatError(
        EXPECTED,
        `a float TIFF whose every pixel is ${lo}`,
        "Check the export: the image holds no contrast.",
        "micrograph has no contrast",
      );
    rescaled = lo < 0;
    for (let i = 0; i < count; i++) pixels[i] = rescaled ? (values[i] - lo) / (hi - lo) : values[i] / hi;
  }
  // WhiteIsZero (photometric 0) stores inverted intensities.
  if (photometric === 0) for (let i = 0; i < count; i++) pixels[i] = 1 - pixels[i];
  return {
    width,
    height,
    bitDepth: bps as Micrograph["bitDepth"],
    pixels,
    storedAs: format === 3 ? (rescaled ? "float-rescaled" : "float") : "grey",
    container: "tiff",
    pixelSize: tiffPixelSize(ifd),
  };
}
