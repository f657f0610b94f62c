/**
 * TIFF micrographs (issue: raw files as instruments leave them). Files are
 * written by src/synth/tiffFile.ts from the TIFF 6.0 specification (Adobe
 * 1992), which shares no code with the reader; expected intensities are the
 * written samples divided by the full scale, written out here.
 */
import { describe, expect, it } from "vitest";
import { decodeTiffMicrograph, isTiff } from "../../src/read/tiffMicrograph.ts";
import { decodeMicrograph, MicrographFormatError } from "../../src/read/micrograph.ts";
import { micrographPng } from "../../src/synth/micrographPng.ts";
import { lzwEncode, packBits, writeTiff } from "../../src/synth/tiffFile.ts";
import UTIF from "utif2";

const W = 23;
const H = 17;
/** A ramp with structure in both directions, integer samples below `max`. */
function samples(max: number): number[] {
  return Array.from({ length: W * H }, (_, i) => Math.round((((i % W) * 7 + Math.floor(i / W) * 13) % 101) * (max / 100)));
}

describe("greyscale TIFF decoding", () => {
  for (const bits of [8, 16, 32] as const) {
    for (const compression of ["none", "packbits", "deflate", "lzw"] as const) {
      for (const littleEndian of [true, false]) {
        it(`${bits}-bit unsigned, ${compression}, ${littleEndian ? "II" : "MM"}: every pixel is sample / (2^${bits} − 1)`, () => {
          const max = 2 ** bits - 1;
          const s = samples(max);
          const bytes = writeTiff({ width: W, height: H, samples: s, bits, format: "uint", compression, littleEndian, rowsPerStrip: 5 });
          expect(isTiff(bytes)).toBe(true);
          const m = decodeTiffMicrograph(bytes);
          expect([m.width, m.height, m.bitDepth, m.container]).toEqual([W, H, bits, "tiff"]);
          for (let i = 0; i < s.length; i++) expect(m.pixels[i]).toBeCloseTo(s[i] / max, 6);
        });
      }
    }
  }
  it("32- and 64-bit float: intensities keep their ratios (value / max)", () => {
    for (const bits of [32, 64] as const) {
      const s = samples(1000).map((v) => v / 7 + 0.5);
      const m = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: s, bits, format: "float", compression: "deflate" }));
      const max = Math.max(...s);
      expect(m.storedAs).toBe("float");
      for (let i = 0; i < s.length; i++) expect(m.pixels[i]).toBeCloseTo(s[i] / max, 6);
    }
  });
  it("float with negative values is rescaled from its minimum, and says so", () => {
    const s = samples(100).map((v) => v - 30);
    const m = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: s, bits: 32, format: "float" }));
    expect(m.storedAs).toBe("float-rescaled");
    expect(Math.min(...m.pixels)).toBe(0);
    expect(Math.max(...m.pixels)).toBe(1);
  });
  it("a 16-bit TIFF and a 16-bit PNG of the same samples decode to the same intensities", () => {
    const s = samples(65535);
    const t = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: s, bits: 16, format: "uint", compression: "deflate" }));
    const p = decodeMicrograph(
      micrographPng(
        s.map((v) => v / 65535),
        W,
        H,
        16,
      ),
    );
    expect(Array.from(t.pixels)).toEqual(Array.from(p.pixels));
  });
  it("WhiteIsZero images are inverted", () => {
    const s = samples(255);
    const m = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: s, bits: 8, format: "uint", photometric: 0 }));
    expect(m.pixels[5]).toBeCloseTo(1 - s[5] / 255, 6);
  });
  it("PackBits encoder round-trips through the TIFF 6.0 §9 decoding rule (checked by hand here)", () => {
    const src = Uint8Array.from([1, 1, 1, 1, 2, 3, 4, 4, 5]);
    const enc = packBits(src);
    const out: number[] = [];
    for (let i = 0; i < enc.length; ) {
      const n = enc[i] > 127 ? enc[i] - 256 : enc[i];
      if (n >= 0) {
        out.push(...enc.subarray(i + 1, i + 2 + n));
        i += n + 2;
      } else {
        for (let k = 0; k < 1 - n; k++) out.push(enc[i + 1]);
        i += 2;
      }
    }
    expect(out).toEqual(Array.from(src));
  });
});

