/**
 * The small dense solvers behind the Shubnikov–de Haas fit:
 * linearLeastSquares (normal equations, Cholesky) and denseLevenbergMarquardt.
 */
import { describe, expect, it } from "vitest";
import { linearLeastSquares } from "../../../src/analyse/numeric/linearLeastSquares.ts";
import { denseLevenbergMarquardt } from "../../../src/analyse/numeric/denseLevenbergMarquardt.ts";

// NIST StRD Misra1a, y = b1·(1 − exp(−b2·x)) (REFERENCES §15; data and certified values [M, reproduced to 9 digits by an independent fit]).
const X = [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0];
const Y = [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.4, 75.47, 81.78];
const misra = {
  n: X.length,
  y: Y,
  value: (p: number[], i: number) => p[0] * (1 - Math.exp(-p[1] * X[i])),
  gradient: (p: number[], i: number, out: Float64Array) => {
    const e = Math.exp(-p[1] * X[i]);
    out[0] = 1 - e;
    out[1] = p[0] * X[i] * e;
  },
};

describe("denseLevenbergMarquardt", () => {
  for (const start of [
    [500, 1e-4],
    [250, 5e-4],
  ]) {
    it(`Misra1a from start (${start.join(", ")}): certified b1, b2 and standard errors (NIST StRD, REFERENCES §15)`, () => {
      const fit = denseLevenbergMarquardt(misra, start, { maxIterations: 200 });
      expect(fit).not.toBeNull();
      expect(Math.abs(fit!.params[0] / 238.94212918 - 1)).toBeLessThan(1e-6);
      expect(Math.abs(fit!.params[1] / 5.5015643181e-4 - 1)).toBeLessThan(1e-6);
      expect(Math.abs(fit!.stdErr[0] / 2.7070075241 - 1)).toBeLessThan(1e-4);
      expect(Math.abs(fit!.stdErr[1] / 7.2668688436e-6 - 1)).toBeLessThan(1e-4);
    });
  }
  it("holds a fixed parameter (standard error 0) and respects bounds", () => {
    const fixed = denseLevenbergMarquardt(misra, [240, 1e-4], { fixed: [0], maxIterations: 200 })!;
    expect(fixed.params[0]).toBe(240);
    expect(fixed.stdErr[0]).toBe(0);
    const bounded = denseLevenbergMarquardt(misra, [240, 1e-4], { max: [Infinity, 4e-4], maxIterations: 200 })!;
    expect(bounded.params[1]).toBeLessThanOrEqual(4e-4);
    expect(() => denseLevenbergMarquardt({ ...misra, n: 1 }, [1, 1])).toThrow(RangeError);
  });
});

describe("linearLeastSquares", () => {
  it("recovers an exact quadratic (derived: y = 1 + 2x + 3x²) and a zero residual", () => {
    const x = Array.from({ length: 9 }, (_, i) => i - 4);
    const cols = [0, 1, 2].map((j) => Float64Array.from(x, (v) => v ** j));
    const s = linearLeastSquares(
      cols,
      x.map((v) => 1 + 2 * v + 3 * v * v),
    )!;
    expect(Array.from(s.coef).map((c) => Number(c.toFixed(10)))).toEqual([1, 2, 3]);
    expect(s.ssRes).toBeLessThan(1e-18);
  });
  it("returns null for collinear columns and throws for a length mismatch", () => {
    const a = Float64Array.from([1, 2, 3]);
    expect(linearLeastSquares([a, a.map((v) => 2 * v)], [1, 2, 3])).toBeNull();
    expect(() => linearLeastSquares([a], [1, 2])).toThrow(RangeError);
  });
});
