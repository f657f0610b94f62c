/**
 * Writes a single-image greyscale TIFF, as a microscope's export would, for
 * the demo and the tests. Written from the TIFF 6.0 specification (Adobe,
 * 1992): the 8-byte header, one image file directory (IFD) of 12-byte entries
 * in ascending tag order, strips of `rowsPerStrip` rows. Compressions:
 * none (1), PackBits (32773, TIFF 6.0 §9), LZW (5, TIFF 6.0 §13) and Deflate
 * (8, Adobe Technical Note "Adobe Photoshop TIFF Technical Notes", 2002: a
 * zlib stream per strip); optionally the horizontal predictor (§14) and
 * square tiles (§15) instead of strips.
 * Nothing here is shared with the reader (src/read/tiffMicrograph.ts).
 */
import { deflateSync } from "node:zlib";

export interface TiffOptions {
  width: number;
  height: number;
  /** Row-major samples, already in the sample type's range. */
  samples: ArrayLike<number>;
  bits: 8 | 16 | 32 | 64;
  format: "uint" | "float";
  littleEndian?: boolean;
  compression?: "none" | "packbits" | "deflate" | "lzw";
  /** 2: horizontal differencing (TIFF 6.0 §14), 8- and 16-bit samples. */
  predictor?: 1 | 2;
  /** Square tiles of this side (a multiple of 16) instead of strips. */
  tile?: number;
  rowsPerStrip?: number;
  /** Pixel size in nm, written as XResolution = YResolution per centimetre (ResolutionUnit 3). */
  pixelNm?: number;
  /** Raw resolution tags instead (e.g. 72 per inch, a display default). */
  resolution?: { perUnit: number; unit: 1 | 2 | 3 };
  /** PhotometricInterpretation: 1 BlackIsZero (default), 0 WhiteIsZero, 2 RGB (for refusal tests). */
  photometric?: 0 | 1 | 2;
}

/** PackBits run-length encoding (TIFF 6.0 §9, Apple Technical Note TN1023). */
export function packBits(src: Uint8Array): Uint8Array {
  const out: number[] = [];
  let i = 0;
  while (i < src.length) {
    let run = 1;
    while (i + run < src.length && run < 128 && src[i + run] === src[i]) run++;
    if (run >= 2) {
      out.push(257 - run, src[i]);
      i += run;
      continue;
    }
    const start = i;
    let lit = 0;
    while (i < src.length && lit < 128 && !(i + 1 < src.length && src[i + 1] === src[i])) {
      i++;
      lit++;
    }
    if (lit === 0) {
      i++;
      lit = 1;
    }
    out.push(lit - 1, ...src.subarray(start, start + lit));
  }
  return Uint8Array.from(out);
}

/**
 * LZW as TIFF 6.0 §13 writes it: ClearCode (256) first, codes most
 * significant bit first from 9 to 12 bits, the width growing as the table's
 * next free entry passes 2^width − 1, a ClearCode when the table reaches
 * 4094 entries, EndOfInformation (257) last.
 */
export function lzwEncode(src: Uint8Array): Uint8Array {
  const out: number[] = [];
  let acc = 0;
  let nacc = 0;
  const put = (code: number, width: number) => {
    acc = (acc << width) | code;
    nacc += width;
    while (nacc >= 8) {
      out.push((acc >>> (nacc - 8)) & 0xff);
      nacc -= 8;
    }
    acc &= (1 << nacc) - 1;
  };
  let table = new Map<number, number>();
  let free = 258;
  let width = 9;
  const grow = () => {
    free++;
    if (free === 4094) {
      put(256, width);
      table = new Map();
      free = 258;
      width = 9;
    } else if (free > (1 << width) - 1) width++;
  };
  put(256, width);
  let w = -1;
  for (const c of src) {
    if (w === -1) {
      w = c;
      continue;
    }
    const key = w * 256 + c;
    const found = table.get(key);
    if (found !== undefined) {
      w = found;
      continue;
    }
    put(w, width);
    table.set(key, free);
    grow();
    w = c;
  }
  if (w !== -1) {
    put(w, width);
    grow();
  }
  put(257, width);
  if (nacc > 0) out.push((acc << (8 - nacc)) & 0xff);
  return Uint8Array.from(out);
}

/** Horizontal differencing (TIFF 6.0 §14) of rows of `rowPixels` samples, in place. */
function difference(raw: Uint8Array, rowPixels: number, bits: number, le: boolean): void {
  const dv = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
  const bytesPer = bits / 8;
  for (let r = 0; r * rowPixels * bytesPer < raw.length; r++) {
    for (let x = rowPixels - 1; x >= 1; x--) {
      const at = (r * rowPixels + x) * bytesPer;
      if (bits === 8) raw[at] = (raw[at] - raw[at - 1]) & 0xff;
      else dv.setUint16(at, (dv.getUint16(at, le) - dv.getUint16(at - 2, le)) & 0xffff, le);
    }
  }
}

