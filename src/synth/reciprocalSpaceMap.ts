/**
 * Synthetic reciprocal-space map of a Si(001) / relaxed SiGe buffer / strained
 * Si well stack, on an ω–2θ grid, for the demo data, tests and benchmark.
 *
 * Peak positions follow the physics modules: substrate at a_Si; buffer with
 * Dismukes a_r(x), a∥ = a_Si + R·(a_r − a_Si), a⊥ from biaxial elasticity; well
 * pseudomorphic on the buffer (a∥ = buffer a∥, a⊥ from Si elasticity). Each peak
 * is a Gaussian in rocking (ω − 2θ/2) and radial (2θ) coordinates; counts are
 * Poisson deviates of (background + peaks). Angles in rad, lengths in m.
 *
 * The lattice relations (./sigeLattice.ts) and the reciprocal-space geometry
 * below are written out from their published forms, independently of
 * the structure analysis, so the X-ray tests do not check the analysis against
 * itself.
 */
import { A_SI, biaxialD, perpendicularLattice, relaxedLattice } from "./sigeLattice.ts";
import { seededPoisson } from "./random.ts";

/** Cu Kα1 wavelength, m: 1.54059292 Å (International Tables for Crystallography Vol. C, §4.2.2; REFERENCES §4). */
const CU_KALPHA1_M = 1.54059292e-10;

/** Miller indices hkl. */
export type Reflection = readonly [number, number, number];

/** Incidence angle ω and scattering angle 2θ, rad. */
export interface PeakAngles {
  omega: number;
  twoTheta: number;
}

/**
 * Angles of reflection hkl of a (001) layer with in-plane a∥ and out-of-plane a⊥
 * (m), grazing incidence. The peak sits at Qx = 2π√(h²+k²)/a∥, Qz = 2πl/a⊥
 * (Q includes 2π); Bragg's law |Q| = 2k·sin θ with k = 2π/λ gives θ, and the
 * tilt ψ = atan2(Qx, Qz) of Q from the surface normal gives ω = θ − ψ
 * (Bowen & Tanner 1998; Fewster 2000; REFERENCES §4).
 */
function peakAngles(aParallel: number, aPerpendicular: number, hkl: Reflection, wavelength: number): PeakAngles {
  const qx = (2 * Math.PI * Math.hypot(hkl[0], hkl[1])) / aParallel;
  const qz = (2 * Math.PI * hkl[2]) / aPerpendicular;
  const k = (2 * Math.PI) / wavelength;
  const theta = Math.asin(Math.hypot(qx, qz) / (2 * k));
  if (!Number.isFinite(theta) || !(qz > 0)) throw new RangeError(`synthReciprocalSpaceMap: reflection ${hkl.join("")} is not reachable in reflection`);
  return { omega: theta - Math.atan2(qx, qz), twoTheta: 2 * theta };
}

export interface SynthMapOptions {
  reflection: Reflection;
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
  truth: { substrate: PeakAngles; buffer: PeakAngles; well?: PeakAngles };
  /** Buffer lattice constants, m. */
  buffer: { aParallel: number; aPerpendicular: number; aRelaxed: number };
}

const DEG = Math.PI / 180;

/** Generates a seeded synthetic map (see module comment). Grazing-incidence geometry for asymmetric reflections. */
export function synthReciprocalSpaceMap(o: SynthMapOptions): SynthMap {
  const lambda = o.wavelength ?? CU_KALPHA1_M;
  const aR = relaxedLattice(o.geFraction);
  const aPar = A_SI + o.relaxation * (aR - A_SI);
  const aPerp = perpendicularLattice(aR, aPar, biaxialD(o.geFraction));
  const wellPerp = perpendicularLattice(A_SI, aPar, biaxialD(0));
  const at = (ap: number, az: number) => peakAngles(ap, az, o.reflection, lambda);
  const truth = { substrate: at(A_SI, A_SI), buffer: at(aPar, aPerp), ...((o.well ?? true) ? { well: at(aPar, wellPerp) } : {}) };
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
