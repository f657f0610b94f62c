/**
 * SiGe lattice and elastic relations for the synthetic generators, written out
 * from their published forms so the generators share no code with the analysis
 * they are used to check (src/physics/sige.ts holds the analysis' copy; only
 * its constants are imported here). Lengths in m, x = Ge fraction.
 */
import { A_SI, C11_GE, C11_SI, C12_GE, C12_SI } from "../physics/sige.ts";

/**
 * Relaxed Si(1−x)Ge(x) lattice constant, Dismukes' quadratic law
 * a(x) = 0.5431 + 0.01992x + 0.002733x² nm (Dismukes, Ekstrom & Paff, J. Phys.
 * Chem. 68, 3021 (1964); coefficients as given by Paul, Semicond. Sci. Technol.
 * 19, R75 (2004); REFERENCES §2). Returns m.
 */
export function relaxedLattice(x: number): number {
  return (0.5431 + 0.01992 * x + 0.002733 * x * x) * 1e-9;
}

/**
 * D = 2C12/C11 for biaxial strain of a (001) layer, so ε⊥ = −D·ε∥, with C11 and
 * C12 interpolated linearly between Si (Hall 1967) and Ge (McSkimin & Andreatch
 * 1963) (REFERENCES §3).
 */
export function biaxialD(x: number): number {
  const c11 = C11_SI + (C11_GE - C11_SI) * x;
  const c12 = C12_SI + (C12_GE - C12_SI) * x;
  return (2 * c12) / c11;
}

/** a⊥ of a (001) layer of relaxed constant aRelaxed held at in-plane aParallel: a⊥ = a_r·[1 − D·(a∥/a_r − 1)] (REFERENCES §3–§4), m. */
export function perpendicularLattice(aRelaxed: number, aParallel: number, d: number): number {
  return aRelaxed * (1 - d * (aParallel / aRelaxed - 1));
}

export { A_SI };