export function writeTiff(o: TiffOptions): Buffer {
  const le = o.littleEndian ?? true;
  const bytesPer = o.bits / 8;
  const rps = Math.min(o.rowsPerStrip ?? 16, o.height);
  const strips: Uint8Array[] = [];
  const c = o.compression ?? "none";
  const compress = (raw: Uint8Array, rowPixels: number) => {
    if (o.predictor === 2) difference(raw, rowPixels, o.bits, le);
    return c === "deflate" ? new Uint8Array(deflateSync(raw)) : c === "packbits" ? packBits(raw) : c === "lzw" ? lzwEncode(raw) : raw;
  };
  const sample = (dv: DataView, at: number, v: number) => {
    if (o.format === "float") o.bits === 32 ? dv.setFloat32(at, v, le) : dv.setFloat64(at, v, le);
    else if (o.bits === 8) dv.setUint8(at, v);
    else if (o.bits === 16) dv.setUint16(at, v, le);
    else dv.setUint32(at, v, le);
  };
  if (o.tile) {
    // Tiles left to right, top to bottom; an edge tile is padded with zeros to its full size (TIFF 6.0 §15).
    const t = o.tile;
    for (let ty = 0; ty < o.height; ty += t) {
      for (let tx = 0; tx < o.width; tx += t) {
        const raw = new Uint8Array(t * t * bytesPer);
        const dv = new DataView(raw.buffer);
        for (let y = 0; y < t && ty + y < o.height; y++)
          for (let x = 0; x < t && tx + x < o.width; x++) sample(dv, (y * t + x) * bytesPer, o.samples[(ty + y) * o.width + tx + x]);
        strips.push(compress(raw, t));
      }
    }
  } else {
    for (let y0 = 0; y0 < o.height; y0 += rps) {
      const rows = Math.min(rps, o.height - y0);
      const raw = new Uint8Array(rows * o.width * bytesPer);
      const dv = new DataView(raw.buffer);
      for (let k = 0; k < rows * o.width; k++) sample(dv, k * bytesPer, o.samples[y0 * o.width + k]);
      strips.push(compress(raw, o.width));
    }
  }
  const compressionTag = { none: 1, packbits: 32773, deflate: 8, lzw: 5 }[c];
  const res = o.resolution ?? (o.pixelNm ? { perUnit: 1e7 / o.pixelNm, unit: 3 as const } : undefined);
  // Entries: [tag, type, count, value or values]; type 3 SHORT, 4 LONG, 5 RATIONAL.
  type Entry = { tag: number; type: 3 | 4 | 5; values: number[] };
  const entries: Entry[] = [
    { tag: 256, type: 4, values: [o.width] },
    { tag: 257, type: 4, values: [o.height] },
    { tag: 258, type: 3, values: [o.bits] },
    { tag: 259, type: 3, values: [compressionTag] },
    { tag: 262, type: 3, values: [o.photometric ?? 1] },
    ...(o.tile
      ? []
      : [
          { tag: 273, type: 4 as const, values: strips.map(() => 0) }, // filled below
          { tag: 277, type: 3 as const, values: [1] },
          { tag: 278, type: 4 as const, values: [rps] },
          { tag: 279, type: 4 as const, values: strips.map((s) => s.length) },
        ]),
  ];
  if (o.tile) entries.push({ tag: 277, type: 3, values: [1] });
  if (o.predictor === 2) entries.push({ tag: 317, type: 3, values: [2] });
  if (o.tile) {
    entries.push({ tag: 322, type: 4, values: [o.tile] }, { tag: 323, type: 4, values: [o.tile] });
    entries.push({ tag: 324, type: 4, values: strips.map(() => 0) }, { tag: 325, type: 4, values: strips.map((s) => s.length) });
  }
  if (res) {
    // A rational as numerator/denominator (two 32-bit unsigned integers): the largest power-of-ten denominator that fits.
    let den = 1;
    while (den < 1e6 && res.perUnit * den * 10 < 4e9) den *= 10;
    const rational = [Math.round(res.perUnit * den), den];
    entries.push({ tag: 282, type: 5, values: rational });
    entries.push({ tag: 283, type: 5, values: rational });
    entries.push({ tag: 296, type: 3, values: [res.unit] });
  }
  entries.push({ tag: 339, type: 3, values: [o.format === "float" ? 3 : 1] });
  // An IFD's entries in ascending tag order (TIFF 6.0 §2).
  entries.sort((a, b) => a.tag - b.tag);
  const size = (e: Entry) => (e.type === 3 ? 2 : 4) * e.values.length;
  const ifdOffset = 8;
  const ifdSize = 2 + entries.length * 12 + 4;
  let extra = ifdOffset + ifdSize;
  const extraOffsets = new Map<Entry, number>();
  for (const e of entries) {
    if (size(e) > 4) {
      extraOffsets.set(e, extra);
      extra += size(e);
      extra += extra % 2;
    }
  }
  let dataAt = extra;
  const stripOffsets = strips.map((s) => {
    const at = dataAt;
    dataAt += s.length + (s.length % 2);
    return at;
  });
  const offsetsEntry = entries.find((e) => e.tag === (o.tile ? 324 : 273))!;
  offsetsEntry.values = stripOffsets;
  const buf = Buffer.alloc(dataAt);
  const dv = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  buf.write(le ? "II" : "MM", 0, "latin1");
  dv.setUint16(2, 42, le);
  dv.setUint32(4, ifdOffset, le);
  dv.setUint16(ifdOffset, entries.length, le);
  const put = (at: number, e: Entry) => {
    e.values.forEach((v, k) => (e.type === 3 ? dv.setUint16(at + 2 * k, v, le) : dv.setUint32(at + 4 * k, v, le)));
  };
  entries.forEach((e, k) => {
    const at = ifdOffset + 2 + 12 * k;
    dv.setUint16(at, e.tag, le);
    dv.setUint16(at + 2, e.type, le);
    dv.setUint32(at + 4, e.type === 5 ? e.values.length / 2 : e.values.length, le);
    const far = extraOffsets.get(e);
    if (far !== undefined) {
      dv.setUint32(at + 8, far, le);
      put(far, e);
    } else put(at + 8, e);
  });
  dv.setUint32(ifdOffset + 2 + 12 * entries.length, 0, le);
  strips.forEach((s, k) => buf.set(s, stripOffsets[k]));
  return buf;
}
