import { describe, expect, it } from "vitest";
import { linearFit } from "../../../src/analyse/numeric/linearFit.ts";
import { fitSigmoidEdge, LN9 } from "../../../src/analyse/numeric/sigmoidFit.ts";
import { gaussian } from "../../helpers/random.ts";

describe("linearFit", () => {
  it("recovers an exact line", () => {
    const f = linearFit([0, 1, 2], [1, 3, 5]);
    expect(f.slope).toBeCloseTo(2, 12);
    expect(f.intercept).toBeCloseTo(1, 12);
    expect(f.r2).toBeCloseTo(1, 12);
  });
  it("rejects a single point and a vertical line", () => {
    expect(() => linearFit([1], [1])).toThrow(RangeError);
    expect(() => linearFit([1, 1], [1, 2])).toThrow(/all x/);
  });
});

describe("fitSigmoidEdge", () => {
  it("10–90 % width of a logistic step is 2·ln 9·τ = 4.394449·τ (REFERENCES §10, derived)", () => {
    expect(2 * LN9).toBeCloseTo(4.394449, 6);
  });
  it("recovers τ within 3 % from a noisy profile on a sloping background", () => {
    const noise = gaussian(7);
    const z: number[] = [];
    const x: number[] = [];
    const tau = 0.35;
    for (let zz = 0; zz <= 12; zz += 0.1) {
      z.push(zz);
      x.push(0.3 - 0.28 / (1 + Math.exp(-(zz - 6) / tau)) + 0.002 * zz + 0.003 * noise());
    }
    const edge = fitSigmoidEdge(z, x);
    expect(Math.abs(edge.tau - tau) / tau).toBeLessThan(0.03);
    expect(edge.centre).toBeCloseTo(6, 1);
    // 10–90 % width against the truth, 4.394449·τ (REFERENCES §10, derived).
    expect(Math.abs(edge.width10to90 - 4.394449 * tau) / (4.394449 * tau)).toBeLessThan(0.03);
  });
});
