import { describe, expect, it } from "vitest";
import { zContrastProfile } from "../../../src/analyse/images/zContrastProfile.ts";
import { periodAverage } from "../../../src/analyse/images/growthProfile.ts";
import { syntheticMicrograph, type SyntheticMicrographSpec } from "../../../src/synth/micrograph.ts";
import { PX, testMicrograph } from "../../helpers/micrograph.ts";

const base: SyntheticMicrographSpec = testMicrograph(-0.02006, { noise: 0.02, seed: 1 });

function profile(spec: Partial<SyntheticMicrographSpec>, opts: { tilt_deg?: number } = {}) {
  const img = syntheticMicrograph({ ...base, ...spec });
  const axis = img.truth.growthAxis;
  return { img, r: zContrastProfile(img.pixels, img.width, img.height, { pixelSize_m: PX, growthAxis: axis, ...opts }) };
}

describe("zContrastProfile", () => {
  const flat = profile({});
  it("finds the darker well and both interfaces of an untilted image", () => {
    const { r, img } = flat;
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.tilted).toBe(false);
    expect(Math.abs(r.tilt_deg)).toBeLessThan(0.3);
    expect(r.well.bottom_px).toBeCloseTo(img.truth.wellBottom_px, 0);
    expect(r.well.top_px).toBeCloseTo(img.truth.wellTop_px, 0);
    // 10–90 % width = 2·ln 9·τ (REFERENCES §10, derived). The synthetic interface is
    // sampled on discrete planes 7 px apart, which adds ~p²/12 of variance: allow 12 %.
    for (const edge of [r.bottom, r.top]) {
      expect(Math.abs(edge.width10to90_m / img.truth.interfaceWidth10to90_m - 1)).toBeLessThan(0.12);
      expect(edge.width10to90StdErr_m).toBeGreaterThan(0);
    }
  });

  // Acceptance criterion of issue 9: a tilted interface gives the same width within 5 %.
  it.each([1.8, -2.5])("corrects a %f° tilt: widths within 5 % of the untilted image", (tilt) => {
    const { r } = profile({ tilt_deg: tilt });
    expect(r.ok && flat.r.ok).toBe(true);
    if (!r.ok || !flat.r.ok) return;
    expect(r.tilted).toBe(true);
    expect(Math.abs(r.tilt_deg - tilt)).toBeLessThan(0.3);
    expect(Math.abs(r.bottom.width10to90_m / flat.r.bottom.width10to90_m - 1)).toBeLessThan(0.05);
    expect(Math.abs(r.top.width10to90_m / flat.r.top.width10to90_m - 1)).toBeLessThan(0.05);
  });

  it("without the tilt correction the same image looks wider", () => {
    const { r } = profile({ tilt_deg: 2.5 }, { tilt_deg: 0 });
    expect(r.ok && flat.r.ok).toBe(true);
    if (!r.ok || !flat.r.ok) return;
    expect(r.bottom.width10to90_m / flat.r.bottom.width10to90_m).toBeGreaterThan(1.08);
  });

  it("works along every growth axis", () => {
    for (const axis of ["down", "left", "right"] as const) {
      const { r, img } = profile({ growthAxis: axis, wellCentre_m: 10 * PX });
      expect(r.ok).toBe(true);
      if (r.ok) expect(r.well.bottom_px).toBeCloseTo(img.truth.wellBottom_px, 0);
    }
  });

  it("returns reasons for an image without a well, a tilt beyond the limit, NaN and tiny images", () => {
    expect(profile({ wellBrightness: 1 }).r).toMatchObject({ ok: false });
    expect(profile({ tilt_deg: 8 }).r).toMatchObject({ ok: false, reason: expect.stringMatching(/tilted/) });
    const nan = new Float32Array(64 * 64).fill(Number.NaN);
    expect(zContrastProfile(nan, 64, 64, { pixelSize_m: PX, growthAxis: "up" })).toMatchObject({ ok: false });
    expect(zContrastProfile(new Float32Array(64), 8, 8, { pixelSize_m: PX, growthAxis: "up" })).toMatchObject({ ok: false });
    const edge = profile({ wellCentre_m: 120 * PX });
    expect(edge.r).toMatchObject({ ok: false });
  });

  it("a one-period moving average removes a sampled sinusoid of that period", () => {
    const v = Array.from({ length: 60 }, (_, i) => 2 + Math.sin((2 * Math.PI * i) / 6));
    const s = periodAverage(v, 6);
    for (let i = 5; i < 55; i++) expect(s[i]).toBeCloseTo(2, 10);
  });
});
