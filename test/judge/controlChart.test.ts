// Individuals control chart: limits checked against worked values computed by hand below.
// Method: REFERENCES §13 — Shewhart limits CL ± 3σ̂ (Shewhart 1931 [M]; NIST/SEMATECH e-Handbook §6.3 [C URL]);
// σ̂ = MR̄/d₂ with d₂ = 1.128 for n = 2 — from memory [M] (Montgomery, Introduction to SQC).
import { describe, expect, it } from "vitest";
import { baselineFromDates, controlChart, D2_MOVING_RANGE, type ChartInput } from "../../src/judge/controlChart.ts";

const series = (values: number[]): ChartInput[] => values.map((value, i) => ({ id: `W${i + 1}`, value }));

describe("controlChart", () => {
  it("uses d2 = 1.128 (REFERENCES §13, from memory [M])", () => {
    expect(D2_MOVING_RANGE).toBe(1.128);
  });

  it("matches hand-computed limits for a five-point series (all points as baseline)", () => {
    // x = 10, 12, 11, 15, 12: CL = 60/5 = 12.
    // MR = |12−10|, |11−12|, |15−11|, |12−15| = 2, 1, 4, 3 → MR̄ = 10/4 = 2.5.
    // σ̂ = 2.5/1.128 = 2.2163120567 (d₂ [M] from memory); UCL = 12 + 3σ̂ = 18.6489361702; LCL = 5.3510638298.
    const c = controlChart(series([10, 12, 11, 15, 12]));
    if (!c.ok) throw new Error(c.reason);
    const l = c.limits;
    expect(l.centreLine).toBeCloseTo(12, 12);
    expect(l.movingRangeMean).toBeCloseTo(2.5, 12);
    expect(l.sigma).toBeCloseTo(2.2163120567, 9);
    expect(l.ucl).toBeCloseTo(18.6489361702, 9);
    expect(l.lcl).toBeCloseTo(5.3510638298, 9);
    expect(l.plus2).toBeCloseTo(12 + 2 * 2.2163120567, 9); // 16.4326241135
    expect(l.minus1).toBeCloseTo(12 - 2.2163120567, 9); // 9.7836879433
    expect(l.baseline).toEqual({ from: 0, to: 4, count: 5 });
    // 15: z = 3/2.2163 = 1.3536 → beyond 1σ, above. 10: z = −0.9024 → within 1σ, below.
    expect(c.points[3]).toMatchObject({ side: "above", band: 1, inBaseline: true });
    expect(c.points[3].z).toBeCloseTo(3 / 2.2163120567, 8);
    expect(c.points[0]).toMatchObject({ side: "below", band: 0 });
    expect(c.points[4]).toMatchObject({ side: "on", band: 0, z: 0 });
  });

  it("estimates from the first N points only and judges later points against them", () => {
    // Baseline 10, 12, 11: CL = 11; MR = 2, 1 → MR̄ = 1.5; σ̂ = 1.5/1.128 = 1.3297872340; UCL = 14.9893617021.
    // 15 > 14.98936 → beyond 3σ (band 3), just; 12 → z = 0.752 → band 0.
    const c = controlChart(series([10, 12, 11, 15, 12]), { first: 3 });
    if (!c.ok) throw new Error(c.reason);
    expect(c.limits.centreLine).toBeCloseTo(11, 12);
    expect(c.limits.sigma).toBeCloseTo(1.329787234, 8);
    expect(c.limits.ucl).toBeCloseTo(14.9893617021, 9);
    expect(c.points[3]).toMatchObject({ band: 3, side: "above", inBaseline: false });
    expect(c.points[4]).toMatchObject({ band: 0, inBaseline: false });
  });

  it("takes an index window as baseline", () => {
    // Indices 2…4 of 0, 0, 4, 6, 5: CL = 5; MR = 2, 1 → MR̄ = 1.5 → σ̂ = 1.3297872340.
    const c = controlChart(series([0, 0, 4, 6, 5]), { from: 2, to: 4 });
    if (!c.ok) throw new Error(c.reason);
    expect(c.limits.centreLine).toBeCloseTo(5, 12);
    expect(c.limits.sigma).toBeCloseTo(1.329787234, 8);
    expect(c.points[0]).toMatchObject({ side: "below", band: 3, inBaseline: false });
  });

  it("treats a point exactly on an edge as not beyond it", () => {
    // Baseline ±0.564 alternating: CL = 0, MR = 1.128 each → σ̂ = 1 exactly; then 3, 2, 1 sit on the edges.
    const c = controlChart(series([0.564, -0.564, 0.564, -0.564, 3, -2, 1]), { first: 4 });
    if (!c.ok) throw new Error(c.reason);
    expect(c.limits.sigma).toBe(1);
    expect(c.points.slice(4).map((p) => p.band)).toEqual([2, 1, 0]);
  });

  it("refuses fewer than 2 baseline points, with a reason", () => {
    const one = controlChart(series([1, 2, 3]), { first: 1 });
    expect(one.ok).toBe(false);
    if (!one.ok) expect(one.reason).toMatch(/at least 2/);
    expect(controlChart(series([4])).ok).toBe(false);
    expect(controlChart([]).ok).toBe(false);
  });

  it("says so when the baseline is constant (σ̂ = 0) and still gives the centre line", () => {
    const c = controlChart(series([5, 5, 5, 7]), { first: 3 });
    expect(c.ok).toBe(false);
    if (!c.ok) {
      expect(c.reason).toMatch(/σ̂ = 0/);
      expect(c.centreLine).toBe(5);
    }
  });

  it("rejects non-finite values and bad windows without throwing", () => {
    const nan = controlChart(series([1, Number.NaN, 3]));
    expect(nan.ok).toBe(false);
    if (!nan.ok) expect(nan.reason).toContain("W2");
    expect(controlChart(series([1, 2, 3]), { first: 5 }).ok).toBe(false);
    expect(controlChart(series([1, 2, 3]), { from: 2, to: 1 }).ok).toBe(false); // reversed
    expect(controlChart(series([1, 2, 3]), { from: 0, to: 3 }).ok).toBe(false);
    expect(controlChart(series([1, 2, 3]), { first: 2.5 }).ok).toBe(false);
  });
});

describe("baselineFromDates", () => {
  const dated: ChartInput[] = [
    { id: "A", value: 1, date: "2024-01-05" },
    { id: "B", value: 2, date: "2024-02-10" },
    { id: "C", value: 3, date: "2024-03-15" },
    { id: "D", value: 4, date: "2024-04-20" },
  ];
  it("maps an inclusive date window to indices", () => {
    expect(baselineFromDates(dated, "2024-02-10", "2024-03-31")).toEqual({ from: 1, to: 2 });
  });
  it("gives a reason when nothing falls inside or dates are invalid", () => {
    expect(baselineFromDates(dated, "2025-01-01", "2025-12-31")).toHaveProperty("reason");
    expect(baselineFromDates(dated, "not a date", "2025-12-31")).toHaveProperty("reason");
  });
});
