/**
 * The image data of a TIFF, strip by strip or tile by tile (TIFF 6.0
 * specification, Adobe 1992, §15 for tiles), decompressed here with the size
 * each block must have, so a damaged or hostile block is refused with where
 * it is and what was found rather than decoded into garbage or zeros:
 *   - uncompressed (1): the block holds at least its rows' bytes;
 *   - PackBits (32773, TIFF 6.0 §9): every run fits in the block's bytes;
 *   - LZW (5, TIFF 6.0 §13): lzwDecode below, checked code by code;
 *   - Deflate (8, 32946; Adobe Photoshop TIFF Technical Notes, 2002): a zlib
 *     stream, inflated to at most the block's size (zlib's maxOutputLength),
 *     so a small file cannot expand into gigabytes.
 * Each block must decode to exactly rows × row bytes (a tile: its full tile
 * size, edge tiles included). That size is bounded before anything is
 * decompressed: a strip's rows never exceed the image's height (RowsPerStrip
 * beyond it is legal and read as the height), and a tile is refused when a
 * side exceeds the image's padded to the next multiple of 16 (tiles are
 * multiples of 16, TIFF 6.0 §15), allowing up to 256 for small images (the
 * tile size writers commonly use; common practice), or when its area exceeds
 * the image-size limit (max_image_pixels): otherwise a small image with one
 * huge tile of zeros would inflate to gigabytes within "its tile's size". The horizontal predictor (TIFF 6.0 §14) is
 * undone per row for 8- and 16-bit samples. Returns the samples in the
 * file's byte order.
 */
import { inflateSync } from "node:zlib";
import { MicrographFormatError } from "./micrograph.ts";

export interface BlockLayout {
  width: number;
  height: number;
  /** Bits per sample: 8, 16, 32 or 64. */
  bps: number;
  compression: number;
  predictor: number;
  littleEndian: boolean;
  /** Strips (rowsPerStrip) or tiles (tileWidth × tileLength). */
  rowsPerStrip?: number;
  tile?: { width: number; length: number };
  offsets: number[];
  counts: number[];
  /** The largest image accepted, in pixels (the max_image_pixels setting): no tile may be larger. */
  maxPixels?: number;
}

const EXPECTED = "a greyscale TIFF (8-, 16- or 32-bit integer, or 32- or 64-bit float; uncompressed, LZW, Deflate or PackBits)";
const damaged = (found: string) =>
  new MicrographFormatError(
    EXPECTED,
    `a damaged TIFF (${found})`,
    "Re-export the image file, uncompressed or with LZW or Deflate.",
    "not a readable TIFF micrograph",
  );

/**
 * LZW as TIFF 6.0 §13 writes it: codes most significant bit first, 9 bits
 * wide growing to 12 one code early ("early change": at 511, 1023, 2047),
 * ClearCode 256 first and after every table reset, EndOfInformation 257.
 * Refused, naming the byte where it happens: a stream that does not start
 * with ClearCode (random data almost never does; the old, pre-6.0
 * least-significant-bit-first variant does not either), a code beyond the
 * table built so far, a code that would need a 13th bit, output beyond
 * `expected` bytes (stopped there: no bomb), a stream that ends without
 * EndOfInformation before `expected` bytes. Returns exactly the decoded bytes.
 */
