/**
 * Indexed-colour PNG encoding (colour type 3, bit depth 8; PNG specification,
 * ISO/IEC 15948:2004, §11.2.3 PLTE and §11.3.2.1 tRNS) for the page pictures
 * drawn from a colour scale: the reciprocal-space maps (rsmFigure.ts) and the
 * strain maps (strainMapImage.ts). One byte per pixel instead of pngjs' four
 * (RGBA), every row with filter type 0 (None: the specification's advice for
 * palette images, §12.8) and zlib level PAGE_ZLIB_LEVEL: the same pixels in a
 * smaller file for less CPU (measured for issue 20; docs/scaling.md).
 * Chunks: IHDR, PLTE, tRNS (only when some entry is not opaque), one IDAT,
 * IEND; each with its CRC-32 (ISO 3309, as the specification's Annex D).
 */
import { crc32, deflateSync } from "node:zlib";

/**
 * zlib level of the page pictures (1 fastest … 9 smallest). On the demo's strain maps: level 4 gives
 * files 8 % larger than zlib's default 6 for 60 % of its CPU time (docs/scaling.md, issue 20 §2).
 */
export const PAGE_ZLIB_LEVEL = 4;

const SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

function chunk(type: string, data: Buffer): Buffer {
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  out.write(type, 4, "latin1");
  data.copy(out, 8);
  out.writeUInt32BE(crc32(out.subarray(4, 8 + data.length)), 8 + data.length);
  return out;
}

/**
 * PNG of row-major palette indices (`width × height`, each < palette entries).
 * `palette`: r, g, b triples (1 … 256 entries); `alpha`: optional opacity per
 * entry (0 transparent … 255 opaque; entries beyond it are opaque). Throws
 * RangeError for mismatched sizes or an index outside the palette
 * (programming errors).
 */
export function encodeIndexedPng(indices: Uint8Array, width: number, height: number, palette: Uint8Array, alpha?: Uint8Array, level = PAGE_ZLIB_LEVEL): Buffer {
  const entries = palette.length / 3;
  // PNG specification (ISO/IEC 15948) §11.2.2: width and height are 1 to 2^31 − 1; zero is invalid.
  for (const [name, n] of [
    ["width", width],
    ["height", height],
  ] as const)
    if (!Number.isInteger(n) || n < 1 || n > 2 ** 31 - 1)
      throw new RangeError(`encodeIndexedPng: a PNG's ${name} must be a whole number from 1 to 2^31 − 1 (PNG specification, IHDR), found ${n}`);
  if (indices.length !== width * height) throw new RangeError("encodeIndexedPng: index count does not match width×height");
  if (!Number.isInteger(entries) || entries < 1 || entries > 256)
    throw new RangeError(`encodeIndexedPng: palette of ${palette.length} bytes is not 1–256 rgb triples`);
  if (alpha && alpha.length > entries) throw new RangeError("encodeIndexedPng: more alpha values than palette entries");
  const raw = Buffer.alloc(height * (width + 1));
  for (let y = 0; y < height; y++) {
    const row = indices.subarray(y * width, (y + 1) * width);
    for (let x = 0; x < width; x++) if (row[x] >= entries) throw new RangeError(`encodeIndexedPng: index ${row[x]} outside a palette of ${entries}`);
    // Filter byte 0 (None), then the row's indices.
    raw.set(row, y * (width + 1) + 1);
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 3; // colour type: indexed
  // compression 0, filter method 0, no interlace
  const parts = [SIGNATURE, chunk("IHDR", ihdr), chunk("PLTE", Buffer.from(palette.buffer, palette.byteOffset, palette.length))];
  if (alpha?.some((a) => a !== 255)) parts.push(chunk("tRNS", Buffer.from(alpha.buffer, alpha.byteOffset, alpha.length)));
  parts.push(chunk("IDAT", deflateSync(raw, { level })), chunk("IEND", Buffer.alloc(0)));
  return Buffer.concat(parts);
}
