import { describe, expect, it } from "vitest";
import { analyseDepthProfile } from "../../../src/analyse/structure/depthProfile.ts";
import { synthDepthProfile } from "../../../src/synth/depthProfile.ts";
import { monteCarloSpread } from "./monteCarlo.ts";

describe("depth profile standard errors against a Monte Carlo spread (120 noisy draws)", () => {
  // 120 draws: the sample SD is itself known to ±6.5 %, so 25 % is a ~4σ margin. Measured ratios
  // (seeds 1000…): thickness 1.08, bottom 10–90 % width 0.91 at 200 draws.
  it("well thickness and interface τ: reported s.e. within 25 % of the sample SD", () => {
    const fits = Array.from({ length: 120 }, (_, i) => {
      const r = analyseDepthProfile(synthDepthProfile({ wellThickness: 6, noise: 0.004, seed: 1000 + i }));
      if (!r.ok) throw new Error(r.reason);
      return r;
    });
    const thickness = monteCarloSpread(120, (i) => ({ value: fits[i].wellThickness, stdErr: fits[i].wellThicknessStdErr }));
    const width = monteCarloSpread(120, (i) => ({ value: fits[i].bottom.width10to90, stdErr: fits[i].bottom.width10to90StdErr }));
    expect(thickness.ratio).toBeGreaterThan(0.75);
    expect(thickness.ratio).toBeLessThan(1.25);
    expect(width.ratio).toBeGreaterThan(0.75);
    expect(width.ratio).toBeLessThan(1.25);
  });
});
