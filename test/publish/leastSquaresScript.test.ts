/**
 * The relation page's least-squares line and Pearson r (templates/assets/
 * leastSquares.js), run as the browser runs it (the script file in a bare
 * context), against published values.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import vm from "node:vm";
import { describe, expect, it } from "vitest";

type Fit = { n: number; slope: number; intercept: number; r: number; rLow: number | null; rHigh: number | null; logX: boolean; logY: boolean } | null;
type Space = { logX?: boolean; logY?: boolean };
type LeastSquares = ((p: [number, number][], space?: Space) => Fit) & { predict(f: NonNullable<Fit>, x: number): number };
const context: { window: { waferbookLeastSquares?: LeastSquares } } = { window: {} };
vm.runInNewContext(readFileSync(path.resolve(import.meta.dirname, "../../templates/assets/leastSquares.js"), "utf8"), context);
const leastSquares = context.window.waferbookLeastSquares!;

describe("least squares and r on the relation page", () => {
  it("reproduces Anscombe's data set I", () => {
    // F. J. Anscombe, "Graphs in statistical analysis", The American Statistician 27 (1973) 17–21:
    // data set I gives y = 3.00 + 0.500·x and r = 0.816, n = 11 (values as published; from memory).
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const f = leastSquares(x.map((v, i) => [v, y[i]]))!;
    expect(f.n).toBe(11);
    expect(f.slope).toBeCloseTo(0.5, 3);
    expect(f.intercept).toBeCloseTo(3.0, 2);
    expect(f.r).toBeCloseTo(0.816, 3);
    // Fisher-z 95 % interval, worked by hand: z = atanh(0.81642) = 1.14635, ±1.959964/√8 → tanh → 0.4244 … 0.9507.
    expect(f.rLow).toBeCloseTo(0.4244, 3);
    expect(f.rHigh).toBeCloseTo(0.9507, 3);
  });

  it("keeps its digits with large offsets (temperatures near 900 K, densities near 10¹¹)", () => {
    // Derived: an exact line y = 1e11 + 2e8·(x − 900) gives slope 2e8 and r = 1 whatever the offset;
    // a perfectly anti-correlated set gives r = −1.
    const pts: [number, number][] = [898, 899, 900, 901, 902].map((t) => [t, 1e11 + 2e8 * (t - 900)]);
    const f = leastSquares(pts)!;
    expect(f.slope / 2e8).toBeCloseTo(1, 9);
    expect(f.r).toBeCloseTo(1, 12);
    expect(
      leastSquares([
        [1, 3],
        [2, 2],
        [3, 1],
      ])!.r,
    ).toBeCloseTo(-1, 12);
  });

  it("fits on log axes in log space: Anscombe's set I raised to powers of ten gives the same line, r and Fisher-z interval", () => {
    // Derived: log10(10^v) = v, so fitting (10^x, 10^y) on log–log axes must reproduce the linear fit of (x, y)
    // above (Anscombe 1973; interval worked by hand as above) — the r and its interval are of the logarithms.
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5].map((v) => v / 10);
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const f = leastSquares(
      x.map((v, i) => [10 ** v, 10 ** y[i]]),
      { logX: true, logY: true },
    )!;
    expect(f.slope).toBeCloseTo(5.0, 2); // 0.5 per unit of x, x scaled by 1/10
    expect(f.intercept).toBeCloseTo(3.0, 2);
    expect(f.r).toBeCloseTo(0.816, 3);
    expect(f.rLow).toBeCloseTo(0.4244, 3);
    expect(f.rHigh).toBeCloseTo(0.9507, 3);
    // The same points on linear axes give a different r: the space matters.
    expect(Math.abs(leastSquares(x.map((v, i) => [10 ** v, 10 ** y[i]]))!.r - f.r)).toBeGreaterThan(0.05);
  });

  it("recovers an exact power law and an exponential, and predicts in the plotted units", () => {
    // Derived: y = 3·x^1.5 is log10 y = log10 3 + 1.5·log10 x; y = 2·10^(0.3x) is log10 y = log10 2 + 0.3·x.
    const power = leastSquares(
      [1, 2, 4, 8, 16].map((x) => [x, 3 * x ** 1.5]),
      { logX: true, logY: true },
    )!;
    expect(power.slope).toBeCloseTo(1.5, 12);
    expect(power.intercept).toBeCloseTo(Math.log10(3), 12);
    expect(power.r).toBeCloseTo(1, 12);
    expect(leastSquares.predict(power, 9) / (3 * 27)).toBeCloseTo(1, 12);
    const expo = leastSquares(
      [0, 1, 2, 3].map((x) => [x, 2 * 10 ** (0.3 * x)]),
      { logY: true },
    )!;
    expect(expo.slope).toBeCloseTo(0.3, 12);
    expect(leastSquares.predict(expo, 5) / (2 * 10 ** 1.5)).toBeCloseTo(1, 12);
    const semi = leastSquares(
      [1, 10, 100, 1000].map((x) => [x, 4 + 2 * Math.log10(x)]),
      { logX: true },
    )!;
    expect([semi.slope, semi.intercept]).toEqual([expect.closeTo(2, 12), expect.closeTo(4, 12)]);
  });

  it("gives no line on a log axis holding a value that is not positive", () => {
    expect(
      leastSquares(
        [
          [1, 2],
          [2, 0],
          [3, 5],
        ],
        { logY: true },
      ),
    ).toBeNull();
    expect(
      leastSquares(
        [
          [-1, 2],
          [2, 3],
          [3, 5],
        ],
        { logX: true },
      ),
    ).toBeNull();
    expect(
      leastSquares(
        [
          [-1, 2],
          [2, 3],
          [3, 5],
        ],
        { logY: true },
      ),
    ).not.toBeNull();
  });

  it("gives no line for fewer than 3 points or values that do not vary", () => {
    expect(
      leastSquares([
        [1, 2],
        [2, 3],
      ]),
    ).toBeNull();
    expect(
      leastSquares([
        [1, 2],
        [1, 3],
        [1, 4],
      ]),
    ).toBeNull();
    expect(
      leastSquares([
        [1, 2],
        [2, 2],
        [3, 2],
      ]),
    ).toBeNull();
  });
});
