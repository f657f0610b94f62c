/**
 * Lifshitz–Kosevich thermal damping factor of quantum oscillations.
 *
 * X = 2π²·k_B·T·m* /(ħ·e·B) and the factor is X/sinh X (→ 1 as X → 0).
 * Lifshitz & Kosevich, Sov. Phys. JETP 2, 636 (1956); 2D form as used by
 * Coleridge, Stoner & Fletcher, PRB 39, 1120 (1989). Numerically
 * X = 14.69317·(m* /m_e)·T[K]/B[T] (REFERENCES §7, derived).
 */
import { BOLTZMANN, ELECTRON_MASS, ELEMENTARY_CHARGE, HBAR } from "../../physics/constants.ts";

function checkInputs(temperature: number, field: number, massRatio: number): void {
  if (!(temperature >= 0) || !Number.isFinite(temperature)) {
    throw new RangeError(`thermal factor: temperature must be finite and ≥ 0 K, got ${temperature}`);
  }
  if (!(field > 0) || !Number.isFinite(field)) {
    throw new RangeError(`thermal factor: |B| must be finite and > 0 T, got ${field}`);
  }
  if (!(massRatio > 0) || !Number.isFinite(massRatio)) {
    throw new RangeError(`thermal factor: effective mass must be > 0 m_e, got ${massRatio}`);
  }
}

/**
 * The Lifshitz–Kosevich argument X = 2π²k_B T m* /(ħ e B), dimensionless.
 * temperature in K, field in T (its magnitude is used), massRatio = m* /m_e.
 * Throws RangeError for T < 0, B = 0, m* ≤ 0 or non-finite inputs.
 */
export function thermalArgument(temperature: number, field: number, massRatio: number): number {
  const b = Math.abs(field);
  checkInputs(temperature, b, massRatio);
  return (2 * Math.PI ** 2 * BOLTZMANN * temperature * massRatio * ELECTRON_MASS) / (HBAR * ELEMENTARY_CHARGE * b);
}

/**
 * Lifshitz–Kosevich thermal factor X/sinh X, dimensionless in (0, 1].
 * Check: m* = 0.19 m_e, T = 1 K, B = 1 T → X = 2.79170, X/sinh X = 0.343648
 * (REFERENCES §7, derived). Stable for large X (written as 2X·e^−X/(1 − e^−2X)).
 * Throws RangeError like thermalArgument.
 */
export function thermalFactor(temperature: number, field: number, massRatio: number): number {
  const x = thermalArgument(temperature, field, massRatio);
  if (x < 1e-6) return 1 - (x * x) / 6;
  const e = Math.exp(-x);
  return (2 * x * e) / (1 - e * e);
}

/**
 * Dingle temperature T_D = ħ/(2π k_B τ_q), in K, from the quantum lifetime τ_q in s.
 * Dingle, Proc. R. Soc. A 211, 517 (1952). T_D[K] = 1.215662/τ_q[ps] (REFERENCES §7, derived).
 * Throws RangeError for τ_q ≤ 0.
 */
export function dingleTemperature(quantumLifetime: number): number {
  if (!(quantumLifetime > 0) || !Number.isFinite(quantumLifetime)) {
    throw new RangeError(`dingleTemperature: τ_q must be > 0 s, got ${quantumLifetime}`);
  }
  return HBAR / (2 * Math.PI * BOLTZMANN * quantumLifetime);
}
