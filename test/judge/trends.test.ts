// Trend charts through src/judge/trends.ts on worked examples.
// σ̂ = MR̄/1.128 (REFERENCES §13, individuals chart, d₂ from memory [M]); rules 1–4 as quoted from the
// Western Electric handbook in Montgomery & Runger (REFERENCES §13 [C]). Expected numbers derived by hand below.
import { describe, expect, it } from "vitest";
import { trendChart, type TrendInput } from "../../src/judge/trends.ts";
import { readTrendSettings } from "../../src/validate/trendSettings.ts";
import { InputError } from "../../src/model/problem.ts";

const day = (i: number) => `2025-01-${String(i + 1).padStart(2, "0")}`;
const series = (vals: number[]): TrendInput[] => vals.map((v, i) => ({ id: `W${i}`, date: day(i), run: i < 4 ? "A" : "B", value: v }));

describe("trendChart", () => {
  it("worked example: limits from the first 8 points, a later spike breaks rule 1", () => {
    // Baseline 10,12,11,13,12,11,10,12: mean 91/8 = 11.375; moving ranges 2,1,2,1,1,1,2 → MR̄ = 10/7;
    // σ̂ = (10/7)/1.128 = 1.266464; UCL = 11.375 + 3σ̂ = 15.174392; LCL = 7.575608 (derived from §13 formulas).
    const t = trendChart(series([10, 12, 11, 13, 12, 11, 10, 12, 30]), { baseline: { kind: "first", count: 8 }, runLength: 8 });
    expect(t.ok).toBe(true);
    if (!t.ok) return;
    expect(t.limits.centreLine).toBeCloseTo(11.375, 10);
    expect(t.limits.sigma).toBeCloseTo(10 / 7 / 1.128, 10);
    expect(t.limits.ucl).toBeCloseTo(15.174392, 5);
    expect(t.limits.lcl).toBeCloseTo(7.575608, 5);
    expect(t.points.map((p) => p.rules)).toEqual([[], [], [], [], [], [], [], [], [1]]);
    expect(t.flagged).toBe(1);
    expect(t.points[8].why).toContain("beyond the 3σ");
    expect(t.points[8].inBaseline).toBe(false);
  });

  it("orders by growth date, not by input order", () => {
    const input = series([10, 12, 11, 13]).reverse();
    const t = trendChart(input);
    expect(t.points.map((p) => p.id)).toEqual(["W0", "W1", "W2", "W3"]);
  });

  it("rule 2 and rule 4 on a drifting series (baseline all 0/±1 alternating, then a shift)", () => {
    // Baseline 8 points alternating 1, −1 (mean 0, MR̄ = 2, σ̂ = 2/1.128 = 1.773): 2σ̂ = 3.546, 3σ̂ = 5.319.
    // Then 4, 4, 1, 1, 1, 1, 1, 1: the two 4s are beyond 2σ (rule 2); eight points above CL in a row (rule 4).
    const vals = [1, -1, 1, -1, 1, -1, 1, -1, 4, 4, 1, 1, 1, 1, 1, 1];
    const t = trendChart(series(vals), { baseline: { kind: "first", count: 8 }, runLength: 8 });
    expect(t.ok).toBe(true);
    if (!t.ok) return;
    expect(t.limits.sigma).toBeCloseTo(2 / 1.128, 10);
    expect(t.points[8].rules).toEqual([2, 4]);
    expect(t.points[9].rules).toEqual([2, 4]);
    expect(t.points[15].rules).toEqual([4]);
    expect(t.points[7].rules).toEqual([]);
  });

  it("baseline by growth dates", () => {
    const t = trendChart(series([10, 12, 11, 13, 50]), { baseline: { kind: "dates", from: day(0), to: day(3) }, runLength: 8 });
    expect(t.ok && t.limits.baseline).toEqual({ from: 0, to: 3, count: 4 });
    expect(t.ok && t.points[4].rules).toEqual([1]);
  });

  it("no data, one point, equal values, NaN: a reason, never a throw", () => {
    expect(trendChart([])).toMatchObject({ ok: false });
    expect(trendChart(series([5]))).toMatchObject({ ok: false });
    const flat = trendChart(series([5, 5, 5]));
    expect(flat.ok).toBe(false);
    expect(!flat.ok && flat.reason).toContain("σ̂ = 0");
    const withNaN = trendChart(series([1, NaN, 2, 4]));
    expect(withNaN.points.length).toBe(3);
    expect(trendChart(series([1, 2, 3]), { baseline: { kind: "first", count: 8 }, runLength: 8 })).toMatchObject({ ok: false });
  });
});

describe("trends settings (targets.yaml trends: block)", () => {
  const read = (raw: unknown) => readTrendSettings(raw, "targets.yaml", () => 1);
  it("reads first, dates and run length; defaults when absent", () => {
    expect(read(undefined)).toEqual({ baseline: { kind: "all" }, runLength: 8 });
    expect(read({ baseline: { first: 8 }, run_length: 9 })).toEqual({ baseline: { kind: "first", count: 8 }, runLength: 9 });
    expect(read({ baseline: { from: new Date("2024-01-01"), to: "2024-12-31" } }).baseline).toEqual({ kind: "dates", from: "2024-01-01", to: "2024-12-31" });
  });
  it("rejects bad shapes with a located problem", () => {
    expect(() => read({ baseline: { first: 1 } })).toThrow(InputError);
    expect(() => read({ run_length: 1 })).toThrow(InputError);
    expect(() => read({ baseline: { from: "2024-12-31", to: "2024-01-01" } })).toThrow(/reversed/);
    expect(() => read({ baseline_: 3 })).toThrow(InputError);
  });
});
