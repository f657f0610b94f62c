/**
 * The strain-map picture checked by its structure, not by its own colour
 * function: lightness is computed here from sRGB (IEC 61966-2-1 transfer curve,
 * Rec. 709 luminance weights, CIE 1976 L*; common practice), and the picture's
 * colour bar is compared with the map it labels. Any diverging scale with a
 * light centre passes; exact RGB values are not pinned.
 */
import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { renderStrainMap } from "../../src/publish/strainMapImage.ts";

/** CIE L* (0–100) of an 8-bit sRGB colour. */
function lightness([r, g, b]: number[]): number {
  const lin = (c: number) => (c / 255 <= 0.04045 ? c / 255 / 12.92 : ((c / 255 + 0.055) / 1.055) ** 2.4);
  const y = 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
  return y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (24389 / 27) * y;
}

const W = 121; // W − 1 divisible by 6, so ±limit/2 fall on whole columns
const H = 40;
const LIMIT = 0.01;
// Each column holds one value from −1.5·limit to +1.5·limit; row 0 is NaN.
const value = (x: number) => ((3 * x) / (W - 1) - 1.5) * LIMIT;
const map = Float32Array.from({ length: W * H }, (_, i) => (i < W ? Number.NaN : value(i % W)));
const pic = renderStrainMap(map, W, H, { limit: LIMIT });
const png = PNG.sync.read(pic.png);
const at = (x: number, y: number) => Array.from(png.data.subarray(4 * (y * png.width + x), 4 * (y * png.width + x) + 3));
const barRow = pic.colourBar[0] + 1;

describe("strain map colour scale (structure)", () => {
  it("the colour bar runs from −limit to +limit: its ends are the map's clamped extremes", () => {
    expect(pic.limit).toBe(LIMIT);
    expect(at(0, barRow)).toEqual(at(0, 20)); // map value −1.5·limit clamps to the −limit end
    expect(at(png.width - 1, barRow)).toEqual(at(W - 1, 20));
    expect(at(0, barRow)).not.toEqual(at(png.width - 1, barRow)); // compression and tension differ
  });
  it("the bar's colour at ±limit/2 is the colour the map gives ±limit/2", () => {
    const dist = (a: number[], b: number[]) => Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
    for (const t of [-0.5, 0.5]) {
      const mapX = Math.round(((t + 1.5) / 3) * (W - 1)); // value(mapX) = t·limit
      const barX = Math.round(((t + 1) / 2) * (png.width - 1));
      expect(Math.abs(value(mapX) / LIMIT - t)).toBeLessThan(1e-9);
      expect(dist(at(mapX, 20), at(barX, barRow))).toBeLessThan(8);
    }
  });
  it("lightness falls monotonically from zero strain out to either limit", () => {
    const centre = Math.round((W - 1) / 2); // value 0
    const lStrain = (x: number) => lightness(at(x, 20));
    const l0 = lStrain(centre);
    for (const dir of [-1, 1]) {
      let prev = l0;
      for (let k = 1; centre + dir * k >= 0 && centre + dir * k < W; k++) {
        const l = lStrain(centre + dir * k);
        expect(l).toBeLessThanOrEqual(prev + 0.5);
        prev = l;
      }
      expect(l0 - prev).toBeGreaterThan(30); // the ends are clearly darker than zero
    }
  });
  it("missing values (NaN) are a neutral grey distinct from zero strain and from both ends", () => {
    const nan = at((W - 1) / 2, 0);
    expect(nan[0]).toBe(nan[1]);
    expect(nan[1]).toBe(nan[2]);
    for (const x of [0, (W - 1) / 2, W - 1]) expect(at(x, 20)).not.toEqual(nan);
  });
});

describe("strain map colour levels", () => {
  // A wider map than above, so the zero level spans several bar columns besides the zero tick.
  const w = 401;
  const wide = Float32Array.from({ length: w * H }, (_, i) => ((3 * (i % w)) / (w - 1) - 1.5) * LIMIT);
  const p = renderStrainMap(wide, w, H, { limit: LIMIT });
  const img = PNG.sync.read(p.png);
  const colour = (x: number, y: number) => Array.from(img.data.subarray(4 * (y * w + x), 4 * (y * w + x) + 3)).join(",");
  const zeroTick = Math.round((w - 1) / 2);
  const columns = Array.from({ length: w }, (_, x) => x);
  it("the bar shows a few dozen levels, and every colour of the map is one of the bar's", () => {
    const bar = new Set(columns.filter((x) => x !== zeroTick).map((x) => colour(x, p.colourBar[0] + 1)));
    expect(bar.size).toBeGreaterThanOrEqual(32);
    expect(bar.size).toBeLessThanOrEqual(128);
    for (const x of columns) expect(bar.has(colour(x, 20))).toBe(true);
  });
});
