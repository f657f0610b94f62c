import { describe, expect, it } from "vitest";
import { geometricPhase, gpaFrameTilt, type GpaMaps } from "../../../src/analyse/images/geometricPhase.ts";
import { growthCoordinate } from "../../../src/analyse/images/geometry.ts";
import { syntheticMicrograph, type SyntheticMicrographSpec } from "../../../src/synth/micrograph.ts";
import { testMicrograph } from "../../helpers/micrograph.ts";

// Expected out-of-plane strain of a coherent Si well against a relaxed Si0.7Ge0.3
// reference: derived from Dismukes' law a(x) = 0.5431 + 0.01992x + 0.002733x² nm
// (REFERENCES §2, [C] coefficients) and D = 2C12/C11 of Si = 2·63.9/165.8 (REFERENCES §3,
// Hall 1967 [M]): a⊥ = a_Si·[1 − D·(a_SiGe/a_Si − 1)].
const aSi = 0.5431;
const aSiGe = 0.5431 + 0.01992 * 0.3 + 0.002733 * 0.09;
const D = (2 * 63.9) / 165.8;
const aPerp = aSi * (1 - D * (aSiGe / aSi - 1));
const STEP = aPerp / aSiGe - 1;

const base: SyntheticMicrographSpec = testMicrograph(STEP, { noise: 0.05, seed: 3 });

/** Mean of a map over the band lo < s < hi of the growth coordinate, inside a border. */
function bandMean(m: GpaMaps, map: Float32Array, lo: number, hi: number, tilt_deg: number): number {
  let s = 0;
  let n = 0;
  for (let y = 30; y < m.height - 30; y++) {
    for (let x = 30; x < m.width - 30; x++) {
      const v = growthCoordinate(x, y, m.width, m.height, m.growthAxis, (tilt_deg * Math.PI) / 180);
      if (v > lo && v < hi) {
        s += map[y * m.width + x];
        n++;
      }
    }
  }
  return s / n;
}