export function lzwDecode(src: Uint8Array, expected: number, where: string): Uint8Array {
  const CLEAR = 256;
  const EOI = 257;
  const out = new Uint8Array(expected);
  let written = 0;
  // The table as (prefix code, last byte, length); strings are rebuilt backwards into `out`.
  const prefix = new Int32Array(4096);
  const suffix = new Uint8Array(4096);
  const length = new Int32Array(4096);
  const first = new Uint8Array(4096);
  for (let c = 0; c < 256; c++) {
    prefix[c] = -1;
    suffix[c] = c;
    length[c] = 1;
    first[c] = c;
  }
  let next = 258;
  let width = 9;
  let previous = -1;
  let bitPos = 0;
  const totalBits = src.length * 8;
  const fail = (what: string) =>
    damaged(`${where}: ${what} at byte ${Math.floor(bitPos / 8)} of its ${src.length}; LZW data as TIFF 6.0 §13 writes them never do`);
  const emit = (code: number, at: number) => {
    // Writes the string of `code` at out[at…]; the caller has checked it fits.
    for (let c = code, k = at + length[code] - 1; c !== -1; c = prefix[c], k--) out[k] = suffix[c];
  };
  let codes = 0;
  for (;;) {
    if (bitPos + width > totalBits) {
      if (written === expected) return out;
      throw fail(`the stream ends without its end code after ${written} of ${expected} bytes`);
    }
    let code = 0;
    for (let b = 0; b < width; b++, bitPos++) code = (code << 1) | ((src[bitPos >> 3] >> (7 - (bitPos & 7))) & 1);
    if (codes++ === 0 && code !== CLEAR) throw fail(`the first code is ${code}, not the clear code 256 every TIFF LZW stream starts with`);
    if (code === CLEAR) {
      next = 258;
      width = 9;
      previous = -1;
      continue;
    }
    if (code === EOI) {
      if (written !== expected) throw fail(`the end code comes after ${written} of the ${expected} bytes the block holds`);
      return out;
    }
    if (previous === -1) {
      if (code > 255) throw fail(`the code ${code} follows a clear code, where only a literal byte may`);
      if (written + 1 > expected) throw fail(`the data decode to more than the ${expected} bytes the block holds`);
      out[written++] = code;
      previous = code;
      continue;
    }
    if (code > next || (code === next && next >= 4096)) throw fail(`the code ${code} is beyond the ${next} entries of the table built so far`);
    const known = code < next;
    const len = known ? length[code] : length[previous] + 1;
    if (written + len > expected) throw fail(`the data decode to more than the ${expected} bytes the block holds`);
    if (known) emit(code, written);
    else {
      // The KwKwK case: the previous string and its own first byte.
      emit(previous, written);
      out[written + len - 1] = first[previous];
    }
    if (next < 4096) {
      prefix[next] = previous;
      suffix[next] = out[written];
      length[next] = length[previous] + 1;
      first[next] = first[previous];
      next++;
    }
    written += len;
    previous = code;
    // Early change: the width grows one code before the table needs it.
    if (next + 1 >= 1 << width && width < 12) width++;
  }
}

/**
 * PackBits (TIFF 6.0 §9): every run must fit the block. A run that would
 * write beyond `expected` bytes is refused there; an incomplete header left
 * after the last full run is taken as padding.
 */
function unpackBits(src: Uint8Array, expected: number, where: string): Uint8Array {
  const out = new Uint8Array(expected);
  let o = 0;
  let i = 0;
  while (i < src.length) {
    const n = (src[i] << 24) >> 24;
    const run = n >= 0 ? n + 1 : 1 - n;
    const need = n >= 0 ? n + 1 : 1;
    if (n === -128) {
      i++;
      continue;
    }
    if (i + 1 + need > src.length) {
      if (o === expected) break;
      throw damaged(`${where}: a PackBits run of ${run} bytes at byte ${i} runs past the block's data`);
    }
    if (o + run > expected)
      throw damaged(`${where}: a PackBits ${n >= 0 ? "run" : "repeat"} of ${run} bytes at byte ${i} runs past the ${expected} bytes the block holds`);
    if (n >= 0) out.set(src.subarray(i + 1, i + 1 + run), o);
    else out.fill(src[i + 1], o, o + run);
    o += run;
    i += 1 + need;
  }
  if (o !== expected) throw damaged(`${where} unpacks to ${o} bytes, not the ${expected} it holds`);
  return out;
}

function decodeBlock(src: Uint8Array, expected: number, compression: number, where: string): Uint8Array {
  if (compression === 1) {
    if (src.length < expected) throw damaged(`${where} holds ${src.length} bytes, not the ${expected} its pixels need`);
    return src.subarray(0, expected);
  }
  if (compression === 32773) return unpackBits(src, expected, where);
  if (compression === 5) return lzwDecode(src, expected, where);
  let block: Buffer;
  try {
    block = inflateSync(src, { maxOutputLength: expected });
  } catch (e) {
    const tooBig = (e as { code?: string }).code === "ERR_BUFFER_TOO_LARGE" || e instanceof RangeError;
    throw damaged(
      tooBig
        ? `${where} inflates to more than the ${expected} bytes it holds (a decompression bomb or a damaged file)`
        : `${where} does not inflate: ${(e as Error).message}`,
    );
  }
  if (block.length !== expected) throw damaged(`${where} inflates to ${block.length} bytes, not the ${expected} it holds`);
  return block;
}

