// The minimum Ge fraction in the well carries a standard uncertainty from the profile's noise (GUM law of
// propagation, JCGM 100 §5.1.2) and a selection offset (the minimum of many noisy means lies below the true
// level; JCGM 101 Monte Carlo): both are checked here against the spread and mean of the minimum over many
// noise realisations of one true profile. The profiles are written out here, independently of
// src/analyse: logistic interfaces, Box–Muller normals from the tests' seeded generator (test/helpers/random.ts).
import { describe, expect, it } from "vitest";
import { analyseDepthProfile } from "../../../src/analyse/structure/depthProfile.ts";
import { gaussian } from "../../helpers/random.ts";

const L = (d: number, c: number, tau: number) => 1 / (1 + Math.exp(-(d - c) / tau));

/** Barrier 0.3 from 2 nm to 32 nm, well to 41 nm, then the buffer; wellGe(d) the true Ge in the well. */
function profile(seed: number, noise: number, wellGe: (d: number) => number) {
  const g = gaussian(seed);
  const depth: number[] = [];
  const ge: number[] = [];
  for (let i = 0; i <= 400; i++) {
    const d = i * 0.2;
    const barrier = 0.3 * L(d, 2, 0.8) * (1 - L(d, 32, 0.3)) + 0.3 * L(d, 41, 0.35);
    const inWell = L(d, 32, 0.3) * (1 - L(d, 41, 0.35));
    depth.push(d);
    ge.push(barrier + inWell * wellGe(d) + noise * g());
  }
  return { depth, ge };
}

/** The realisations with an uncertainty: white noise is taken for correlated (u withheld) in a few per cent only. */
function realisations(n: number, noise: number, wellGe: (d: number) => number) {
  const all = Array.from({ length: n }, (_, r) => {
    const res = analyseDepthProfile(profile(1000 + 7 * r, noise, wellGe));
    if (!res.ok) throw new Error(res.reason);
    return res;
  });
  const withU = all.filter((r) => r.wellGeMinStdErr !== undefined);
  expect(withU.length / n).toBeGreaterThan(0.9);
  return withU;
}
const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
const sd = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + (b - mean(v)) ** 2, 0) / (v.length - 1));

describe("minimum Ge in the well: uncertainty against a Monte Carlo spread", () => {
  it("a minimum that stands out (Ge graded from 0 to 0.1 across the well, noise 0.001): u = s/√3 matches the spread of the minimum", () => {
    const runs = realisations(200, 0.001, (d) => (0.1 * (d - 32)) / 9);
    const mins = runs.map((r) => r.wellGeMin);
    const u = mean(runs.map((r) => r.wellGeMinStdErr!));
    // u = s/√3 with s = 0.001: 5.7735e-4 (by hand); the Monte Carlo spread of 200 minima has a relative standard error of about 5 %.
    expect(Math.abs(u / 5.7735e-4 - 1)).toBeLessThan(0.05);
    expect(Math.abs(sd(mins) / u - 1)).toBeLessThan(0.2);
  });

  const noise = 0.004;
  it("a flat pure-Si well: the minimum lies below 0 by about the offset, spread within u, and within offset + 2u of 0", () => {
    const runs = realisations(200, noise, () => 0);
    const mins = runs.map((r) => r.wellGeMin);
    const u = mean(runs.map((r) => r.wellGeMinStdErr!));
    const off = mean(runs.map((r) => r.wellGeMinOffset!));
    // 15 %: s now comes from the well's ~17 interior second differences (on average 2.5 % above the true 0.004 here, measured
    // separately); the mean shortfall is 0.89 of the offset, which errs on the conservative side.
    expect(Math.abs(-mean(mins) / off - 1)).toBeLessThan(0.15);
    expect(sd(mins)).toBeLessThanOrEqual(u);
    const consistent = runs.filter((r) => r.wellGeMin >= -(r.wellGeMinOffset! + 2 * r.wellGeMinStdErr!) && r.wellGeMin <= 2 * r.wellGeMinStdErr!);
    expect(consistent.length / runs.length).toBeGreaterThan(0.95);
  });
});
