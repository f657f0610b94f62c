import { describe, expect, it } from "vitest";
import { putMetric } from "../../src/model/metrics.ts";

describe("putMetric", () => {
  it("stores the value in the metric's unit", () => {
    // peak_mobility is registered in cm^2/(V s): 1 m^2/(V s) = 1e4 cm^2/(V s) (SI definition of the units)
    const metrics: Record<string, number> = {};
    expect(putMetric(metrics, "peak_mobility", 2.5)).toBe(true);
    expect(metrics.peak_mobility).toBeCloseTo(25000, 9);
  });
  it("stores nothing for undefined, NaN or infinite values and keeps an existing entry", () => {
    const metrics: Record<string, number> = { peak_mobility: 7 };
    expect(putMetric(metrics, "peak_mobility", undefined)).toBe(false);
    expect(putMetric(metrics, "peak_mobility", Number.NaN)).toBe(false);
    expect(putMetric(metrics, "peak_mobility", Number.POSITIVE_INFINITY)).toBe(false);
    expect(metrics).toEqual({ peak_mobility: 7 });
  });
  it("throws for an unknown key", () => {
    expect(() => putMetric({}, "no_such_metric", 1)).toThrow(/unknown metric/);
  });
});
