// The page text of the minimum Ge fraction in the well: with its uncertainty, a small negative value shown as
// consistent with zero (−(offset + 3u) ≤ v ≤ 3u), a larger one named, and a profile without a noise estimate
// said so. Values are made up by hand.
import { describe, expect, it } from "vitest";
import { wellGeMinAgainstZero, wellGeMinText } from "../../src/publish/wellGeMin.ts";

describe("minimum Ge in the well on the page", () => {
  it("−0.0046 ± 0.0027 with a selection offset of 0.0044 is consistent with zero, not a negative Ge fraction", () => {
    const r = { wellGeMin: -0.0046, wellGeMinStdErr: 0.0027, wellGeMinOffset: 0.0044 };
    expect(wellGeMinAgainstZero(r)).toBe("zero");
    const t = wellGeMinText(r);
    expect(t.startsWith("0 within its uncertainty")).toBe(true);
    expect(t).toContain("± 0.0027");
    expect(t).toContain("0.0044 below the true level");
  });
  it("without offset: −0.0046 ± 0.0027 is within 3u of 0, −0.0090 ± 0.0027 is not", () => {
    expect(wellGeMinAgainstZero({ wellGeMin: -0.0046, wellGeMinStdErr: 0.0027 })).toBe("zero");
    expect(wellGeMinAgainstZero({ wellGeMin: -0.009, wellGeMinStdErr: 0.0027 })).toBe("below");
  });
  it("a small positive value within 3u says so; above 3u it is a plain value with its uncertainty", () => {
    expect(wellGeMinText({ wellGeMin: 0.007, wellGeMinStdErr: 0.0025, wellGeMinOffset: 0.004 })).toBe("0.00700 ± 0.0025 (consistent with 0)");
    expect(wellGeMinText({ wellGeMin: 0.02, wellGeMinStdErr: 0.0023, wellGeMinOffset: 0.004 })).toBe("0.0200 ± 0.0023");
  });
  it("below −(offset + 3u) the value is named as more negative than the noise explains", () => {
    // offset + 3u = 0.004 + 0.0069 = 0.0109 < 0.02
    const r = { wellGeMin: -0.02, wellGeMinStdErr: 0.0023, wellGeMinOffset: 0.004 };
    expect(wellGeMinAgainstZero(r)).toBe("below");
    expect(wellGeMinText(r)).toMatch(/more than the profile's noise explains/);
  });
  it("without a noise estimate the page says there is no uncertainty, and why", () => {
    const r = { wellGeMin: -0.001 };
    expect(wellGeMinAgainstZero(r)).toBe("no-uncertainty");
    expect(wellGeMinText(r)).toMatch(/^-0\.00100 \(no uncertainty: the profile gives no noise estimate/);
  });
});
