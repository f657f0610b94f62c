import { describe, expect, it } from "vitest";
import { zContrastProfile } from "../../../src/analyse/images/zContrastProfile.ts";
import { syntheticMicrograph } from "../../../src/synth/micrograph.ts";
import { PX, testMicrograph } from "../../helpers/micrograph.ts";
import { monteCarloSpread } from "./monteCarlo.ts";

// Small (128 × 128) versions of the image tests' synthetic cross-section: a 38 px well, τ = 3 px
// interfaces, Gaussian pixel noise; only the noise seed changes between draws.
const small = (seed: number, rest = {}) =>
  syntheticMicrograph({ ...testMicrograph(-0.02006, { noise: 0.05, seed, ...rest }), width: 128, height: 128, wellThickness_m: 38 * PX });

describe("lattice-image standard errors against a Monte Carlo spread", () => {
  // 60 draws: the sample SD is itself known to ±1/√(2·59) = ±9 %, so [0.8, 1.3] is a 2.2σ / 3.3σ
  // margin. Measured ratio (lower, upper interface): 1.06, 0.96 here (1.15, 1.02 over 100 draws);
  // before the correlated-noise covariance and the corrected dτ/dτ_fit, 0.72, 0.66 (issue 17).
  it("Z-contrast 10–90 % widths: reported s.e. within [0.8, 1.3] of the sample SD over 60 images", () => {
    const fits = Array.from({ length: 60 }, (_, i) => {
      const img = small(300 + i);
      const r = zContrastProfile(img.pixels, img.width, img.height, { pixelSize_m: PX, growthAxis: "up" });
      if (!r.ok) throw new Error(r.reason);
      return r;
    });
    for (const edge of ["bottom", "top"] as const) {
      const m = monteCarloSpread(60, (i) => ({ value: fits[i][edge].width10to90_m, stdErr: fits[i][edge].width10to90StdErr_m }));
      expect(m.ratio, edge).toBeGreaterThan(0.8);
      expect(m.ratio, edge).toBeLessThan(1.3);
    }
  });
});
