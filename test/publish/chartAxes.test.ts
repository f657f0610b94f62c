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
  await import(/* @vite-ignore */ new URL("../../templates/assets/charts.js", import.meta.url).href);
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
  it("a density range of more than a decade keeps 1-2-5 ticks", () => {
    // 3e10 … 8e11: span 1.426 decades, pad 0.086 → 2.46e10 … 9.75e11; widest gap 2e11 → 5e11, 0.398 of 1.597 decades (25 %).
    expect(axes.logAxis(3e10, 8e11).ticks).toEqual([5e10, 1e11, 2e11, 5e11]);
  });
  it("a range of a factor 5 whose 1-2-5 ticks leave a gap over 45 % of the axis gets 1…9", () => {
    // 1.06e11 … 5.1e11 padded (0.041 decade) to 9.63e10 … 5.61e11: 1-2-5 leaves 2e11 → 5e11, 0.398 of 0.764 decade (52 %).
    expect(axes.logAxis(1.06e11, 5.1e11).ticks).toEqual([1e11, 2e11, 3e11, 4e11, 5e11]);
  });
  it("uses every mantissa 1…9 when 1-2-5 gives fewer than three ticks", () => {
    // 1.2e11 … 6e11 padded (0.042 decade) to ≈ 1.09e11 … 6.61e11: only 2e11 and 5e11 of 1-2-5 inside.
    const a = axes.logAxis(1.2e11, 6e11);
    expect(a.min).toBeCloseTo(1.2e11 / 10 ** (0.06 * Math.log10(5)), -7);
    expect(a.ticks).toEqual([2e11, 3e11, 4e11, 5e11, 6e11]);
  });
  it("goes to 1, 1.2, 1.5, 2, 2.5, 3 … when 1…9 leaves fewer than three ticks", () => {
    // 2.3e5 … 4.2e5, padded by 0.04 decade (×/÷ 1.0965) to ≈ 2.10e5 … 4.61e5: 3e5, 4e5 of 1…9; 2.5e5 joins at the finest set.
    expect(axes.logAxis(2.3e5, 4.2e5).ticks).toEqual([2.5e5, 3e5, 4e5]);
  });
  it("a mobility range of 8.6e4 … 1.38e5 gets ticks above 1e5 too (1…9 alone would leave the top 60 % empty)", () => {
    // Padded (0.04 decade) to ≈ 7.84e4 … 1.51e5; 1…9 gives 8e4, 9e4, 1e5 (gap 1e5 → 1.51e5 is 0.180 of 0.285 decade: 63 %).
    expect(axes.logAxis(8.6e4, 1.38e5).ticks).toEqual([8e4, 9e4, 1e5, 1.2e5, 1.5e5]);
  });
  it("widens a very narrow range to the neighbouring ticks of the finest set", () => {
    // 1.1e5 … 1.6e5 padded to ≈ 1.003e5 … 1.754e5: only 1.2e5 and 1.5e5 inside, so the axis runs 1e5 … 2e5.
    const a = axes.logAxis(1.1e5, 1.6e5);
    expect(a.min).toBe(1e5);
    expect(a.max).toBe(2e5);
    expect(a.ticks).toEqual([1e5, 1.2e5, 1.5e5, 2e5]);
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
