import { describe, expect, it } from "vitest";
import { geometricPhase, type GpaMaps } from "../../../src/analyse/images/geometricPhase.ts";
import { wellCoherence } from "../../../src/analyse/images/wellCoherence.ts";
import { zContrastProfile } from "../../../src/analyse/images/zContrastProfile.ts";
import { syntheticMicrograph, type SyntheticMicrographSpec } from "../../../src/synth/micrograph.ts";
import { PX, testMicrograph } from "../../helpers/micrograph.ts";

// Expected out-of-plane strain, derived from Dismukes' law (REFERENCES §2, [C] coefficients)
// and Si's D = 2C12/C11 = 2·63.9/165.8 (REFERENCES §3, Hall 1967 [M]): −2.006 % vs Si0.7Ge0.3.
const aSiGe = 0.5431 + 0.01992 * 0.3 + 0.002733 * 0.09;
const aPerp = 0.5431 * (1 - ((2 * 63.9) / 165.8) * (aSiGe / 0.5431 - 1));
const EXPECTED_PCT = (aPerp / aSiGe - 1) * 100;

const base: SyntheticMicrographSpec = testMicrograph(EXPECTED_PCT / 100, { noise: 0.05, tilt_deg: 1.3, seed: 5 });

function analyse(spec: Partial<SyntheticMicrographSpec>) {
  const img = syntheticMicrograph({ ...base, ...spec });
  const z = zContrastProfile(img.pixels, 256, 256, { pixelSize_m: PX, growthAxis: "up" });
  if (!z.ok) throw new Error(z.reason);
  const maps = geometricPhase(img.pixels, 256, 256, { growthAxis: "up", frameTilt_deg: z.tilt_deg });
  if (!maps.ok) throw new Error(maps.reason);
  return { img, z, maps };
}

describe("wellCoherence", () => {
  it("a coherent well: in-plane mismatch ≈ 0 and the expected out-of-plane strain", () => {
    expect(EXPECTED_PCT).toBeCloseTo(-2.006, 3); // REFERENCES §4 [D]
    const { z, maps } = analyse({});
    const r = wellCoherence(maps, { well: z.well, tilt_deg: z.tilt_deg, expectedOutOfPlane_pct: EXPECTED_PCT });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.inPlaneMismatch_pct.value)).toBeLessThan(0.1);
    expect(Math.abs(r.outOfPlaneStrain_pct.value - EXPECTED_PCT)).toBeLessThan(0.1);
    expect(r.inPlaneMismatch_pct.uncertainty).toBeGreaterThan(0);
    expect(r.inPlaneMismatch_pct.uncertainty).toBeLessThan(0.1);
    expect(r.coherent).toBe(true);
    expect(r.findings).toEqual([]);
  });

  it("flags a relaxed well (in-plane spacing 1.1 % larger) as not coherent", () => {
    const { z, maps, img } = analyse({ wellInPlaneSpacing_m: 6.4 * PX * 1.011 });
    const r = wellCoherence(maps, { well: z.well, tilt_deg: z.tilt_deg, expectedOutOfPlane_pct: EXPECTED_PCT });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.inPlaneMismatch_pct.value).toBeCloseTo(img.truth.inPlaneMismatch * 100, 1);
    expect(r.coherent).toBe(false);
    expect(r.findings.join(" ")).toMatch(/in-plane/);
  });

  it("flags an out-of-plane strain far from the expected value", () => {
    const { z, maps } = analyse({});
    const r = wellCoherence(maps, { well: z.well, tilt_deg: z.tilt_deg, expectedOutOfPlane_pct: -0.883 });
    expect(r.ok && r.coherent).toBe(false);
  });

  it("cannot judge a reversed band, a too-thin well or a reference outside the image", () => {
    const { maps } = analyse({});
    expect(wellCoherence(maps, { well: { bottom_px: 10, top_px: -10 } })).toMatchObject({ ok: false });
    expect(wellCoherence(maps, { well: { bottom_px: 0, top_px: 8 } })).toMatchObject({ ok: false });
    expect(wellCoherence(maps, { well: { bottom_px: -40, top_px: 40 }, reference: { bottom_px: 500, top_px: 600 } })).toMatchObject({ ok: false });
    const nan = { ...maps, amplitude: new Float32Array(maps.amplitude.length) } as GpaMaps;
    expect(wellCoherence(nan, { well: { bottom_px: -40, top_px: 40 } })).toMatchObject({ ok: false });
  });
});
