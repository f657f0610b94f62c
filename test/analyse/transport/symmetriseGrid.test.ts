/**
 * symmetriseField on awkward field grids (repeated fields, a negative branch
 * much finer or coarser than the positive one, B = 0 measured once): the
 * negative branch read at each |B| of the positive one by linear
 * interpolation (branches ordered by |B|, equal fields in the order measured),
 * written here directly from the definition (a scan for the
 * interval, no code from src/), and the symmetrised value (y(B) + y(−B))/2.
 */
import { describe, expect, it } from "vitest";
import { symmetriseField } from "../../../src/analyse/transport/symmetrise.ts";

/** Linear interpolation on an ascending grid with repeats: the last interval [x_k, x_{k+1}] with x_k ≤ at (x_k = x_{k+1}: y_k). */
function readAt(x: number[], y: number[], at: number): number {
  let k = 0;
  for (let j = 0; j < x.length - 1; j++) if (x[j] <= at) k = j;
  if (x[k + 1] === x[k]) return y[k];
  return y[k] + ((at - x[k]) / (x[k + 1] - x[k])) * (y[k + 1] - y[k]);
}

describe("symmetriseField on uneven grids", () => {
  const cases: [string, number[], number[]][] = [
    ["repeated fields on both branches", [-2, -1.5, -1.5, -1, -0.5, 0, 0.5, 1, 1, 1.5, 2], [0.5, 1, 1.5, 1.5, 2]],
    ["fine negative branch", Array.from({ length: 41 }, (_, i) => -2 + i * 0.05).concat([0.3, 0.7, 1.1, 1.9]), []],
    ["coarse negative branch", [-2, -1, 0, ...Array.from({ length: 20 }, (_, i) => 0.1 * (i + 1))], []],
  ];
  for (const [name, B] of cases) {
    it(name, () => {
      // The index term makes repeated fields carry different values, so the choice of interval shows.
      const y = B.map((b, i) => 3 + b * b + 0.7 * b + 0.1 * Math.sin(5 * b) + 0.01 * i);
      const s = symmetriseField(B, y, "even");
      expect(s.symmetrised).toBe(true);
      // Reference: branches in ascending |B| order (stable), grid = positive |B| inside the common range.
      const neg = B.map((b, i) => [-b, y[i]] as const)
        .filter(([m]) => m >= 0)
        .sort((p, q) => p[0] - q[0]);
      const pos = B.map((b, i) => [b, y[i]] as const).filter(([b]) => b >= 0);
      const top = Math.min(pos[pos.length - 1][0], neg[neg.length - 1][0]);
      const bottom = Math.max(pos[0][0], neg[0][0]);
      const grid = pos.filter(([b]) => b >= bottom && b <= top);
      expect(Array.from(s.b)).toEqual(grid.map(([b]) => b));
      grid.forEach(([b, yp], g) => {
        const yn = readAt(
          neg.map(([m]) => m),
          neg.map(([, v]) => v),
          b,
        );
        expect(s.y[g]).toBeCloseTo((yp + yn) / 2, 12);
      });
    });
  }
});