describe("the synthetic image holds the strain step the GPA checks expect", () => {
  // REFERENCES §4 [D]: STEP is −2.006 % (a⊥ = 0.538305 nm vs 0.549322 nm). Independently of
  // GPA, the plane positions are read off a noise-free image: each plane is a Gaussian row
  // profile (summed along x), so three log-samples around a maximum give its centre exactly
  // (a parabola in ln); the spacing is the least-squares slope of centre against plane index.
  it("plane spacing in the well centre vs the barriers is 1 + STEP to 1e-4", () => {
    const img = syntheticMicrograph({ ...base, noise: 0, background: 0 });
    const profile = new Float64Array(256);
    for (let y = 0; y < 256; y++) for (let x = 0; x < 256; x++) profile[y] += img.pixels[y * 256 + x];
    const centres: number[] = [];
    for (let y = 1; y < 255; y++) {
      if (!(profile[y] > profile[y - 1] && profile[y] >= profile[y + 1])) continue;
      const [a, b, c] = [Math.log(profile[y - 1]), Math.log(profile[y]), Math.log(profile[y + 1])];
      centres.push(y + (0.5 * (a - c)) / (a - 2 * b + c));
    }
    // Growth coordinate s = 127.5 − y for the "up" axis; the well spans |s| < 40 px with τ = 3 px.
    const spacing = (keep: (s: number) => boolean) => {
      const ys = centres.filter((y) => keep(127.5 - y));
      const idx = ys.map((_, i) => i);
      const mi = idx.reduce((p, q) => p + q, 0) / idx.length;
      const my = ys.reduce((p, q) => p + q, 0) / ys.length;
      return idx.reduce((p, i) => p + (i - mi) * (ys[i] - my), 0) / idx.reduce((p, i) => p + (i - mi) ** 2, 0);
    };
    const well = spacing((s) => Math.abs(s) < 20);
    const lower = spacing((s) => s < -60 && s > -125);
    const upper = spacing((s) => s > 60 && s < 125);
    expect(Math.abs(lower / 7 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(upper / 7 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(well / lower - 1 - STEP)).toBeLessThan(1e-4);
  });
});

describe("geometricPhase", () => {
  // Acceptance criterion of issue 9: a known out-of-plane step and coherent in-plane
  // spacing recovered within 0.1 % strain; a slight rotation does not leak into the strain.
  it.each([0, 1.6, -1.2])("recovers the well's strain within 0.1 percent, lattice rotated by %s degrees", (tilt) => {
    const img = syntheticMicrograph({ ...base, tilt_deg: tilt });
    // Reference: the lower barrier (−120 < s < −60 px).
    const r = geometricPhase(img.pixels, 256, 256, { growthAxis: "up", reference: [40, 170, 216, 220] });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.frameTilt_deg - tilt)).toBeLessThan(0.05);
    const outWell = bandMean(r, r.outOfPlane, -22, 22, tilt);
    const outRef = bandMean(r, r.outOfPlane, -110, -65, tilt);
    const inWell = bandMean(r, r.inPlane, -22, 22, tilt);
    const inRef = bandMean(r, r.inPlane, -110, -65, tilt);
    expect(Math.abs((1 + outWell) / (1 + outRef) - 1 - STEP)).toBeLessThan(1e-3);
    expect(Math.abs((1 + inWell) / (1 + inRef) - 1)).toBeLessThan(1e-3);
    expect(Math.abs(bandMean(r, r.shear, -22, 22, tilt))).toBeLessThan(1e-3);
    expect(Math.abs(outRef)).toBeLessThan(1e-3);
    // The lattice rotation is the same everywhere, so the rotation map is ~0 relative to the reference.
    expect(Math.abs(bandMean(r, r.rotation, -22, 22, tilt))).toBeLessThan(1e-3);
  });

  it("a uniformly rotated lattice without a well shows no strain in either frame", () => {
    const img = syntheticMicrograph({ ...base, wellSpacing_m: base.barrierSpacing_m, wellBrightness: 1, tilt_deg: 2 });
    const r = geometricPhase(img.pixels, 256, 256, { frameTilt_deg: 0 });
    if (!r.ok) throw new Error(r.reason);
    for (const map of [r.exx, r.eyy, r.exy, r.inPlane, r.outOfPlane]) {
      expect(Math.abs(bandMean(r, map, -60, 60, 0))).toBeLessThan(1e-3);
    }
    expect(geometricPhase(img.pixels, 256, 256, { reference: [0, 0, 0, 0] })).toMatchObject({ ok: false });
  });

  it("frame tilt follows the g vector nearest the growth axis", () => {
    const a = (1.5 * Math.PI) / 180;
    const g1 = { x: Math.sin(a) * 0.1, y: -Math.cos(a) * 0.1 }; // growthNormal("up", a)
    const g2 = { x: Math.cos(a) * 0.15, y: Math.sin(a) * 0.15 };
    expect(gpaFrameTilt(g1, g2, "up")).toBeCloseTo(1.5, 6);
    expect(gpaFrameTilt({ x: 0.1, y: 0.1 }, { x: -0.1, y: 0.1 }, "up")).toBe(0);
  });

  it("returns reasons for noise, NaN and tiny images", () => {
    let s = 11;
    // Park and Miller's minimal standard generator (Commun. ACM 31 (1988) 1192)
    const noise = Float32Array.from({ length: 64 * 64 }, () => {
      s = (s * 16807) % 2147483647;
      return s / 2147483647;
    });
    expect(geometricPhase(noise, 64, 64)).toMatchObject({ ok: false });
    expect(geometricPhase(new Float32Array(64 * 64).fill(Number.NaN), 64, 64)).toMatchObject({ ok: false });
    expect(geometricPhase(new Float32Array(16 * 16), 16, 16)).toMatchObject({ ok: false });
  });
});
