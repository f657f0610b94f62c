import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { decodeMicrograph } from "../../src/read/micrograph.ts";
import { divergingColour, renderMicrograph, renderStrainMap } from "../../src/publish/strainMapImage.ts";

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
    // The left edge is −0.01 = −limit: ColorBrewer RdBu's dark blue #053061; the right edge +0.0099 ≈ its dark red #67001f
    // (Harrower & Brewer 2003, 11-class table; within 2 levels of the package's spline and 6 of the ±1 % step at the edge).
    const px = (x: number) => Array.from(back.data.subarray(4 * (10 * W + x), 4 * (10 * W + x) + 3));
    px(0).forEach((v, k) => expect(Math.abs(v - [0x05, 0x30, 0x61][k])).toBeLessThanOrEqual(2));
    px(W - 1).forEach((v, k) => expect(Math.abs(v - [0x67, 0x00, 0x1f][k])).toBeLessThanOrEqual(6));
  });
  it("a map without pixels has no picture: refused, not drawn as a colour bar alone", () => {
    expect(() => renderStrainMap(new Float32Array(0), 0, 0)).toThrow(/no pixels \(0 × 0\)/);
    expect(() => renderStrainMap(new Float32Array(0), 0, 5, { maxSide: 64 })).toThrow(RangeError);
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
