/**
 * modelEvaluator (oscillationModel.ts) remembers the exponential and the
 * cosines of each point between calls; it must give exactly modelValue's and
 * modelGradient's numbers whatever the order of calls and parameter changes
 * (the fit's published figures depend on that), and its gradient must be the
 * derivative of its value (central differences, independent of the formula).
 */
import { describe, expect, it } from "vitest";
import { modelEvaluator, modelGradient, modelValue, type ModelLayout } from "../../../src/analyse/transport/oscillationModel.ts";

function layout(order: number): ModelLayout {
  const field = Float64Array.from({ length: 40 }, (_, i) => 0.4 + i * 0.04);
  return {
    order,
    mid: 1.18,
    half: 0.78,
    field,
    thermal: Float64Array.from(field, (b) => 0.3 + 0.5 * b),
    thermal2: Float64Array.from(field, (b) => 0.1 + 0.2 * b),
  };
}

describe("modelEvaluator", () => {
  for (const order of [0, 2, 4]) {
    it(`order ${order}: value, gradient and both at once are bit-identical to modelValue/modelGradient over a changing parameter sequence`, () => {
      const L = layout(order);
      const ev = modelEvaluator(L);
      const base = [...Array.from({ length: order + 1 }, (_, j) => 500 / (j + 1)), 0.8, 1.3, 9.5, 0.4, -0.05];
      const k = order;
      // Steps that change one group at a time (background only, β only, f only, φ only) and repeat points.
      const seq = [
        base,
        base.map((v, j) => (j <= k ? v * 1.01 : v)),
        base.map((v, j) => (j === k + 2 ? v + 0.1 : v)),
        base,
        base.map((v, j) => (j === k + 3 ? v + 0.2 : v)),
        base.map((v, j) => (j === k + 4 ? v - 0.3 : v)),
      ];
      const a = new Float64Array(k + 6);
      const b = new Float64Array(k + 6);
      for (const p of seq) {
        for (let i = 0; i < L.field.length; i++) {
          const mode = (i + seq.indexOf(p)) % 3;
          if (mode === 0) {
            expect(ev.value(p, i)).toBe(modelValue(p, L, i));
            ev.gradient(p, i, a);
          } else if (mode === 1) {
            ev.gradient(p, i, a);
            expect(ev.value(p, i)).toBe(modelValue(p, L, i));
          } else expect(ev.valueAndGradient(p, i, a)).toBe(modelValue(p, L, i));
          modelGradient(p, L, i, b);
          expect(Array.from(a)).toEqual(Array.from(b));
        }
      }
    });
  }

  it("the gradient is the derivative of the value (central differences)", () => {
    const L = layout(2);
    const ev = modelEvaluator(L);
    const p = [480, 20, -15, 0.8, 1.3, 9.5, 0.4, -0.05];
    const g = new Float64Array(p.length);
    for (const i of [0, 17, 39]) {
      ev.gradient(p, i, g);
      p.forEach((v, j) => {
        const h = 1e-6 * Math.max(1, Math.abs(v));
        const up = p.slice();
        const dn = p.slice();
        up[j] = v + h;
        dn[j] = v - h;
        const numeric = (ev.value(up, i) - ev.value(dn, i)) / (2 * h);
        expect(Math.abs(g[j] - numeric)).toBeLessThan(1e-5 * Math.max(1, Math.abs(numeric)));
      });
    }
  });
});
