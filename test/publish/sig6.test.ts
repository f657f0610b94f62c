/**
 * sig6 (format.ts): the one six-significant-digit rounding used by charts,
 * exports and provenance, and the non-finite handling each caller keeps.
 */
import { describe, expect, it } from "vitest";
import { round } from "../../src/publish/charts.ts";
import { csvField } from "../../src/publish/exports.ts";
import { sig6, sig6OrNull } from "../../src/model/format.ts";

describe("sig6", () => {
  it("rounds to six significant digits (values worked by hand)", () => {
    expect(sig6(1234.5678)).toBe(1234.57);
    expect(sig6(1.23456789e15)).toBe(1.23457e15);
    expect(sig6(-0.000123456789)).toBe(-0.000123457);
    expect(sig6(2)).toBe(2);
    expect(sig6(0.1 + 0.2)).toBe(0.3);
  });
  it("passes non-finite values through and turns −0 into 0", () => {
    expect(sig6(Number.NaN)).toBeNaN();
    expect(sig6(Number.POSITIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
    expect(sig6(Number.NEGATIVE_INFINITY)).toBe(Number.NEGATIVE_INFINITY);
    expect(Object.is(sig6(-0), 0)).toBe(true);
  });
  it("callers keep their own non-finite behaviour: charts → 0, CSV → empty cell", () => {
    expect(round(Number.NaN)).toBe(0);
    expect(round(Number.NEGATIVE_INFINITY)).toBe(0);
    expect(round(98765.4321)).toBe(98765.4);
    expect(csvField(Number.POSITIVE_INFINITY)).toBe("");
    expect(csvField(1.23456789e-7)).toBe("1.23457e-7");
  });
  it("sig6OrNull (JSON exports): sig6 for finite values, null for missing or non-finite", () => {
    expect(sig6OrNull(1234.5678)).toBe(1234.57);
    expect(sig6OrNull(0)).toBe(0);
    expect(sig6OrNull(undefined)).toBeNull();
    expect(sig6OrNull(null)).toBeNull();
    expect(sig6OrNull(Number.NaN)).toBeNull();
    expect(sig6OrNull(Number.POSITIVE_INFINITY)).toBeNull();
    expect(sig6OrNull(Number.NEGATIVE_INFINITY)).toBeNull();
  });
});
