// The page text of the minimum Ge fraction in the well: with its uncertainty, a small negative value shown as
// consistent with zero (−(offset + 3u) ≤ v ≤ 3u), a larger one named, and a profile without a noise estimate
// said so. Values are made up by hand.
import { describe, expect, it } from "vitest";
import { wellGeMinAgainstZero, wellGeMinBrief, wellGeMinText } from "../../src/publish/wellGeMin.ts";

describe("minimum Ge in the well on the page", () => {
  it("−0.0046 ± 0.0027 with a selection offset of 0.0044 is consistent with zero, not a negative Ge fraction", () => {
    const r = { wellGeMin: -0.0046, wellGeMinStdErr: 0.0027, wellGeMinOffset: 0.0044 };
    expect(wellGeMinAgainstZero(r)).toBe("zero");
    const t = wellGeMinText(r);
    // The cell leads with the measured value and names the coverage factor and the offset.
    expect(t).toBe("-0.00460 ± 0.0027 (standard uncertainty; consistent with 0 at k = 3 after the selection offset 0.0044)");
  });
  it("without offset: −0.0046 ± 0.0027 is within 3u of 0, −0.0090 ± 0.0027 is not", () => {
    expect(wellGeMinAgainstZero({ wellGeMin: -0.0046, wellGeMinStdErr: 0.0027 })).toBe("zero");
    expect(wellGeMinAgainstZero({ wellGeMin: -0.009, wellGeMinStdErr: 0.0027 })).toBe("below");
  });
  it("a small positive value within 3u says so; above 3u it is a plain value with its uncertainty", () => {
    expect(wellGeMinText({ wellGeMin: 0.007, wellGeMinStdErr: 0.0025, wellGeMinOffset: 0.004 })).toBe(
      "0.00700 ± 0.0025 (standard uncertainty; consistent with 0 at k = 3 after the selection offset 0.0040)",
    );
    expect(wellGeMinText({ wellGeMin: 0.02, wellGeMinStdErr: 0.0023, wellGeMinOffset: 0.004 })).toBe("0.0200 ± 0.0023 (standard uncertainty)");
  });
  it("below −(offset + 3u) the value is named as more negative than the noise explains", () => {
    // offset + 3u = 0.004 + 0.0069 = 0.0109 < 0.02
    const r = { wellGeMin: -0.02, wellGeMinStdErr: 0.0023, wellGeMinOffset: 0.004 };
    expect(wellGeMinAgainstZero(r)).toBe("below");
    expect(wellGeMinText(r)).toMatch(
      /^-0\.0200 ± 0\.0023 \(standard uncertainty\): below 0 by more than the noise explains at k = 3 after the selection offset 0\.0040 \(the smallest of the well's 3-point means/,
    );
  });
  it("without a noise estimate the page says the uncertainty is unknown, and why", () => {
    const r = { wellGeMin: -0.001 };
    expect(wellGeMinAgainstZero(r)).toBe("no-uncertainty");
    expect(wellGeMinText(r)).toMatch(/^-0\.00100 \(uncertainty unknown: the profile gives no noise estimate/);
  });
  it("correlated noise: the reason from the analysis is shown", () => {
    const r = { wellGeMin: -0.004, wellGeMinUnknown: "the profile's noise is correlated between points (lag-1 ≈ 0.61)" };
    expect(wellGeMinText(r)).toMatch(/^-0\.00400 \(uncertainty unknown: the profile's noise is correlated between points \(lag-1 ≈ 0\.61\)/);
  });
  it("a cell never starts with 0 when the measured value is not 0", () => {
    for (const v of [-0.0087, -0.0001, 0.0003, 0.009])
      for (const extra of [{ wellGeMinStdErr: 0.0021, wellGeMinOffset: 0.0041 }, {}])
        for (const text of [wellGeMinText, wellGeMinBrief]) expect(text({ wellGeMin: v, ...extra })).not.toMatch(/^0[ (]/);
  });
  it("the design table's short form keeps the value, its uncertainty and the verdict against zero", () => {
    expect(wellGeMinBrief({ wellGeMin: -0.00868, wellGeMinStdErr: 0.0019, wellGeMinOffset: 0.0037 })).toBe("-0.00868 ± 0.0019 (consistent with 0 at k = 3)");
    expect(wellGeMinBrief({ wellGeMin: -0.02, wellGeMinStdErr: 0.0019, wellGeMinOffset: 0.0037 })).toMatch(
      /^-0\.0200 ± 0\.0019 \(below 0 beyond its noise at k = 3/,
    );
    expect(wellGeMinBrief({ wellGeMin: -0.004, wellGeMinUnknown: "correlated" })).toMatch(/^-0\.00400 \(uncertainty unknown/);
  });
  it("noise from the whole profile is said", () => {
    expect(wellGeMinText({ wellGeMin: 0.02, wellGeMinStdErr: 0.0023, geNoiseFrom: "profile" })).toMatch(/noise from the whole profile/);
  });
});
