import { describe, expect, it } from "vitest";
import { bracket, interpolateLinear } from "../../../src/analyse/numeric/interpolate.ts";

describe("bracket and interpolateLinear", () => {
  const x = [0, 1, 2, 4, 8];
  it("bracket returns the interval that holds the point", () => {
    // [D] derived from the definition: x[lo] ≤ at ≤ x[lo + 1], lo in 0 … n − 2
    expect([0, 0.5, 1, 3, 4, 7.9, 8].map((a) => bracket(x, a))).toEqual([0, 0, 1, 2, 3, 3, 3]);
    expect(bracket([5], 5)).toBe(0);
    expect(bracket([], 1)).toBe(0);
    expect(bracket([1, 2], 1.5)).toBe(0);
  });
  it("interpolates linearly inside the grid and gives NaN outside or on empty input", () => {
    // [D] derived from the two-point line through (2, 4) and (4, 16): y(3) = 10
    expect(interpolateLinear(x, [0, 1, 4, 16, 64], 3)).toBe(10);
    expect(interpolateLinear(x, [0, 1, 4, 16, 64], 8)).toBe(64);
    expect(interpolateLinear([0, 1], [0, 2], 0.5)).toBe(1);
    expect(interpolateLinear([3], [7], 3)).toBe(7);
    expect(interpolateLinear(x, [0, 1, 4, 16, 64], -0.1)).toBeNaN();
    expect(interpolateLinear(x, [0, 1, 4, 16, 64], 8.1)).toBeNaN();
    expect(interpolateLinear([], [], 0)).toBeNaN();
    expect(interpolateLinear(x, [0, 1, 4, 16, 64], Number.NaN)).toBeNaN();
  });
});
