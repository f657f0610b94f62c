// Colour scales of the maps: values checked against the published colour tables, not against the code's own output.
import { describe, expect, it } from "vitest";
import { DIVERGING_LUT, SEQUENTIAL_LUT, divergingRgb, gradientStops, sequentialRgb, textOn } from "../../src/publish/colourScales.ts";

const close = (a: number[], b: number[], tol: number) => a.forEach((v, i) => expect(Math.abs(v - b[i])).toBeLessThanOrEqual(tol));

describe("sequential scale (viridis)", () => {
  it("matches the published viridis end points and middle", () => {
    // matplotlib's _viridis_data (van der Walt & Smith 2015), entries 0, 128 and 255, × 255 (from memory):
    // (0.267004, 0.004874, 0.329415), (0.127568, 0.566949, 0.550556), (0.993248, 0.906157, 0.143936).
    close(sequentialRgb(0), [68, 1, 84], 1);
    close(sequentialRgb(128 / 255), [33, 145, 140], 2);
    close(sequentialRgb(1), [253, 231, 37], 1);
  });
  it("clamps, greys out non-finite values and has 256 entries", () => {
    expect(sequentialRgb(-3)).toEqual(sequentialRgb(0));
    expect(sequentialRgb(7)).toEqual(sequentialRgb(1));
    expect(sequentialRgb(Number.NaN)).toEqual([128, 128, 128]);
    expect(SEQUENTIAL_LUT.length).toBe(3 * 256);
  });
});

describe("diverging scale (ColorBrewer RdBu, reversed)", () => {
  it("runs from the scheme's dark blue (−1) to its dark red (+1) through a near-white centre", () => {
    // ColorBrewer RdBu, 11 classes: #67001f … #f7f7f7 … #053061 (Harrower & Brewer 2003; confirmed in the scheme's table).
    close(divergingRgb(-1), [0x05, 0x30, 0x61], 2);
    close(divergingRgb(1), [0x67, 0x00, 0x1f], 2);
    // d3 draws the scheme as a uniform B-spline, so the centre is (p4 + 4·p5 + p6)/6 of the 11 colours
    // #fddbc7, #f7f7f7, #d1e5f0 (derived): about (242, 239, 238).
    close(divergingRgb(0), [242, 239, 238], 3);
    expect(DIVERGING_LUT.length).toBe(3 * 256);
  });
  it("is lighter at zero than at ±½ on both sides, and clamps", () => {
    const sum = (c: number[]) => c[0] + c[1] + c[2];
    expect(sum(divergingRgb(0))).toBeGreaterThan(sum(divergingRgb(0.5)));
    expect(sum(divergingRgb(0))).toBeGreaterThan(sum(divergingRgb(-0.5)));
    expect(divergingRgb(-5)).toEqual(divergingRgb(-1));
    expect(divergingRgb(Number.POSITIVE_INFINITY)).toEqual([128, 128, 128]);
  });
});

describe("helpers", () => {
  it("text on a fill: dark on yellow, white on dark violet (WCAG contrast)", () => {
    expect(textOn([253, 231, 37])).toBe("#111111");
    expect(textOn([68, 1, 84])).toBe("#ffffff");
  });
  it("gradient stops run from offset 0 to 1", () => {
    const s = gradientStops(sequentialRgb, 0, 1, 4);
    expect(s.match(/<stop /g)?.length).toBe(5);
    expect(s.startsWith('<stop offset="0" stop-color="#440154"/>')).toBe(true);
    expect(s.endsWith('<stop offset="1" stop-color="#fde725"/>')).toBe(true);
  });
});
