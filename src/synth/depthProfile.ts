/**
 * Synthetic composition depth profile of a Si cap / SiGe barrier / Si well /
 * SiGe buffer stack, for the demo data, tests and benchmark.
 *
 * Each interface is a logistic step x0 + Δx/(1 + e^(−(z−z0)/τ)) (REFERENCES §10)
 * with its own τ; Gaussian noise, a linear sloping background and optional
 * contaminant peaks (Gaussian in depth, on a floor, with log-normal noise) are
 * added. Depth in nm, Ge as a fraction, contaminants in cm⁻³. Seeded.
 */
import { seededGaussian } from "./random.ts";

export interface SynthProfileOptions {
  /** Ge fraction of the barriers, 1 (default 0.3). */
  barrierGe?: number;
  /** Thicknesses, nm (defaults: cap 2, top barrier 30, well 8). */
  capThickness?: number;
  barrierThickness?: number;
  wellThickness?: number;
  /** Logistic τ of the interfaces, nm (defaults 0.8, 0.3, 0.3, 0.35). */
  tauCap?: number;
  tauTop?: number;
  tauBottom?: number;
  /** Depth range and step, nm (defaults 0–80, 0.1). */
  depthMax?: number;
  step?: number;
  /** Gaussian noise σ on the Ge fraction (default 0.003). */
  noise?: number;
  /** Sloping background, Ge fraction per nm (default 0). */
  slope?: number;
  /** Contaminant peaks: element → { depth nm, peak cm⁻³, width σ nm, floor cm⁻³ }. */
  contaminants?: Record<string, { depth: number; peak: number; width: number; floor: number }>;
  seed?: number;
}

export interface SynthProfile {
  depth: number[];
  ge: number[];
  contaminants: Record<string, number[]>;
  /** Interface mid-points, nm. */
  truth: { capInterface: number; topInterface: number; bottomInterface: number };
}

const logistic = (z: number, z0: number, tau: number) => 1 / (1 + Math.exp(-(z - z0) / tau));

/** Generates the profile (see module comment). */
export function synthDepthProfile(o: SynthProfileOptions = {}): SynthProfile {
  const x = o.barrierGe ?? 0.3;
  const cap = o.capThickness ?? 2;
  const zTop = cap + (o.barrierThickness ?? 30);
  const zBot = zTop + (o.wellThickness ?? 8);
  const [tc, tt, tb] = [o.tauCap ?? 0.8, o.tauTop ?? 0.3, o.tauBottom ?? 0.35];
  const gauss = seededGaussian(o.seed ?? 1);
  const step = o.step ?? 0.1;
  const depth: number[] = [];
  const ge: number[] = [];
  const cont: Record<string, number[]> = {};
  for (const k of Object.keys(o.contaminants ?? {})) cont[k] = [];
  const nSteps = Math.round((o.depthMax ?? 80) / step);
  for (let i = 0; i <= nSteps; i++) {
    const z = i * step;
    depth.push(z);
    const clean = x * logistic(z, cap, tc) * (1 - logistic(z, zTop, tt)) + x * logistic(z, zBot, tb);
    ge.push(clean + (o.slope ?? 0) * z + (o.noise ?? 0.003) * gauss());
    for (const [k, c] of Object.entries(o.contaminants ?? {})) {
      const mean = c.floor + c.peak * Math.exp(-((z - c.depth) ** 2) / (2 * c.width * c.width));
      cont[k].push(mean * Math.exp(0.05 * gauss()));
    }
  }
  return { depth, ge, contaminants: cont, truth: { capInterface: cap, topInterface: zTop, bottomInterface: zBot } };
}
