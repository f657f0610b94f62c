import { describe, expect, it } from "vitest";
import { analyseDepthProfile } from "../../../src/analyse/structure/depthProfile.ts";
import { synthDepthProfile } from "../../../src/synth/depthProfile.ts";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("analyseDepthProfile on synthetic sigmoid profiles (REFERENCES §10: 10–90 % = 2·ln 9·τ = 4.394449·τ, [D])", () => {
  it("recovers τ within 3 % on both interfaces with noise and a sloping background", () => {
    for (const seed of [1, 2, 3]) {
      const p = synthDepthProfile({ tauTop: 0.3, tauBottom: 0.45, wellThickness: 8, noise: 0.004, slope: 0.0008, seed });
      const r = analyseDepthProfile(p);
      if (!r.ok) throw new Error(r.reason);
      expect(rel(r.top.tau, 0.3)).toBeLessThan(0.03);
      expect(rel(r.bottom.tau, 0.45)).toBeLessThan(0.03);
      // Widths against the synthetic truth through the published factors (REFERENCES §10, derived):
      // 10–90 % = 4.394449·τ, and the 4τ width.
      expect(rel(r.top.width10to90, 4.394449 * 0.3)).toBeLessThan(0.03);
      expect(rel(r.bottom.width10to90, 4.394449 * 0.45)).toBeLessThan(0.03);
      expect(rel(r.bottom.width4tau, 4 * 0.45)).toBeLessThan(0.03);
    }
  });
  it("well thickness = distance between interface mid-points; barrier and well Ge levels", () => {
    const p = synthDepthProfile({ wellThickness: 6, barrierGe: 0.32, noise: 0.003, seed: 9 });
    const r = analyseDepthProfile(p);
    if (!r.ok) throw new Error(r.reason);
    expect(r.top.centre).toBeCloseTo(p.truth.topInterface, 1);
    expect(r.bottom.centre).toBeCloseTo(p.truth.bottomInterface, 1);
    expect(r.wellThickness).toBeCloseTo(6, 1);
    expect(r.barrierGeFraction).toBeCloseTo(0.32, 2);
    expect(r.wellGeMin).toBeLessThan(0.01);
    expect(r.wellThicknessStdErr).toBeGreaterThan(0);
  });
  it("a Si cap at the surface is not taken for the well; reversed (deepest-first) input gives the same result", () => {
    const p = synthDepthProfile({ capThickness: 3, seed: 4 });
    const r = analyseDepthProfile(p);
    const rev = analyseDepthProfile({ depth: p.depth.slice().reverse(), ge: p.ge.slice().reverse() });
    if (!r.ok || !rev.ok) throw new Error("failed");
    expect(r.top.centre).toBeGreaterThan(10);
    expect(rev.top.centre).toBeCloseTo(r.top.centre, 10);
  });
  it("a broad interface is reported broad", () => {
    const r = analyseDepthProfile(synthDepthProfile({ tauBottom: 1.2, wellThickness: 12, seed: 6 }));
    if (!r.ok) throw new Error(r.reason);
    expect(rel(r.bottom.tau, 1.2)).toBeLessThan(0.05);
    expect(r.bottom.width10to90).toBeGreaterThan(5);
  });
  it("contaminant peaks inside and near the well (within the stated distance)", () => {
    const p = synthDepthProfile({
      seed: 8,
      contaminants: { O: { depth: 36, peak: 4e18, width: 0.8, floor: 1e17 }, C: { depth: 46, peak: 2e18, width: 0.8, floor: 5e16 } },
    });
    const r = analyseDepthProfile(p, { nearDistance: 8 });
    if (!r.ok) throw new Error(r.reason);
    const o = r.contaminants.find((c) => c.element === "O")!;
    const c = r.contaminants.find((x) => x.element === "C")!;
    expect(rel(o.insidePeak!, 4.1e18)).toBeLessThan(0.2);
    expect(o.insideDepth).toBeCloseTo(36, 0);
    expect(c.insidePeak!).toBeLessThan(1e17);
    expect(rel(c.nearPeak!, 2.05e18)).toBeLessThan(0.2);
    expect(r.nearDistance).toBe(8);
  });
  it("empty, short, NaN, mismatched and featureless profiles give reasons", () => {
    expect(analyseDepthProfile({ depth: [], ge: [] })).toMatchObject({ ok: false, reason: expect.stringMatching(/usable points/) });
    expect(analyseDepthProfile({ depth: [1, 2], ge: [0.3] })).toMatchObject({ ok: false, reason: expect.stringMatching(/length/) });
    const z = Array.from({ length: 100 }, (_, i) => i * 0.5);
    expect(analyseDepthProfile({ depth: z, ge: z.map(() => Number.NaN) }).ok).toBe(false);
    expect(analyseDepthProfile({ depth: z, ge: z.map(() => 0.3) })).toMatchObject({ ok: false, reason: expect.stringMatching(/contrast/) });
    const step = z.map((d) => (d < 20 ? 0 : 0.3));
    expect(analyseDepthProfile({ depth: z, ge: step })).toMatchObject({ ok: false, reason: expect.stringMatching(/bounded/) });
  });
});
