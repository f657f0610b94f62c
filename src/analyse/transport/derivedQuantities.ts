/**
 * Scattering figures derived from a (density, mobility) point of a 2D electron gas.
 *
 * Drude transport lifetime τ_t = μ·m* /e; Fermi wavevector of a 2D gas with
 * g_s·g_v-fold degeneracy k_F = √(4πn/(g_s·g_v)); mean free path l = ħ·k_F·μ/e;
 * Ioffe–Regel parameter k_F·l (localisation near k_F·l ~ 1; Ioffe & Regel,
 * Prog. Semicond. 4, 237 (1960)); Fermi energy E_F = 2πħ²n/(g_s·g_v·m*).
 * Standard 2D formulas, e.g. Ando, Fowler & Stern, RMP 54, 437 (1982).
 * Check (REFERENCES §9, derived): n = 1e11 cm⁻², μ = 1e5 cm²/Vs, m* = 0.19, g = 4 →
 * τ_t = 10.803 ps, k_F = 5.60499e7 m⁻¹, l = 0.368927 µm, k_F·l = 20.678, E_F = 0.62997 meV.
 */
import { ELECTRON_MASS, ELEMENTARY_CHARGE, HBAR } from "../../physics/constants.ts";
import { skipped, type Skipped } from "./outcome.ts";

function positive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be finite and > 0, got ${v}`);
}

/** τ_t = μ·m* /e in s; mobility in m²/(V s), massRatio = m* /m_e. Throws RangeError unless both > 0. */
export function transportLifetime(mobility: number, massRatio: number): number {
  positive("mobility", mobility);
  positive("effective mass", massRatio);
  return (mobility * massRatio * ELECTRON_MASS) / ELEMENTARY_CHARGE;
}

/** k_F = √(4πn/(g_s·g_v)) in m⁻¹; density in m⁻², degeneracy = g_s·g_v. Throws RangeError unless > 0. */
export function fermiWavevector(density: number, degeneracy: number): number {
  positive("density", density);
  positive("degeneracy", degeneracy);
  return Math.sqrt((4 * Math.PI * density) / degeneracy);
}

/** l = ħ·k_F·μ/e in m. Throws RangeError unless density, mobility, degeneracy > 0. */
export function meanFreePath(density: number, mobility: number, degeneracy: number): number {
  positive("mobility", mobility);
  return (HBAR * fermiWavevector(density, degeneracy) * mobility) / ELEMENTARY_CHARGE;
}

/** E_F = 2πħ²n/(g_s·g_v·m*) in J. Throws RangeError unless all > 0. */
export function fermiEnergy(density: number, degeneracy: number, massRatio: number): number {
  positive("density", density);
  positive("degeneracy", degeneracy);
  positive("effective mass", massRatio);
  return (2 * Math.PI * HBAR ** 2 * density) / (degeneracy * massRatio * ELECTRON_MASS);
}

export interface DerivedQuantities {
  ok: true;
  /** Transport (momentum-relaxation) lifetime τ_t, s. */
  transportLifetime: number;
  /** Fermi wavevector k_F, m⁻¹. */
  fermiWavevector: number;
  /** Mean free path l, m. */
  meanFreePath: number;
  /** Ioffe–Regel parameter k_F·l, dimensionless. */
  kfl: number;
  /** Fermi energy E_F, J. */
  fermiEnergy: number;
}

export interface DerivedOptions {
  /** m* /m_e (Si default 0.19). */
  massRatio?: number;
  /** g_s·g_v (Si(001) default 4). */
  degeneracy?: number;
}

/**
 * All derived figures for one point: density in m⁻², mobility in m²/(V s).
 * Returns { ok: false, reason } when density or mobility is missing, non-finite or ≤ 0.
 */
export function derivedQuantities(density: number, mobility: number, options: DerivedOptions = {}): DerivedQuantities | Skipped {
  const m = options.massRatio ?? 0.19;
  const g = options.degeneracy ?? 4;
  if (!(density > 0) || !Number.isFinite(density)) return skipped("no positive, finite density at this point");
  if (!(mobility > 0) || !Number.isFinite(mobility)) return skipped("no positive, finite mobility at this point");
  const l = meanFreePath(density, mobility, g);
  const kF = fermiWavevector(density, g);
  return {
    ok: true,
    transportLifetime: transportLifetime(mobility, m),
    fermiWavevector: kF,
    meanFreePath: l,
    kfl: kF * l,
    fermiEnergy: fermiEnergy(density, g, m),
  };
}
