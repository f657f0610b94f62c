import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { decodeMicrograph, MicrographFormatError } from "../../src/read/micrograph.ts";
import { divergingColour, renderMicrograph, renderStrainMap } from "../../src/publish/strainMapImage.ts";

function greyPng8(width: number, height: number, value: (x: number, y: number) => number): Buffer {
  const png = new PNG({ width, height });
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = 4 * (y * width + x);
      png.data[i] = png.data[i + 1] = png.data[i + 2] = value(x, y);
      png.data[i + 3] = 255;
    }
  }
  return PNG.sync.write(png, { colorType: 0 });
}

function greyPng16(width: number, height: number, value: (x: number, y: number) => number): Buffer {
  const samples = new Uint16Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) samples[y * width + x] = value(x, y);
  const png = new PNG({ width, height });
  png.data = Buffer.from(samples.buffer);
  return PNG.sync.write(png, { colorType: 0, inputColorType: 0, bitDepth: 16 });
}

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
    expect(e.expected).toMatch(/greyscale PNG|PNG image, 8- or 16-bit greyscale/);
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

describe("renderStrainMap / renderMicrograph", () => {
  const W = 200;
  const H = 120;
  const map = Float32Array.from({ length: W * H }, (_, i) => ((i % W) - W / 2) * 1e-4);
  it("decodes back with the expected size, colour bar and symmetric scale", () => {
    const pic = renderStrainMap(map, W, H, { limit: 0.01 });
    const back = PNG.sync.read(pic.png);
    expect([back.width, back.height]).toEqual([W, H + 2 + pic.colourBar[1] - pic.colourBar[0]]);
    expect([pic.width, pic.height, pic.factor, pic.limit]).toEqual([back.width, back.height, 1, 0.01]);
    // Centre column value 0 → the scale's neutral colour.
    const i = 4 * (10 * W + W / 2);
    expect(Array.from(back.data.subarray(i, i + 3))).toEqual(divergingColour(0));
  });
  it("downsamples the page copy to the requested long side and draws interfaces", () => {
    const pic = renderStrainMap(map, W, H, { maxSide: 64, interfaces: { growthAxis: "up", tilt_deg: 0, positions_px: [0] } });
    const back = PNG.sync.read(pic.png);
    expect(pic.factor).toBe(4);
    expect(back.width).toBe(50);
    expect(Math.max(back.width, pic.colourBar[0] - 2)).toBeLessThanOrEqual(64);
    // The interface at s = 0 is the middle row (y ≈ 59.5 in full pixels → block row 14 or 15).
    const dark = [14, 15].some((r) => back.data[4 * (r * 50 + 5)] === 20);
    expect(dark).toBe(true);
  });
  it("diverging scale is symmetric in lightness order and clamps", () => {
    expect(divergingColour(2)).toEqual(divergingColour(1));
    expect(divergingColour(Number.NaN)).toEqual([128, 128, 128]);
    const sum = (c: number[]) => c[0] + c[1] + c[2];
    expect(sum(divergingColour(0))).toBeGreaterThan(sum(divergingColour(0.5)));
    expect(sum(divergingColour(0))).toBeGreaterThan(sum(divergingColour(-0.5)));
  });
  it("renders a greyscale micrograph that decodes back", () => {
    const pic = renderMicrograph(map, W, H, 100);
    const m = decodeMicrograph(pic.png);
    expect([m.width, m.height, m.bitDepth]).toEqual([100, 60, 8]);
    expect(() => renderStrainMap(new Float32Array(3), 2, 2)).toThrow(RangeError);
  });
});
