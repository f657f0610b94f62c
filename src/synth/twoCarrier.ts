/**
 * Synthetic two-carrier magnetotransport: a quantum-well channel in parallel with
 * a second conducting channel (e.g. a doped or inverted layer), for the demo
 * generator and the parallel-conduction test.
 *
 * Classical Drude two-band model: the conductivity tensors of the channels add,
 * σ_xx,i = n_i e μ_i/(1 + μ_i²B²), σ_xy,i = n_i e μ_i² B/(1 + μ_i²B²), and
 * ρ_xx = σ_xx/(σ_xx² + σ_xy²), ρ_xy = σ_xy/(σ_xx² + σ_xy²) (e.g. Ashcroft &
 * Mermin, Solid State Physics (1976), problem 1.4). Sign convention: ρ_xy > 0 for
 * B > 0, so one channel alone gives ρ_xy = B/(n e). Optional SdH oscillations of
 * the well enter through its ρ_xx (quantumOscillations.ts) before the channels
 * are combined. Units: n in m⁻², μ in m²/(V s), B in T, ρ in Ω.
 */
import { ELEMENTARY_CHARGE } from "../physics/constants.ts";
import { oscillatingResistivity, type OscillationParams } from "./quantumOscillations.ts";

export interface Channel {
  /** Sheet density, m⁻². */
  density: number;
  /** Mobility, m²/(V s). */
  mobility: number;
}

export interface TwoCarrierParams {
  well: Channel;
  /** Parallel channel; omit for a single-carrier sweep. */
  parallel?: Channel;
  /** SdH oscillations of the well (ρ0 is taken from the well's Drude value). */
  oscillations?: Omit<OscillationParams, "rho0" | "density">;
}

export interface TwoCarrierSweep {
  field: number[];
  rhoXX: number[];
  rhoXY: number[];
}

function wellTensor(b: number, p: TwoCarrierParams): [number, number] {
  const { density: n, mobility: mu } = p.well;
  const rho0 = 1 / (n * ELEMENTARY_CHARGE * mu);
  const rxx = p.oscillations ? oscillatingResistivity(b, { ...p.oscillations, rho0, density: n }) : rho0;
  const rxy = b / (n * ELEMENTARY_CHARGE);
  const d = rxx * rxx + rxy * rxy;
  return [rxx / d, rxy / d];
}

/** ρ_xx and ρ_xy (Ω) at one field (T). */
export function twoCarrierResistivity(field: number, p: TwoCarrierParams): { rhoXX: number; rhoXY: number } {
  let [sxx, sxy] = wellTensor(field, p);
  if (p.parallel) {
    const { density: n, mobility: mu } = p.parallel;
    const den = 1 + (mu * field) ** 2;
    sxx += (n * ELEMENTARY_CHARGE * mu) / den;
    sxy += (n * ELEMENTARY_CHARGE * mu * mu * field) / den;
  }
  const d = sxx * sxx + sxy * sxy;
  return { rhoXX: sxx / d, rhoXY: sxy / d };
}

/** A field sweep (fields in T, any sign). */
export function twoCarrierSweep(fields: number[], p: TwoCarrierParams): TwoCarrierSweep {
  const rhoXX: number[] = [];
  const rhoXY: number[] = [];
  for (const b of fields) {
    const r = twoCarrierResistivity(b, p);
    rhoXX.push(r.rhoXX);
    rhoXY.push(r.rhoXY);
  }
  return { field: fields.slice(), rhoXX, rhoXY };
}

/**
 * Low-field Hall density of two Drude channels: n_H = (Σ n_i μ_i)²/Σ n_i μ_i² (m⁻²),
 * the value a Hall slope near B = 0 reports.
 */
export function lowFieldHallDensity(channels: Channel[]): number {
  const s1 = channels.reduce((s, c) => s + c.density * c.mobility, 0);
  const s2 = channels.reduce((s, c) => s + c.density * c.mobility ** 2, 0);
  return (s1 * s1) / s2;
}
