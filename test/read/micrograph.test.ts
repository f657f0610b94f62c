/**
 * decodeMicrograph (src/read/micrograph.ts): greyscale PNG decoding and the
 * format errors for files that are not one.
 */
import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { encodeGreyPng } from "../../src/publish/greyPng.ts";
import { decodeMicrograph, MicrographFormatError } from "../../src/read/micrograph.ts";

function greyLevels(width: number, height: number, value: (x: number, y: number) => number): number[] {
  return Array.from({ length: width * height }, (_, i) => value(i % width, Math.floor(i / width)));
}

const greyPng8 = (width: number, height: number, value: (x: number, y: number) => number) => encodeGreyPng(greyLevels(width, height, value), width, height, 8);
const greyPng16 = (width: number, height: number, value: (x: number, y: number) => number) =>
  encodeGreyPng(greyLevels(width, height, value), width, height, 16);

function catchFormat(f: () => unknown): MicrographFormatError {
  try {
    f();
  } catch (e) {
    if (e instanceof MicrographFormatError) return e;
    throw e;
  }
  throw new Error("no MicrographFormatError thrown");
}

describe("decodeMicrograph", () => {
  it("reads an 8-bit greyscale PNG normalised to 0…1", () => {
    const m = decodeMicrograph(greyPng8(5, 3, (x, y) => 10 * x + 50 * y));
    expect([m.width, m.height, m.bitDepth, m.storedAs]).toEqual([5, 3, 8, "grey"]);
    expect(m.pixels[2 * 5 + 4]).toBeCloseTo(140 / 255, 6);
  });
  it("reads a 16-bit greyscale PNG at full precision", () => {
    const m = decodeMicrograph(greyPng16(4, 4, (x, y) => 1000 * x + 7 * y + 40000));
    expect(m.bitDepth).toBe(16);
    expect(m.pixels[3 * 4 + 3] * 65535).toBeCloseTo(43021, 1);
    expect(m.pixels[1] * 65535).toBeCloseTo(41000, 1); // distinct from neighbours after 8-bit rescaling would merge them
  });
  it("accepts an RGBA image whose channels are equal", () => {
    const png = new PNG({ width: 2, height: 2 });
    png.data.fill(77);
    const m = decodeMicrograph(PNG.sync.write(png));
    expect(m.storedAs).toBe("rgb-equal");
    expect(m.pixels[3]).toBeCloseTo(77 / 255, 6);
  });
  it("rejects JPEG-like bytes, naming what was found", () => {
    const e = catchFormat(() => decodeMicrograph(Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46, 0x49, 0x46])));
    expect(e.found).toMatch(/JPEG/);
    expect(e.expected).toMatch(/greyscale PNG|greyscale image: PNG|PNG image, 8- or 16-bit greyscale/);
    expect(e.fix).toMatch(/greyscale PNG/);
    expect(e.message).toMatch(/expected .*found JPEG/);
  });
  it("rejects a colour PNG, text, an empty file and a truncated PNG", () => {
    const png = new PNG({ width: 3, height: 2 });
    png.data.fill(200);
    png.data[4] = 10; // pixel (1, 0) red differs
    const e = catchFormat(() => decodeMicrograph(PNG.sync.write(png, { colorType: 2 })));
    expect(e.found).toMatch(/colour image \(pixel \(1, 0\)/);
    expect(catchFormat(() => decodeMicrograph(Buffer.from("x,y\n1,2\n"))).found).toMatch(/text/);
    expect(catchFormat(() => decodeMicrograph(new Uint8Array(0))).found).toMatch(/empty/);
    const good = greyPng8(8, 8, () => 3);
    expect(catchFormat(() => decodeMicrograph(good.subarray(0, 40))).found).toMatch(/damaged PNG/);
  });
});
