/**
 * Intervalley coupling of a Si/SiGe quantum well in the effective-mass
 * picture: its deterministic part Δ0, set by the shape of the Ge profile, and
 * the spread σ of its alloy-disorder part δ (Friesen et al., Phys. Rev. B 75,
 * 115318 (2007); Losert et al., Phys. Rev. B 108, 125405 (2023); Paquelet
 * Wuetz et al., Nat. Commun. 13, 7730 (2022)).
 *
 *   Δ0 = Σ_l exp(−2i·k0·z_l)·b·x_l·w_l            (complex; z_l = −depth_l)
 *   σ² = (a0²/(8π·a_dot²))·Σ_l b²·x_l(1 − x_l)·w_l²  (variance of Re δ and of Im δ)
 *   a_dot = ħ/√(m_t·E_orb)
 *
 * k0 = 0.82·2π/a0 (the phase advances by 0.82π per (001) layer), w_l the
 * normalised layer weights of |ψ|², b the band offset per unit Ge fraction,
 * E_orb the orbital energy of the dot, m_t the transverse mass. Derivation of
 * σ²: an in-plane Gaussian ground state |φ|² = exp(−r²/a_dot²)/(π·a_dot²), 2/a0²
 * atoms per (001) layer, each Ge with probability x_l independently, gives
 * E|δ|² = Σ_l b²·w_l²·x_l(1 − x_l)·(a0²/2)·∫|φ|⁴ d²r = 2σ² (∫|φ|⁴ = 1/(2π·a_dot²)).
 * Units: depths and a0 in nm, b and the results in J, E_orb in J.
 * Pure; throws RangeError when the arrays differ in length.
 */
import { HBAR } from "../../physics/constants.ts";
import { SI_TRANSVERSE_MASS, VALLEY_K0_FRACTION } from "../../physics/siliconValley.ts";

export interface ValleyCoupling {
  /** Deterministic coupling Δ0, J (real and imaginary parts). */
  re: number;
  im: number;
  /** |Δ0|, J. */
  magnitude: number;
  /** Standard deviation of each component of δ, J. */
  sigma: number;
  /** Dot radius a_dot, nm. */
  dotRadius: number;
}

/** a_dot = ħ/√(m_t·E_orb), in nm, for an orbital energy in J. */
export function dotRadiusNm(orbitalEnergy: number, transverseMass = SI_TRANSVERSE_MASS): number {
  return (HBAR / Math.sqrt(transverseMass * orbitalEnergy)) * 1e9;
}

export function valleyCoupling(
  depthNm: readonly number[],
  ge: readonly number[],
  weight: readonly number[],
  bandOffset: number,
  orbitalEnergy: number,
  latticeNm: number,
): ValleyCoupling {
  if (depthNm.length !== ge.length || ge.length !== weight.length)
    throw new RangeError(`valleyCoupling: ${depthNm.length} depths, ${ge.length} Ge fractions and ${weight.length} weights`);
  const k0 = (VALLEY_K0_FRACTION * 2 * Math.PI) / latticeNm;
  const aDot = dotRadiusNm(orbitalEnergy);
  let re = 0;
  let im = 0;
  let disorder = 0;
  for (let l = 0; l < depthNm.length; l++) {
    // exp(−2i·k0·z) with z = −depth: phase +2·k0·depth.
    const phase = 2 * k0 * depthNm[l];
    const a = bandOffset * ge[l] * weight[l];
    re += a * Math.cos(phase);
    im += a * Math.sin(phase);
    disorder += bandOffset * bandOffset * ge[l] * (1 - ge[l]) * weight[l] * weight[l];
  }
  const sigma = Math.sqrt(((latticeNm * latticeNm) / (8 * Math.PI * aDot * aDot)) * disorder);
  return { re, im, magnitude: Math.hypot(re, im), sigma, dotRadius: aDot };
}
