import { describe, expect, it } from "vitest";
import { analyseStructure } from "../../../src/analyse/structure/index.ts";
import { synthReciprocalSpaceMap } from "../../../src/synth/reciprocalSpaceMap.ts";
import { synthDepthProfile } from "../../../src/synth/depthProfile.ts";
import { CU_KALPHA1 } from "../../../src/physics/constants.ts";
import type { Miller, XrdFile } from "../../../src/model/structureInputs.ts";
import type { Layer } from "../../../src/validate/wafer.ts";
import { DEFAULT_SETTINGS } from "../../../src/validate/settings.ts";

const DEG = Math.PI / 180;
const settings = DEFAULT_SETTINGS;
const stack = (wellNm: number): Layer[] => [
  { name: "cap", role: "cap", ge: 0, thickness_nm: 1 },
  { name: "upper barrier", role: "barrier", ge: 0.3, thickness_nm: 45 },
  { name: "well", role: "well", ge: 0, thickness_nm: wellNm },
  { name: "lower barrier", role: "barrier", ge: 0.3, thickness_nm: 300 },
  { name: "buffer", role: "buffer", ge: 0.3, thickness_nm: 3000 },
  { name: "substrate", role: "substrate", ge: 0, thickness_nm: 725000 },
];

function map(reflection: Miller, x: number, r: number, seed: number): XrdFile {
  const m = synthReciprocalSpaceMap({
    reflection,
    geFraction: x,
    relaxation: r,
    step: 0.02 * DEG,
    margin: 0.16 * DEG,
    sigmaRocking: 0.02 * DEG,
    sigmaRadial: 0.016 * DEG,
    background: 5,
    offset: { omega: 0.012 * DEG, twoTheta: -0.006 * DEG },
    seed,
  });
  return { file: `m${reflection.join("")}.csv`, kind: "map", reflection, wavelength: CU_KALPHA1, wavelengthGiven: false, points: m.points, grid: true };
}

function profile(wellNm: number, tauTop: number) {
  const p = synthDepthProfile({
    capThickness: 1,
    barrierThickness: 45,
    wellThickness: wellNm,
    tauTop,
    tauBottom: 0.35,
    depthMax: 46 + wellNm + 34,
    step: 0.2,
    noise: 0.003,
    slope: -2e-5,
    contaminants: { O: { depth: 46, peak: 5e17, width: 0.8, floor: 2e16 }, N: { depth: 60, peak: 1e17, width: 1, floor: 1e15 } },
    seed: 5,
  });
  return { file: "p.csv", method: "SIMS", depth: p.depth, ge: p.ge, contaminants: p.contaminants };
}

describe("analyseStructure on synthetic inputs", () => {
  // Worked map: Si0.7Ge0.3, R = 0.8 (REFERENCES §2–§4 [D], derived from Dismukes' law and biaxial elasticity); the issue asks x within 0.005, R within 2 points.
  const s = analyseStructure({ xrd: [map([0, 0, 4], 0.3, 0.8, 11), map([2, 2, 4], 0.3, 0.8, 12)], profiles: [profile(10, 0.3)] }, stack(10), settings)!;
  it("recovers the buffer Ge fraction and relaxation from noisy offset maps", () => {
    expect(s.metrics.ge_fraction).toBeGreaterThan(0.295);
    expect(s.metrics.ge_fraction).toBeLessThan(0.305);
    expect(Math.abs(s.metrics.buffer_relaxation - 80)).toBeLessThan(2);
  });
  it("gives the well strain of a Si well pseudomorphic on the R = 0.8 buffer", () => {
    // ε∥ = R·(a(0.3) − a_Si)/a_Si = 0.8 × 1.146 % = 0.917 % (REFERENCES §4 [D], derived from the 1.146 % check value)
    expect(s.metrics.well_strain).toBeCloseTo(0.917, 3);
  });
  it("recovers the interface widths and well thickness of the profile", () => {
    // 10–90 % width = 2·ln 9·τ = 4.394449 τ (REFERENCES §10 [D], derived from the logistic step)
    expect(s.metrics.interface_width_top).toBeCloseTo(4.394449 * 0.3, 1);
    expect(Math.abs(s.metrics.interface_width_bottom / (4.394449 * 0.35) - 1)).toBeLessThan(0.1);
    expect(s.metrics.well_thickness).toBeCloseTo(10, 0);
    expect(s.metrics.barrier_ge_fraction).toBeCloseTo(0.3, 2);
  });
  it("keeps unregistered contaminants out of the metrics but in the peaks", () => {
    expect(s.metrics.peak_O).toBeGreaterThan(3e17);
    expect(s.metrics.peak_N).toBeUndefined();
    expect(s.contaminantPeaks.N).toBeGreaterThan(5e16);
  });
  it("passes a 10 nm well below its critical thickness", () => {
    expect(s.critical.ok && s.critical.beyond).toBe(false);
    expect(s.metrics.critical_thickness_margin).toBeGreaterThan(0);
    expect(s.findings.some((f) => f.severity === "flag")).toBe(false);
  });
  it("flags a 20 nm well beyond its Matthews–Blakeslee critical thickness", () => {
    const t = analyseStructure({ xrd: [map([2, 2, 4], 0.3, 1, 21)] }, stack(20), settings)!;
    // Si on relaxed Si0.7Ge0.3: h_c = 7.8 nm (REFERENCES §5 [D], derived from the 8π single-layer form)
    expect(t.metrics.critical_thickness).toBeGreaterThan(7.3);
    expect(t.metrics.critical_thickness).toBeLessThan(8.3);
    expect(t.metrics.critical_thickness_margin).toBeLessThan(-11);
    expect(t.findings[0].severity).toBe("flag");
    expect(t.findings[0].text).toMatch(/exceeds its Matthews–Blakeslee critical thickness/);
  });
  it("falls back to the design strain without X-ray, and returns nothing without inputs", () => {
    const t = analyseStructure({ profiles: [profile(8, 0.3)] }, stack(8), settings)!;
    expect(t.critical.ok && t.critical.strainSource).toBe("design");
    expect(t.metrics.ge_fraction).toBeUndefined();
    expect(analyseStructure({}, stack(8), settings)).toBeUndefined();
  });
  it("explains a map without a buffer peak instead of throwing", () => {
    const flat: XrdFile = {
      file: "flat.csv",
      kind: "map",
      reflection: [2, 2, 4],
      wavelength: CU_KALPHA1,
      wavelengthGiven: false,
      points: Array.from({ length: 100 }, (_, i) => ({ omega: (40 + (i % 10) * 0.01) * DEG, twoTheta: (88 + Math.floor(i / 10) * 0.01) * DEG, counts: 5 })),
      grid: true,
    };
    const t = analyseStructure({ xrd: [flat] }, stack(10), settings)!;
    expect(t.xrd?.buffer.ok).toBe(false);
    expect(t.findings.some((f) => /Buffer figures not computed/.test(f.text))).toBe(true);
    expect(Object.values(t.metrics).every(Number.isFinite)).toBe(true);
  });
});
