/**
 * Synthetic field sweeps of a gated 2D electron gas, for the demo data, tests
 * and benchmark. Classical Drude transport: ρxx = 1/(n e μ), R_xy = −B/(n e)
 * (electrons); contact misalignment mixes a fraction of R_xy into R_xx and of
 * R_xx into R_xy (removed again by field symmetrisation); Gaussian noise.
 * An optional `oscillation(B)` multiplies ρxx (quantum oscillations).
 */
import { ELEMENTARY_CHARGE } from "../physics/constants.ts";
import { seededGaussian } from "./random.ts";

export interface HallSweepModel {
  /** Sheet density, m⁻². */
  density: number;
  /** Mobility, m²/(V s). */
  mobility: number;
  geometry: "hall-bar" | "van-der-pauw";
  length_um?: number;
  width_um?: number;
  /** Largest |B|, T, and number of points from −Bmax to +Bmax. */
  maxField: number;
  points: number;
  /** Fraction of R_xy mixed into R_xx, and of R_xx into R_xy. */
  misalignment?: number;
  /** Relative noise (standard deviation / value scale). */
  noise?: number;
  seed: number;
  /** Multiplies ρxx at field B (e.g. Shubnikov–de Haas oscillations). */
  oscillation?: (absB: number) => number;
  /** Optional override: ρxx(B), R_xy(B) from another model (two carriers). */
  override?: (B: number) => { rhoxx: number; rxy: number };
  /** van der Pauw anisotropy R_A/R_B at zero field (default 1.3). */
  vdpRatio?: number;
}

export interface SweepRows {
  header: string[];
  rows: number[][];
}

export function hallSweepRows(m: HallSweepModel): SweepRows {
  const g = seededGaussian(m.seed);
  const rho0 = 1 / (m.density * ELEMENTARY_CHARGE * m.mobility);
  const noise = m.noise ?? 1e-4;
  const mis = m.misalignment ?? 0;
  const rows: number[][] = [];
  for (let i = 0; i < m.points; i++) {
    const B = -m.maxField + (2 * m.maxField * i) / (m.points - 1);
    const base = m.override ? m.override(B) : { rhoxx: rho0, rxy: -B / (m.density * ELEMENTARY_CHARGE) };
    const rhoxx = base.rhoxx * (m.oscillation ? m.oscillation(Math.abs(B)) : 1);
    const rxy = base.rxy;
    const scaleNoise = noise * rho0;
    if (m.geometry === "hall-bar") {
      const rxx = (rhoxx * m.length_um!) / m.width_um!;
      rows.push([round(B), round(rxx + mis * rxy + scaleNoise * g()), round(rxy + mis * rxx + scaleNoise * g())]);
    } else {
      // Split ρ into R_A, R_B with the van der Pauw relation for the chosen anisotropy.
      const ratio = m.vdpRatio ?? 1.3;
      const { ra, rb } = vdpPair(rhoxx, ratio);
      rows.push([round(B), round(ra + scaleNoise * g()), round(rb + scaleNoise * g()), round(rxy + mis * ra + scaleNoise * g())]);
    }
  }
  const header = m.geometry === "hall-bar" ? ["B [T]", "Rxx [ohm]", "Rxy [ohm]"] : ["B [T]", "Ra [ohm]", "Rb [ohm]", "Rxy [ohm]"];
  return { header, rows };
}

/** R_A, R_B with R_A/R_B = ratio satisfying exp(−πR_A/ρ) + exp(−πR_B/ρ) = 1 (bisection on R_B). */
export function vdpPair(rho: number, ratio: number): { ra: number; rb: number } {
  let lo = 0;
  let hi = rho;
  for (let i = 0; i < 200; i++) {
    const rb = (lo + hi) / 2;
    const f = Math.exp((-Math.PI * ratio * rb) / rho) + Math.exp((-Math.PI * rb) / rho) - 1;
    if (f > 0) lo = rb;
    else hi = rb;
  }
  const rb = (lo + hi) / 2;
  return { ra: ratio * rb, rb };
}

function round(v: number): number {
  return Number(v.toPrecision(7));
}

export function formatSweep(meta: Record<string, string>, s: SweepRows, delimiter = ","): string {
  const lines = Object.entries(meta).map(([k, v]) => `# ${k}: ${v}`);
  lines.push(s.header.join(delimiter));
  for (const r of s.rows) lines.push(r.join(delimiter));
  return lines.join("\n") + "\n";
}
