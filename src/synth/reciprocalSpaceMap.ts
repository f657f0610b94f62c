/**
 * Synthetic reciprocal-space map of a Si(001) / relaxed SiGe buffer / strained
 * Si well stack, on an ω–2θ grid, for the demo data, tests and benchmark.
 *
 * Peak positions follow the physics modules: substrate at a_Si; buffer with
 * Dismukes a_r(x), a∥ = a_Si + R·(a_r − a_Si), a⊥ from biaxial elasticity; well
 * pseudomorphic on the buffer (a∥ = buffer a∥, a⊥ from Si elasticity). Each peak
 * is a Gaussian in rocking (ω − 2θ/2) and radial (2θ) coordinates; counts are
 * Poisson deviates of (background + peaks). Angles in rad, lengths in m.
 */
import { A_SI, biaxialRatio, latticeDismukes, strainedPerpendicular } from "../physics/sige.ts";
import { CU_KALPHA1 } from "../physics/constants.ts";
import type { Miller } from "../model/structureInputs.ts";
import { layerPeakQ, qToAngles, type AnglePoint } from "../analyse/structure/reciprocalSpace.ts";
import { seededPoisson } from "./random.ts";

export interface SynthMapOptions {
  reflection: Miller;
  geFraction: number;
  /** Buffer relaxation, 1. */
  relaxation: number;
  wavelength?: number;
  /** Include the strained-Si well peak (default true). */
  well?: boolean;
  /** Peak heights, counts (defaults 2e5, 2e4, 600). */
  heights?: { substrate?: number; buffer?: number; well?: number };
  /** Gaussian σ along rocking and radial directions, rad (defaults 0.012°, 0.01°; buffer ×3 in rocking). */
  sigmaRocking?: number;
  sigmaRadial?: number;
  /** Flat background, counts (default 5). */
  background?: number;
  /** Instrument offsets added to the true angles, rad (default 0). */
  offset?: { omega?: number; twoTheta?: number };
  /** Grid step, rad (default 0.01°), and half-ranges around the peaks' span (default 0.4°). */
  step?: number;
  margin?: number;
  seed?: number;
}

export interface SynthMap {
  points: { omega: number; twoTheta: number; counts: number }[];
  /** True (offset-free) peak angles, rad. */
  truth: { substrate: AnglePoint; buffer: AnglePoint; well?: AnglePoint };
  /** Buffer lattice constants, m. */
  buffer: { aParallel: number; aPerpendicular: number; aRelaxed: number };
}

const DEG = Math.PI / 180;

/** Generates a seeded synthetic map (see module comment). Grazing-incidence geometry for asymmetric reflections. */
export function synthReciprocalSpaceMap(o: SynthMapOptions): SynthMap {
  const lambda = o.wavelength ?? CU_KALPHA1;
  const aR = latticeDismukes(o.geFraction);
  const aPar = A_SI + o.relaxation * (aR - A_SI);
  const aPerp = strainedPerpendicular(aR, aPar, biaxialRatio(o.geFraction));
  const wellPerp = strainedPerpendicular(A_SI, aPar, biaxialRatio(0));
  const at = (ap: number, az: number) => {
    const q = layerPeakQ(ap, az, o.reflection);
    return qToAngles(q.qx, q.qz, lambda);
  };
  const truth = { substrate: at(A_SI, A_SI), buffer: at(aPar, aPerp), ...(o.well ?? true ? { well: at(aPar, wellPerp) } : {}) };
  const sr = o.sigmaRocking ?? 0.012 * DEG;
  const st = o.sigmaRadial ?? 0.01 * DEG;
  const peaks = [
    { pos: truth.substrate, h: o.heights?.substrate ?? 2e5, sr, st },
    { pos: truth.buffer, h: o.heights?.buffer ?? 2e4, sr: 3 * sr, st: 1.5 * st },
    ...(truth.well ? [{ pos: truth.well, h: o.heights?.well ?? 600, sr: 1.5 * sr, st: 3 * st }] : []),
  ];
  const off = { omega: o.offset?.omega ?? 0, twoTheta: o.offset?.twoTheta ?? 0 };
  const step = o.step ?? 0.01 * DEG;
  const margin = o.margin ?? 0.4 * DEG;
  const all = peaks.map((p) => p.pos);
  const range = (k: "omega" | "twoTheta") => [Math.min(...all.map((p) => p[k])) - margin, Math.max(...all.map((p) => p[k])) + margin];
  const [w0, w1] = range("omega");
  const [t0, t1] = range("twoTheta");
  const poisson = seededPoisson(o.seed ?? 1);
  const bg = o.background ?? 5;
  const points: SynthMap["points"] = [];
  for (let t = t0; t <= t1 + 1e-12; t += step) {
    for (let w = w0; w <= w1 + 1e-12; w += step) {
      let mean = bg;
      for (const p of peaks) {
        const dr = w - t / 2 - (p.pos.omega - p.pos.twoTheta / 2);
        const dt = t - p.pos.twoTheta;
        mean += p.h * Math.exp(-(dr * dr) / (2 * p.sr * p.sr) - (dt * dt) / (2 * p.st * p.st));
      }
      points.push({ omega: w + off.omega, twoTheta: t + off.twoTheta, counts: poisson(mean) });
    }
  }
  return { points, truth, buffer: { aParallel: aPar, aPerpendicular: aPerp, aRelaxed: aR } };
}