describe("pixel size from the resolution tags", () => {
  it("reads nm per pixel from pixels per centimetre (ResolutionUnit 3)", () => {
    const m = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint", pixelNm: 0.0325 }));
    expect(m.pixelSize.nm).toBeCloseTo(0.0325, 6);
  });
  it("reads pixels per inch (ResolutionUnit 2): 2.54e7 nm per inch", () => {
    const m = decodeTiffMicrograph(
      writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint", resolution: { perUnit: 2.54e7 / 0.05, unit: 2 } }),
    );
    expect(m.pixelSize.nm).toBeCloseTo(0.05, 6);
  });
  it("ignores 72 per inch (a display default) and a unitless resolution, with the reason", () => {
    const a = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint", resolution: { perUnit: 72, unit: 2 } }));
    expect(a.pixelSize.nm).toBeUndefined();
    expect(a.pixelSize.note).toMatch(/not a micrograph scale/);
    const b = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint", resolution: { perUnit: 1e8, unit: 1 } }));
    expect(b.pixelSize.note).toMatch(/no physical unit/);
  });
});

describe("refusals, before any decompression where it matters", () => {
  const refuse = (bytes: Uint8Array, pattern: RegExp, max?: number) => {
    try {
      decodeTiffMicrograph(bytes, max);
    } catch (e) {
      expect(e).toBeInstanceOf(MicrographFormatError);
      expect(`${(e as MicrographFormatError).what}: ${(e as MicrographFormatError).found}`).toMatch(pattern);
      return;
    }
    throw new Error("not refused");
  };
  it("refuses a declared pixel count above max_image_pixels from the header alone", () => {
    // 100 × 100 declared, limit 5000: refused though the strips are tiny.
    refuse(
      writeTiff({ width: 100, height: 100, samples: new Array(10000).fill(0), bits: 8, format: "uint", compression: "deflate" }),
      /too large: 100 × 100 = 10,000/,
      5000,
    );
  });
  it("refuses colour, and damaged data", () => {
    refuse(writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint", photometric: 2 }), /RGB colour TIFF/);
    const ok = writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint" });
    refuse(ok.subarray(0, 40), /damaged|without an image/);
  });
  it("a PNG decoder call on TIFF bytes still names the format", () => {
    const bytes = writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint" });
    expect(() => decodeMicrograph(bytes)).toThrow(/TIFF data/);
  });
});

describe("hostile TIFF structure (review findings)", () => {
  /** The IFD entry (offset of its value field) of a tag, in a little-endian file written by writeTiff. */
  const valueAt = (b: Buffer, tagNo: number) => {
    const ifd = b.readUInt32LE(4);
    for (let k = 0; k < b.readUInt16LE(ifd); k++) if (b.readUInt16LE(ifd + 2 + 12 * k) === tagNo) return ifd + 2 + 12 * k + 8;
    throw new Error(`no tag ${tagNo}`);
  };
  it("an image-directory chain that loops back on itself is a located 'damaged' error, not a hang", () => {
    const b = writeTiff({ width: W, height: H, samples: samples(255), bits: 8, format: "uint" });
    const ifd = b.readUInt32LE(4);
    b.writeUInt32LE(ifd, ifd + 2 + 12 * b.readUInt16LE(ifd)); // next directory = this one
    expect(() => decodeTiffMicrograph(b)).toThrow(/loop back to offset/);
  });
  it("a Deflate strip that inflates beyond its rows (a decompression bomb) is refused without inflating it", async () => {
    const { deflateSync } = await import("node:zlib");
    const b = writeTiff({ width: 16, height: 16, samples: new Array(256).fill(1), bits: 8, format: "uint", compression: "deflate", rowsPerStrip: 16 });
    const bomb = deflateSync(Buffer.alloc(64 * 1024 * 1024)); // 64 MiB of zeros, ~65 kB compressed
    const file = Buffer.concat([b, bomb]);
    file.writeUInt32LE(b.length, valueAt(file, 273));
    file.writeUInt32LE(bomb.length, valueAt(file, 279));
    const before = process.memoryUsage().rss;
    expect(() => decodeTiffMicrograph(file)).toThrow(/inflates to more than the 256 bytes/);
    expect(process.memoryUsage().rss - before).toBeLessThan(32 * 1024 * 1024);
  });
  it("a tile larger than its image (a decompression bomb within 'its tile's size') is refused before decompressing", async () => {
    const { deflateSync } = await import("node:zlib");
    // 64 × 64 pixels in 16 × 16 tiles, then the tile size set to 2048 × 2048 and the first tile pointed at 4 MiB of deflated zeros.
    const b = writeTiff({ width: 64, height: 64, samples: new Array(64 * 64).fill(1), bits: 8, format: "uint", compression: "deflate", tile: 16 });
    const zeros = deflateSync(Buffer.alloc(2048 * 2048));
    const file = Buffer.concat([b, zeros]);
    file.writeUInt32LE(2048, valueAt(file, 322));
    file.writeUInt32LE(2048, valueAt(file, 323));
    const offsets = file.readUInt32LE(valueAt(file, 324));
    const counts = file.readUInt32LE(valueAt(file, 325));
    file.writeUInt32LE(b.length, offsets);
    file.writeUInt32LE(zeros.length, counts);
    expect(() => decodeTiffMicrograph(file)).toThrow(MicrographFormatError);
    expect(() => decodeTiffMicrograph(file)).toThrow(/tiles of 2048 × 2048 pixels for an image of 64 × 64: .*refused before decompressing/);
    // A tile within the padded sides but larger than max_image_pixels: 4096 × 16 pixels in tiles of 4096 × 256, limit 65 536 pixels.
    const wide = writeTiff({ width: 4096, height: 16, samples: new Array(4096 * 16).fill(1), bits: 8, format: "uint", compression: "deflate", tile: 16 });
    wide.writeUInt32LE(4096, valueAt(wide, 322));
    wide.writeUInt32LE(256, valueAt(wide, 323));
    expect(() => decodeTiffMicrograph(wide, 65_536)).toThrow(/tiles of 4096 × 256 pixels .* 65536 pixels \(max_image_pixels\)/);
    // The control: a small image in one 256 × 256 tile, as writers commonly tile, is read.
    const small = writeTiff({ width: 40, height: 24, samples: new Array(40 * 24).fill(9), bits: 8, format: "uint", compression: "deflate", tile: 256 });
    expect(decodeTiffMicrograph(small).width).toBe(40);
  });
  it("a Deflate strip that inflates to too few bytes is refused (it would be read as zeros)", async () => {
    const { deflateSync } = await import("node:zlib");
    const b = writeTiff({ width: 16, height: 16, samples: new Array(256).fill(1), bits: 8, format: "uint", compression: "deflate", rowsPerStrip: 16 });
    const short = deflateSync(Buffer.alloc(100, 7));
    const file = Buffer.concat([b, short]);
    file.writeUInt32LE(b.length, valueAt(file, 273));
    file.writeUInt32LE(short.length, valueAt(file, 279));
    expect(() => decodeTiffMicrograph(file)).toThrow(/inflates to 100 bytes, not the 256|damaged/);
    try {
      decodeTiffMicrograph(file);
    } catch (e) {
      expect((e as Error).message).toMatch(/inflates to 100 bytes/);
    }
  });
});

// LZW (TIFF 6.0 §13) and every block's size (src/read/tiffBlocks.ts). The encoder (src/synth/tiffFile.ts lzwEncode)
// is checked against utif2's own LZW decoder, a maintained implementation sharing no code with either; the
// hostile streams are written by hand, bit by bit, from §13.
describe("LZW strips and tiles, and the size of every block", () => {
  /** Codes of the given widths, most significant bit first (TIFF 6.0 §13). */
  const codes = (list: [code: number, width: number][]) => {
    let bits = "";
    for (const [c, w] of list) bits += c.toString(2).padStart(w, "0");
    bits = bits.padEnd(Math.ceil(bits.length / 8) * 8, "0");
    return Buffer.from(Array.from({ length: bits.length / 8 }, (_, k) => parseInt(bits.slice(8 * k, 8 * k + 8), 2)));
  };
  /** A 16 × 16 8-bit TIFF of one strip whose data are `strip`, with the given compression tag. */
  const withStrip = (strip: Uint8Array, compression: "lzw" | "packbits" | "none") => {
    const b = writeTiff({ width: 16, height: 16, samples: new Array(256).fill(1), bits: 8, format: "uint", compression, rowsPerStrip: 16 });
    const file = Buffer.concat([b, strip]);
    const ifd = file.readUInt32LE(4);
    for (let k = 0; k < file.readUInt16LE(ifd); k++) {
      const at = ifd + 2 + 12 * k;
      if (file.readUInt16LE(at) === 273) file.writeUInt32LE(b.length, at + 8);
      if (file.readUInt16LE(at) === 279) file.writeUInt32LE(strip.length, at + 8);
    }
    return file;
  };
  /** A seeded byte generator (xorshift32, common practice). */
  const bytesFrom = (seed: number, n: number) => {
    let x = seed >>> 0 || 1;
    return Buffer.from(
      Array.from({ length: n }, () => {
        // Marsaglia's xorshift32 (J. Stat. Softw. 8 (2003) 14), shifts 13, 17, 5
        x ^= x << 13;
        x ^= x >>> 17;
        x ^= x << 5;
        return x & 0xff;
      }),
    );
  };

  it("the synthetic encoder writes what utif2's decoder reads (width growth to 12 bits and table resets included)", () => {
    const src = bytesFrom(7, 40_000).map((v, i) => (i % 3 ? v & 0x0f : v));
    const enc = lzwEncode(src);
    const out = new Uint8Array(src.length);
    // utif2's internal LZW decoder (the one UTIF.decodeImage calls for compression 5, with its arguments).
    (UTIF.decode as unknown as { _decodeLZW: (d: Uint8Array, off: number, len: number, tgt: Uint8Array, toff: number, bits: number) => void })._decodeLZW(
      enc,
      0,
      enc.length,
      out,
      0,
      8,
    );
    expect(Buffer.from(out).equals(src)).toBe(true);
  });
  it("an LZW image of 200 × 150 pixels (12-bit codes, table resets), with and without the predictor, decodes to its samples", () => {
    const w = 200;
    const h = 150;
    const s = Array.from({ length: w * h }, (_, i) => ((i % w) * 3 + Math.floor(i / w) * 5 + ((i * 2654435761) >>> 28)) % 256);
    for (const predictor of [1, 2] as const) {
      const m = decodeTiffMicrograph(writeTiff({ width: w, height: h, samples: s, bits: 8, format: "uint", compression: "lzw", predictor, rowsPerStrip: 64 }));
      expect(Array.from(m.pixels, (p) => Math.round(p * 255))).toEqual(s);
    }
    const s16 = s.map((v) => v * 257);
    const m16 = decodeTiffMicrograph(
      writeTiff({ width: w, height: h, samples: s16, bits: 16, format: "uint", compression: "lzw", predictor: 2, littleEndian: false }),
    );
    expect(Array.from(m16.pixels, (p) => Math.round(p * 65535))).toEqual(s16);
  });
  it("tiled images (edge tiles padded) decode to their samples, for every compression", () => {
    for (const compression of ["none", "packbits", "deflate", "lzw"] as const) {
      const s = samples(65535);
      const m = decodeTiffMicrograph(writeTiff({ width: W, height: H, samples: s, bits: 16, format: "uint", compression, tile: 16 }));
      for (let i = 0; i < s.length; i++) expect(m.pixels[i], `${compression} pixel ${i}`).toBeCloseTo(s[i] / 65535, 6);
    }
  });

  const refuse = (file: Buffer, why: RegExp) => {
    let err: unknown;
    try {
      decodeTiffMicrograph(file);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(MicrographFormatError);
    expect((err as Error).message).toMatch(/damaged TIFF/);
    expect((err as Error).message).toMatch(why);
  };
  it("a strip of random bytes is refused, never decoded into garbage (many seeds, with and without a clear code first)", () => {
    for (let seed = 1; seed <= 200; seed++) {
      const random = bytesFrom(seed, 120);
      refuse(withStrip(random, "lzw"), /strip 1: /);
      // Even after a proper clear code and a literal, random codes are refused.
      refuse(
        withStrip(
          Buffer.concat([
            codes([
              [256, 9],
              [65, 9],
            ]),
            random,
          ]),
          "lzw",
        ),
        /strip 1: /,
      );
    }
  });
  it("each broken stream says what was found and at which byte", () => {
    refuse(
      withStrip(
        codes([
          [65, 9],
          [257, 9],
        ]),
        "lzw",
      ),
      /strip 1: the first code is 65, not the clear code 256 .* at byte 1 of its 3/,
    );
    refuse(
      withStrip(
        codes([
          [256, 9],
          [300, 9],
        ]),
        "lzw",
      ),
      /the code 300 follows a clear code, where only a literal byte may/,
    );
    refuse(
      withStrip(
        codes([
          [256, 9],
          [65, 9],
          [300, 9],
        ]),
        "lzw",
      ),
      /the code 300 is beyond the 258 entries of the table built so far/,
    );
    refuse(
      withStrip(
        codes([
          [256, 9],
          [65, 9],
          [66, 9],
          [257, 9],
        ]),
        "lzw",
      ),
      /the end code comes after 2 of the 256 bytes/,
    );
    refuse(
      withStrip(
        codes([
          [256, 9],
          [65, 9],
          [66, 9],
        ]),
        "lzw",
      ),
      /the stream ends without its end code after 2 of 256 bytes/,
    );
    // More than the strip holds (a bomb, or another image's data): stopped at the strip's size.
    refuse(withStrip(lzwEncode(new Uint8Array(100_000)), "lzw"), /decode to more than the 256 bytes the block holds/);
    // The old (pre-6.0) variant, least significant bit first: its first code does not read as the clear code.
    const msb = lzwEncode(new Uint8Array(256).fill(9));
    refuse(
      withStrip(
        msb.map((b) => parseInt(b.toString(2).padStart(8, "0").split("").reverse().join(""), 2)),
        "lzw",
      ),
      /the first code is \d+, not the clear code/,
    );
    // The same strip in order decodes.
    expect(decodeTiffMicrograph(withStrip(msb, "lzw")).pixels[0]).toBeCloseTo(9 / 255, 6);
  });
  it("uncompressed and PackBits strips of the wrong size are refused, not read as zeros", () => {
    refuse(withStrip(new Uint8Array(200), "none"), /strip 1 holds 200 bytes, not the 256 its pixels need/);
    refuse(withStrip(packBits(new Uint8Array(200).fill(3)), "packbits"), /strip 1 unpacks to 200 bytes, not the 256/);
    refuse(
      withStrip(packBits(new Uint8Array(300).fill(3)), "packbits"),
      /strip 1: a PackBits repeat of \d+ bytes at byte \d+ runs past the 256 bytes the block holds/,
    );
  });
});
