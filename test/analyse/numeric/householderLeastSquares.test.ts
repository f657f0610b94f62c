// Householder QR least squares (src/analyse/numeric/householderLeastSquares.ts).
// Check values: an exact quadratic is recovered (derived: zero residual, so c equals the generating
// coefficients to rounding); Longley-free hand case y = 1 + 2t on t = 0, 1, 2, 3 (from memory: the line
// through exact points); and ml-matrix's own QR solve (an independent implementation of the same JAMA
// steps) gives the same bits on noisy data, which is what keeps the SdH background and the analysis
// digest unchanged.
import { Matrix, solve } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { householderLeastSquares } from "../../../src/analyse/numeric/householderLeastSquares.ts";
import { seededUniform } from "../../../src/synth/random.ts";

function vandermonde(t: number[], k: number): Float64Array {
  const a = new Float64Array(t.length * k);
  for (let i = 0; i < t.length; i++) for (let j = 0; j < k; j++) a[j * t.length + i] = t[i] ** j;
  return a;
}

describe("householderLeastSquares", () => {
  it("fits the line through exact points (y = 1 + 2t)", () => {
    const c = householderLeastSquares(vandermonde([0, 1, 2, 3], 2), 4, 2, [1, 3, 5, 7]);
    expect(c[0]).toBeCloseTo(1, 12);
    expect(c[1]).toBeCloseTo(2, 12);
  });

  it("recovers an exact quadratic on 200 points", () => {
    const t = Array.from({ length: 200 }, (_, i) => -1 + (2 * i) / 199);
    const y = t.map((x) => 0.5 - 3 * x + 7.25 * x * x);
    const c = householderLeastSquares(vandermonde(t, 3), 200, 3, y);
    expect(c[0]).toBeCloseTo(0.5, 12);
    expect(c[1]).toBeCloseTo(-3, 12);
    expect(c[2]).toBeCloseTo(7.25, 12);
  });

  it("gives the same bits as ml-matrix's QR solve on noisy data (1–5 columns, 6–900 rows)", () => {
    const rand = seededUniform(7);
    for (let trial = 0; trial < 200; trial++) {
      const k = 1 + Math.floor(rand() * 5);
      const m = k + 1 + Math.floor(rand() * 900);
      const t = Array.from({ length: m }, () => 2 * rand() - 1);
      const y = t.map((x) => 1e3 * Math.cos(3 * x) + rand());
      const A = new Matrix(m, k);
      t.forEach((x, i) => {
        for (let j = 0; j < k; j++) A.set(i, j, x ** j);
      });
      const ref = solve(A, Matrix.columnVector(y)).to1DArray();
      expect(Array.from(householderLeastSquares(vandermonde(t, k), m, k, y))).toEqual(ref);
    }
  });

  it("throws for a rank-deficient matrix (a zero column) and for sizes that do not agree", () => {
    // An all-zero column gives an exactly zero diagonal of R (a merely collinear one may not, in floating point: as in ml-matrix).
    const zeroColumn = new Float64Array([1, 2, 3, 0, 0, 0]);
    expect(() => householderLeastSquares(zeroColumn, 3, 2, [1, 2, 3])).toThrow(/rank deficient/);
    expect(() => householderLeastSquares(new Float64Array(5), 3, 2, [1, 2, 3])).toThrow(RangeError);
  });
});
