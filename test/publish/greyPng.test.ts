/** encodeGreyPng (greyPng.ts): levels survive a decode round trip, 8- and 16-bit; size mismatch throws. */
import { PNG } from "pngjs";
import { describe, expect, it } from "vitest";
import { encodeGreyPng } from "../../src/publish/greyPng.ts";

describe("encodeGreyPng", () => {
  it("8-bit: greyscale colour type, every level read back", () => {
    const levels = Array.from({ length: 7 * 3 }, (_, i) => (i * 37) % 256);
    const png = PNG.sync.read(encodeGreyPng(levels, 7, 3));
    expect([png.width, png.height, png.colorType, png.depth]).toEqual([7, 3, 0, 8]);
    for (let i = 0; i < levels.length; i++) {
      expect([png.data[4 * i], png.data[4 * i + 1], png.data[4 * i + 2], png.data[4 * i + 3]]).toEqual([levels[i], levels[i], levels[i], 255]);
    }
  });
  it("16-bit: levels above 255 kept (read back as 16-bit samples)", () => {
    const levels = [0, 1, 255, 256, 4096, 65535];
    const png = PNG.sync.read(encodeGreyPng(levels, 3, 2, 16), { skipRescale: true });
    expect([png.width, png.height, png.colorType, png.depth]).toEqual([3, 2, 0, 16]);
    // With skipRescale pngjs keeps 16-bit samples as numbers, four per pixel (grey copied to r, g, b), as src/read/micrograph.ts reads them.
    const samples = png.data as unknown as ArrayLike<number>;
    expect(Array.from({ length: 6 }, (_, i) => samples[4 * i])).toEqual(levels);
  });
  it("throws RangeError when the level count is not width × height", () => {
    expect(() => encodeGreyPng([1, 2, 3], 2, 2)).toThrow(RangeError);
    expect(() => encodeGreyPng([], 1, 1, 16)).toThrow(RangeError);
  });
});
