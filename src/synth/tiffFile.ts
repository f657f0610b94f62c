/**
 * Writes a single-image greyscale TIFF, as a microscope's export would, for
 * the demo and the tests. Written from the TIFF 6.0 specification (Adobe,
 * 1992): the 8-byte header, one image file directory (IFD) of 12-byte entries
 * in ascending tag order, strips of `rowsPerStrip` rows. Compressions:
 * none (1), PackBits (32773, TIFF 6.0 §9) and Deflate (8, Adobe Technical
 * Note "Adobe Photoshop TIFF Technical Notes", 2002: a zlib stream per strip).
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
  compression?: "none" | "packbits" | "deflate";
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

export function writeTiff(o: TiffOptions): Buffer {
  const le = o.littleEndian ?? true;
  const bytesPer = o.bits / 8;
  const rps = Math.min(o.rowsPerStrip ?? 16, o.height);
  const strips: Uint8Array[] = [];
  for (let y0 = 0; y0 < o.height; y0 += rps) {
    const rows = Math.min(rps, o.height - y0);
    const raw = new Uint8Array(rows * o.width * bytesPer);
    const dv = new DataView(raw.buffer);
    for (let k = 0; k < rows * o.width; k++) {
      const v = o.samples[y0 * o.width + k];
      const at = k * bytesPer;
      if (o.format === "float") o.bits === 32 ? dv.setFloat32(at, v, le) : dv.setFloat64(at, v, le);
      else if (o.bits === 8) dv.setUint8(at, v);
      else if (o.bits === 16) dv.setUint16(at, v, le);
      else dv.setUint32(at, v, le);
    }
    const c = o.compression ?? "none";
    strips.push(c === "deflate" ? new Uint8Array(deflateSync(raw)) : c === "packbits" ? packBits(raw) : raw);
  }
  const compressionTag = { none: 1, packbits: 32773, deflate: 8 }[o.compression ?? "none"];
  const res = o.resolution ?? (o.pixelNm ? { perUnit: 1e7 / o.pixelNm, unit: 3 as const } : undefined);
  // Entries: [tag, type, count, value or values]; type 3 SHORT, 4 LONG, 5 RATIONAL.
  type Entry = { tag: number; type: 3 | 4 | 5; values: number[] };
  const entries: Entry[] = [
    { tag: 256, type: 4, values: [o.width] },
    { tag: 257, type: 4, values: [o.height] },
    { tag: 258, type: 3, values: [o.bits] },
    { tag: 259, type: 3, values: [compressionTag] },
    { tag: 262, type: 3, values: [o.photometric ?? 1] },
    { tag: 273, type: 4, values: strips.map(() => 0) }, // filled below
    { tag: 277, type: 3, values: [1] },
    { tag: 278, type: 4, values: [rps] },
    { tag: 279, type: 4, values: strips.map((s) => s.length) },
  ];
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
  entries[5].values = stripOffsets;
  if (size(entries[5]) > 4 && !extraOffsets.has(entries[5])) throw new Error("unreachable");
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
