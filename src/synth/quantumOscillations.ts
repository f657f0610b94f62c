/**
 * Synthetic Shubnikov–de Haas oscillations of a 2D electron gas (for the demo
 * generator and tests).
 *
 * ρ_xx(B) = ρ0·[1 + 4·(X/sinh X)·exp(−π/(ω_c τ_q))·cos(2π f/B − π)], with
 * ω_c = e|B|/m*, X = 2π²k_B T m* / (ħ e |B|) and f = h·n/(g·e)
 * (Lifshitz & Kosevich 1956; Dingle 1952; 2D form of Coleridge, Stoner &
 * Fletcher, PRB 39, 1120 (1989); REFERENCES §7). Units: B in T, ρ in Ω, n in m⁻²,
 * τ_q in s, T in K. At B = 0 it returns ρ0.
 *
 * Written out here from the published form, independently of the analysis
 * (the transport thermal factor), so a mistake there does not cancel
 * in the tests that fit these curves.
 */
import { BOLTZMANN, ELECTRON_MASS, ELEMENTARY_CHARGE, HBAR, PLANCK } from "../physics/constants.ts";

/**
 * Lifshitz–Kosevich thermal damping X/sinh X with X = 2π²k_B T m* /(ħ e B)
 * (Lifshitz & Kosevich 1956; REFERENCES §7). B > 0 in T, T in K, m in m_e.
 * X/sinh X = 2X·e^(−X)/(1 − e^(−2X)), which stays finite for large X; the
 * series 1 − X²/6 below X = 10⁻⁶.
 */
function thermalDamping(temperature: number, b: number, m: number): number {
  const x = (2 * Math.PI ** 2 * BOLTZMANN * temperature * m * ELECTRON_MASS) / (HBAR * ELEMENTARY_CHARGE * b);
  if (x < 1e-6) return 1 - (x * x) / 6;
  const e = Math.exp(-x);
  return (2 * x * e) / (1 - e * e);
}

export interface OscillationParams {
  /** Zero-field resistivity ρ0, Ω. */
  rho0: number;
  /** Sheet density, m⁻². */
  density: number;
  /** Quantum lifetime τ_q, s. */
  quantumLifetime: number;
  /** Temperature, K. */
  temperature: number;
  /** m* / m_e (default 0.19). */
  massRatio?: number;
  /** g_s·g_v (default 4). */
  degeneracy?: number;
}

/** ρ_xx at one field, Ω. */
export function oscillatingResistivity(field: number, p: OscillationParams): number {
  const b = Math.abs(field);
  if (b === 0) return p.rho0;
  const m = p.massRatio ?? 0.19;
  const f = (PLANCK * p.density) / ((p.degeneracy ?? 4) * ELEMENTARY_CHARGE);
  const wcTau = (ELEMENTARY_CHARGE * b * p.quantumLifetime) / (m * ELECTRON_MASS);
  const thermal = thermalDamping(p.temperature, b, m);
  return p.rho0 * (1 + 4 * thermal * Math.exp(-Math.PI / wcTau) * Math.cos((2 * Math.PI * f) / b - Math.PI));
}

/** Fields from bMin to bMax (T) in `count` equal steps. */
export function fieldGrid(bMin: number, bMax: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => bMin + ((bMax - bMin) * i) / (count - 1));
}

/** A sweep: ρ_xx (Ω) at each field (T). */
export function oscillationSweep(fields: number[], p: OscillationParams): { field: number[]; rhoXX: number[] } {
  return { field: fields.slice(), rhoXX: fields.map((b) => oscillatingResistivity(b, p)) };
}
