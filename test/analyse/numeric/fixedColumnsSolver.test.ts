/**
 * fixedColumnsSolver (linearLeastSquares.ts) promises the very numbers of
 * linearLeastSquares on the joined columns: the oscillation seed relies on
 * that for an unchanged fit. Checked bit for bit against linearLeastSquares on
 * random data (4 extra columns, its written-out path, and other counts), and
 * on an exact polynomial whose coefficients are known.
 */
import { describe, expect, it } from "vitest";
import { fixedColumnsSolver, linearLeastSquares } from "../../../src/analyse/numeric/linearLeastSquares.ts";

/** Deterministic pseudo-random numbers in (−1, 1) (a linear congruential generator). */
function rand(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return (s / 2 ** 32) * 2 - 1;
  };
}

function columns(count: number, n: number, r: () => number): Float64Array[] {
  return Array.from({ length: count }, () => Float64Array.from({ length: n }, r));
}

describe("fixedColumnsSolver", () => {
  for (const [mf, me, n] of [
    [3, 4, 97],
    [1, 4, 40],
    [5, 4, 200],
    [0, 4, 30],
    [2, 2, 50],
    [3, 1, 25],
    [4, 0, 25],
  ]) {
    it(`${mf} fixed + ${me} extra columns, ${n} points: the same bits as linearLeastSquares, for several extra sets`, () => {
      const r = rand(7 * mf + 13 * me + n);
      const fixed = columns(mf, n, r);
      const y = Float64Array.from({ length: n }, r);
      const solve = fixedColumnsSolver(fixed, y);
      for (let trial = 0; trial < 3; trial++) {
        const extra = columns(me, n, r);
        const got = solve(extra)!;
        const want = linearLeastSquares([...fixed, ...extra], y)!;
        expect(got).not.toBeNull();
        expect(Array.from(got.coef)).toEqual(Array.from(want.coef));
        expect(got.ssRes).toBe(want.ssRes);
      }
    });
  }

  it("recovers an exact polynomial y = 2 − 3t + 0.5t² + 4·sin t + cos t (residual ~0)", () => {
    const n = 60;
    const t = Float64Array.from({ length: n }, (_, i) => -1 + (2 * i) / (n - 1));
    const fixed = [0, 1, 2].map((j) => Float64Array.from(t, (x) => x ** j));
    const extra = [Float64Array.from(t, Math.sin), Float64Array.from(t, Math.cos)];
    const y = Float64Array.from(t, (x) => 2 - 3 * x + 0.5 * x * x + 4 * Math.sin(x) + Math.cos(x));
    const got = fixedColumnsSolver(fixed, y)(extra)!;
    [2, -3, 0.5, 4, 1].forEach((c, j) => expect(got.coef[j]).toBeCloseTo(c, 6));
    expect(got.ssRes).toBeLessThan(1e-18);
  });

  it("null for collinear columns, RangeError for a short column", () => {
    const one = new Float64Array(10).fill(1);
    const y = Float64Array.from({ length: 10 }, (_, i) => i);
    expect(fixedColumnsSolver([one], y)([Float64Array.from(one, (v) => 2 * v)])).toBeNull();
    expect(() => fixedColumnsSolver([one], y)([new Float64Array(9)])).toThrow(RangeError);
    expect(() => fixedColumnsSolver([new Float64Array(9)], y)).toThrow(RangeError);
  });
});
