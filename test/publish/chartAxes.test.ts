// Log axes of the page's charts (templates/assets/charts.js): ticks at 1, 2 and 5 per decade and a padded range.
// Expected values are written out by hand from the rule "m × 10^k for m in {1, 2, 5}" (common practice for log axes).
import { beforeAll, describe, expect, it } from "vitest";

interface Axes {
  sci: (v: number) => string;
  logTicks: (min: number, max: number) => number[];
  logAxis: (lo: number, hi: number, pad?: number) => { min: number; max: number; ticks: number[] };
}
let axes: Axes;

beforeAll(async () => {
  // A plain browser script: it publishes its axis helpers on globalThis and stops without a document.
  await import("../../templates/assets/charts.js");
  axes = (globalThis as unknown as { waferbookAxes: Axes }).waferbookAxes;
});

describe("logTicks (1-2-5 per decade)", () => {
  it("one decade, ends included", () => {
    expect(axes.logTicks(1e5, 1e6)).toEqual([1e5, 2e5, 5e5, 1e6]);
  });
  it("several decades of sheet density", () => {
    expect(axes.logTicks(3e10, 8e11)).toEqual([5e10, 1e11, 2e11, 5e11]);
    expect(axes.logTicks(0.9e3, 1.1e6)).toEqual([1e3, 2e3, 5e3, 1e4, 2e4, 5e4, 1e5, 2e5, 5e5, 1e6]);
  });
  it("small values and exact floating-point results", () => {
    expect(axes.logTicks(0.015, 0.6)).toEqual([0.02, 0.05, 0.1, 0.2, 0.5]);
  });
  it("nothing inside a narrow range, nothing for empty or non-positive input", () => {
    expect(axes.logTicks(1.1e5, 1.9e5)).toEqual([]);
    expect(axes.logTicks(-1, 10)).toEqual([]);
    expect(axes.logTicks(10, 1)).toEqual([]);
  });
});

describe("logAxis (padding and fallbacks)", () => {
  it("pads by 6 % of the span in decades on each side, so no point sits on the frame", () => {
    // 1e5 … 1e7: span 2 decades, pad 0.12 decade → 10^4.88 … 10^7.12.
    const a = axes.logAxis(1e5, 1e7);
    expect(a.min).toBeCloseTo(10 ** 4.88, -1);
    expect(a.max / 10 ** 7.12).toBeCloseTo(1, 9);
    expect(a.min).toBeLessThan(1e5);
    expect(a.max).toBeGreaterThan(1e7);
    expect(a.ticks).toEqual([1e5, 2e5, 5e5, 1e6, 2e6, 5e6, 1e7]);
  });
  it("pads at least 0.04 decade; a range of a factor 5 keeps 1-2-5 ticks", () => {
    // 1.2e11 … 6e11: span 0.699 decade, 6 % = 0.042 → min 1.2e11 / 10^0.042 ≈ 1.09e11.
    const a = axes.logAxis(1.2e11, 6e11);
    expect(a.min).toBeCloseTo(1.2e11 / 10 ** (0.06 * Math.log10(5)), -7);
    expect(a.ticks).toEqual([2e11, 5e11]);
  });
  it("falls back to every mantissa 1…9 when fewer than two 1-2-5 ticks fall inside", () => {
    // 2.3e5 … 4.2e5, padded by 0.04 decade (×/÷ 1.0965) to ≈ 2.10e5 … 4.61e5: neither 2e5 nor 5e5 inside, 3e5 and 4e5 are.
    const a = axes.logAxis(2.3e5, 4.2e5);
    expect(a.ticks).toEqual([3e5, 4e5]);
  });
  it("widens a very narrow range to the neighbouring mantissas", () => {
    // 1.1e5 … 1.6e5 padded by 0.04 decade ≈ 1.00e5 … 1.75e5: widened to 1e5 … 2e5.
    const a = axes.logAxis(1.1e5, 1.6e5);
    expect(a.min).toBe(1e5);
    expect(a.max).toBe(2e5);
    expect(a.ticks).toEqual([1e5, 2e5]);
  });
});

describe("tick labels", () => {
  it("write 1, 2 and 5 × 10^k with superscript exponents", () => {
    expect(axes.sci(1e5)).toBe("10⁵");
    expect(axes.sci(2e5)).toBe("2×10⁵");
    expect(axes.sci(5e11)).toBe("5×10¹¹");
    expect(axes.sci(0.05)).toBe("0.05");
    expect(axes.sci(2e-4)).toBe("2×10⁻⁴");
  });
});
