/**
 * Page pictures are encoded with one PNG filter (Paeth, PAGE_PNG in greyPng.ts) instead of pngjs' per-row
 * adaptive choice: the pixels must be exactly those of the default encoding (PNG is lossless whatever the
 * filter: ISO/IEC 15948 §9), the file must say filter method 0 with type 4 on every row, and a smooth picture
 * must not grow by more than a few percent (common practice: Paeth is the usual choice for continuous-tone
 * images). Data files (the demo's synthetic micrographs) keep the default encoding, byte for byte.
 * Strain maps are palette pictures (indexedPng.ts): one byte per pixel, filter None on every row.
 */
import { inflateSync } from "node:zlib";
import { PNG } from "pngjs";
import { describe, expect, it } from "vitest";
import { encodeGreyPng, PAGE_PNG } from "../../src/publish/greyPng.ts";
import { renderStrainMap } from "../../src/publish/strainMapImage.ts";

/** The filter type byte of every row of an 8-bit PNG with `bpp` bytes per pixel (IDAT chunks concatenated and inflated). */
function rowFilters(file: Buffer, width: number, height: number, bpp: number): number[] {
  const parts: Buffer[] = [];
  for (let at = 8; at < file.length; ) {
    const len = file.readUInt32BE(at);
    if (file.toString("latin1", at + 4, at + 8) === "IDAT") parts.push(file.subarray(at + 8, at + 8 + len));
    at += 12 + len;
  }
  const raw = inflateSync(Buffer.concat(parts));
  return Array.from({ length: height }, (_, y) => raw[y * (1 + width * bpp)]);
}

describe("page PNGs: one filter, same pixels", () => {
  const w = 64;
  const h = 48;
  // A smooth field with a little deterministic texture, like a strain map or a micrograph.
  const smooth = Array.from({ length: w * h }, (_, i) => Math.round(127 + 100 * Math.sin((i % w) / 9) * Math.cos(Math.floor(i / w) / 7) + ((i * 7919) % 5)));

  it("greyscale: pixels identical to the default encoding, Paeth on every row, size within 5 %", () => {
    const fast = encodeGreyPng(smooth, w, h, 8, PAGE_PNG);
    const plain = encodeGreyPng(smooth, w, h);
    expect(PNG.sync.read(fast).data.equals(PNG.sync.read(plain).data)).toBe(true);
    expect(rowFilters(fast, w, h, 1)).toEqual(new Array(h).fill(4));
    expect(fast.length).toBeLessThan(1.05 * plain.length);
  });

  it("strain maps are indexed-colour PNGs (colour type 3, 8 bits) with filter None on every row", () => {
    const pic = renderStrainMap(
      smooth.map((v) => (v - 127) * 1e-5),
      w,
      h,
    );
    expect([pic.png[24], pic.png[25]]).toEqual([8, 3]); // IHDR bit depth, colour type (ISO/IEC 15948 §11.2.2)
    expect(rowFilters(pic.png, pic.width, pic.height, 1)).toEqual(new Array(pic.height).fill(0));
  });

  it("the default (data files) is unchanged: adaptive filters, not Paeth only", () => {
    const filters = new Set(rowFilters(encodeGreyPng(smooth, w, h), w, h, 1));
    expect(filters.size).toBeGreaterThan(1);
  });
});