/** Undoes the horizontal predictor (TIFF 6.0 §14) in place, rows of `rowPixels` samples. */
function undoPredictor(block: Uint8Array, rowPixels: number, bps: number, le: boolean): void {
  const bytesPer = bps / 8;
  const rowBytes = rowPixels * bytesPer;
  const dv = new DataView(block.buffer, block.byteOffset, block.byteLength);
  for (let r = 0; r * rowBytes < block.length; r++) {
    for (let x = 1; x < rowPixels; x++) {
      const at = r * rowBytes + x * bytesPer;
      if (bps === 8) block[at] = (block[at] + block[at - 1]) & 0xff;
      else dv.setUint16(at, (dv.getUint16(at, le) + dv.getUint16(at - 2, le)) & 0xffff, le);
    }
  }
}

/** The image's samples (width × height, row-major, the file's byte order), from its strips or tiles. */
export function decodeBlocks(bytes: Uint8Array, l: BlockLayout): Uint8Array {
  const bytesPer = l.bps / 8;
  if (l.predictor !== 1 && !(l.predictor === 2 && l.bps <= 16))
    throw new MicrographFormatError(
      EXPECTED,
      `a TIFF with predictor ${l.predictor} on ${l.bps}-bit samples`,
      "Export without a predictor, or uncompressed.",
      "not a readable TIFF micrograph",
    );
  const rowBytes = l.width * bytesPer;
  const out = new Uint8Array(l.height * rowBytes);
  const block = (k: number, expected: number, where: string) => {
    // A copy when it is undone in place: never change the caller's bytes.
    const b = decodeBlock(bytes.subarray(l.offsets[k], l.offsets[k] + l.counts[k]), expected, l.compression, where);
    return l.predictor === 2 && l.compression === 1 ? Uint8Array.from(b) : b;
  };
  if (l.tile) {
    const { width: tw, length: th } = l.tile;
    if (!(tw > 0 && th > 0)) throw damaged(`tiles of ${tw} × ${th} pixels`);
    const side = (n: number) => Math.max(Math.ceil(n / 16) * 16, 256);
    if (tw > side(l.width) || th > side(l.height) || (l.maxPixels !== undefined && tw * th > l.maxPixels))
      throw damaged(
        `tiles of ${tw} × ${th} pixels for an image of ${l.width} × ${l.height}: a tile is at most the image padded to a multiple of 16 (or 256)${
          l.maxPixels === undefined ? "" : ` and ${l.maxPixels} pixels (max_image_pixels)`
        }; refused before decompressing, as a decompression bomb or a damaged file`,
      );
    const across = Math.ceil(l.width / tw);
    const down = Math.ceil(l.height / th);
    if (l.offsets.length < across * down) throw damaged(`${l.offsets.length} tiles for an image ${across} × ${down} tiles large`);
    for (let ty = 0; ty < down; ty++) {
      for (let tx = 0; tx < across; tx++) {
        const k = ty * across + tx;
        const t = block(k, tw * th * bytesPer, `tile ${k + 1}`);
        if (l.predictor === 2) undoPredictor(t, tw, l.bps, l.littleEndian);
        const cols = Math.min(tw, l.width - tx * tw);
        for (let r = 0; r < th && ty * th + r < l.height; r++)
          out.set(t.subarray(r * tw * bytesPer, (r * tw + cols) * bytesPer), (ty * th + r) * rowBytes + tx * tw * bytesPer);
      }
    }
    return out;
  }
  const rowsPerStrip = Math.min(l.rowsPerStrip ?? l.height, l.height);
  if (!(rowsPerStrip > 0)) throw damaged(`${rowsPerStrip} rows per strip`);
  const strips = Math.ceil(l.height / rowsPerStrip);
  if (l.offsets.length < strips) throw damaged(`${l.offsets.length} strips for ${l.height} rows of ${rowsPerStrip} per strip`);
  for (let k = 0; k < strips; k++) {
    const rows = Math.min(rowsPerStrip, l.height - k * rowsPerStrip);
    const s = block(k, rows * rowBytes, `strip ${k + 1}`);
    if (l.predictor === 2) undoPredictor(s, l.width, l.bps, l.littleEndian);
    out.set(s, k * rowsPerStrip * rowBytes);
  }
  return out;
}
