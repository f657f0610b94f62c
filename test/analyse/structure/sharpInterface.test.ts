import { describe, expect, it } from "vitest";
import { analyseDepthProfile } from "../../../src/analyse/structure/depthProfile.ts";
import { synthDepthProfile } from "../../../src/synth/depthProfile.ts";

// A sharp edge (τ 0.07–0.10 nm) sampled every 0.05 nm, as an atom-probe profile gives it: the first search from
// τ = span/20 used to collapse to τ → 0 (a step) or fail; the restart from the data's 10–90 % width finds it.
// Truth: the synthetic profile's τ (REFERENCES §10: 10–90 % = 2·ln 9·τ, derived).
describe("sigmoid fit of a sharp, finely sampled interface", () => {
  it.each([0.07, 0.085, 0.1])("recovers τ = %s nm within 10 %", (tau) => {
    const p = synthDepthProfile({
      capThickness: 1,
      barrierThickness: 45,
      wellThickness: 10,
      tauTop: tau,
      tauBottom: 0.35,
      depthMax: 90,
      step: 0.05,
      noise: 0.004,
      seed: 11,
    });
    const r = analyseDepthProfile(p);
    if (!r.ok) throw new Error(r.reason);
    expect(Math.abs(r.top.tau / tau - 1)).toBeLessThan(0.1);
    expect(Math.abs(r.top.width10to90 / (2 * Math.log(9) * tau) - 1)).toBeLessThan(0.1);
    expect(Math.abs(r.bottom.tau / 0.35 - 1)).toBeLessThan(0.05);
  });
});
