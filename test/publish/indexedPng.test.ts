/**
 * The indexed-colour PNG writer checked through an independent decoder (pngjs, which verifies every
 * chunk's CRC): the decoded RGBA pixels are the palette colours of the indices, entries named in tRNS
 * are transparent, and bad input is refused.
 */
import { PNG } from "pngjs";
import { describe, expect, it } from "vitest";
import { encodeIndexedPng } from "../../src/publish/indexedPng.ts";

describe("encodeIndexedPng", () => {
  const palette = Uint8Array.from([0, 0, 0, 255, 0, 0, 0, 255, 0, 10, 20, 30]);
  const w = 7;
  const h = 5;
  const indices = Uint8Array.from({ length: w * h }, (_, i) => (i * 3 + Math.floor(i / w)) % 4);

  it("decodes to the palette colours of the indices, opaque without alpha", () => {
    const png = PNG.sync.read(encodeIndexedPng(indices, w, h, palette));
    expect([png.width, png.height]).toEqual([w, h]);
    for (let i = 0; i < w * h; i++) {
      const k = indices[i];
      expect(Array.from(png.data.subarray(4 * i, 4 * i + 4))).toEqual([palette[3 * k], palette[3 * k + 1], palette[3 * k + 2], 255]);
    }
  });

  it("entry 0 transparent through tRNS, the others opaque", () => {
    const png = PNG.sync.read(encodeIndexedPng(indices, w, h, palette, Uint8Array.from([0, 255, 255, 255])));
    for (let i = 0; i < w * h; i++) expect(png.data[4 * i + 3]).toBe(indices[i] === 0 ? 0 : 255);
  });

  it("refuses a size mismatch, an index outside the palette and a ragged palette", () => {
    expect(() => encodeIndexedPng(indices, w + 1, h, palette)).toThrow(RangeError);
    expect(() => encodeIndexedPng(Uint8Array.from([4]), 1, 1, palette)).toThrow(RangeError);
    expect(() => encodeIndexedPng(Uint8Array.from([0]), 1, 1, Uint8Array.from([1, 2]))).toThrow(RangeError);
  });

  it("refuses a width or height of 0 (the PNG specification allows 1 to 2^31 − 1), naming the size found", () => {
    const empty = new Uint8Array(0);
    expect(() => encodeIndexedPng(empty, 0, 8, palette)).toThrow(/width must be a whole number from 1 to 2\^31 − 1.*found 0/);
    expect(() => encodeIndexedPng(empty, 5, 0, palette)).toThrow(/height must be .*found 0/);
    expect(() => encodeIndexedPng(empty, 0, 0, palette)).toThrow(RangeError);
  });
});
