// Within-wafer uniformity. Reference values derived by hand from the definitions (sample SD with n − 1) [D].
import { describe, expect, it } from "vitest";
import { uniformity } from "../../src/analyse/uniformity.ts";

describe("uniformity", () => {
  it("matches the hand-computed figures for 2, 4, 4, 4, 5, 5, 7, 9", () => {
    // [D] mean = 40/8 = 5; Σ(x−5)² = 9+1+1+1+0+0+4+16 = 32; s = √(32/7) = 2.1380899353 (sample, n−1;
    // the population value would be exactly 2); CV = 100·s/5 = 42.761798706 %; range = 9 − 2 = 7.
    const u = uniformity([2, 4, 4, 4, 5, 5, 7, 9]);
    if (!u.ok) throw new Error(u.reason);
    expect(u.n).toBe(8);
    expect(u.mean).toBeCloseTo(5, 12);
    expect(u.standardDeviation).toBeCloseTo(2.1380899353, 9);
    expect(u.cvPercent).toBeCloseTo(42.761798706, 7);
    expect(u).toMatchObject({ range: 7, min: 2, max: 9 });
    expect(u.cvReason).toBeUndefined();
  });

  it("uses |mean| for negative values", () => {
    // [D] −1, −3: mean −2, s = √2 = 1.41421356, CV = 70.710678 %.
    const u = uniformity([-1, -3]);
    if (!u.ok) throw new Error(u.reason);
    expect(u.cvPercent).toBeCloseTo(70.710678, 5);
  });

  it("gives no SD or CV for one device, with a reason", () => {
    const u = uniformity([3.2]);
    expect(u.ok).toBe(true);
    if (u.ok) {
      expect(u).toMatchObject({ n: 1, mean: 3.2, range: 0, standardDeviation: null, cvPercent: null });
      expect(u.cvReason).toMatch(/at least 2/);
    }
  });

  it("gives no CV when the mean is zero", () => {
    const u = uniformity([-1, 1]);
    if (!u.ok) throw new Error(u.reason);
    expect(u.cvPercent).toBeNull();
    expect(u.cvReason).toMatch(/zero/);
  });

  it("fails with a reason for empty or non-finite input", () => {
    expect(uniformity([]).ok).toBe(false);
    const r = uniformity([1, Number.NaN]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toContain("#2");
    expect(uniformity([1, Number.POSITIVE_INFINITY]).ok).toBe(false);
  });
});
