/**
 * Si(1−x)Ge(x) material physics: lattice constants, elastic constants and the
 * biaxial-strain relations used by the X-ray and lattice-image analyses.
 *
 * Units: SI. Lattice constants in m, elastic constants in Pa. The Ge fraction x
 * is dimensionless (0 = Si, 1 = Ge).
 */

/** Si lattice constant used inside alloy fits, m: 5.431 Å (CODATA 2018 value 5.431020511 Å, rounded as in REFERENCES §2). */
export const A_SI = 5.431e-10;
/** Si lattice constant, CODATA 2018 (22.5 °C, vacuum), m: 5.431020511(89) Å. */
export const A_SI_CODATA_2018 = 5.431020511e-10;
/** Ge lattice constant, m: 5.658 Å (Levinshtein, Rumyantsev & Shur handbook, 1996). */
export const A_GE = 5.658e-10;

/** Si elastic constants, Pa: C11 = 165.8, C12 = 63.9 GPa (Hall, Phys. Rev. 161, 756 (1967); McSkimin & Andreatch 1964). */
export const C11_SI = 165.8e9;
export const C12_SI = 63.9e9;
/** Ge elastic constants, Pa: C11 = 128.5, C12 = 48.3 GPa (McSkimin & Andreatch, J. Appl. Phys. 34, 651 (1963)). */
export const C11_GE = 128.5e9;
export const C12_GE = 48.3e9;

// Dismukes quadratic coefficients, nm: a(x) = 0.5431 + 0.01992x + 0.002733x²
// (Dismukes, Ekstrom & Paff, J. Phys. Chem. 68, 3021 (1964), coefficients as
// given by D.J. Paul, Semicond. Sci. Technol. 19, R75 (2004)).
const DISMUKES_A0_NM = 0.5431;
const DISMUKES_A1_NM = 0.01992;
const DISMUKES_A2_NM = 0.002733;

function checkFinite(name: string, v: number): void {
  if (!Number.isFinite(v)) throw new RangeError(`${name} must be a finite number, got ${v}`);
}

/**
 * Relaxed SiGe lattice constant by Dismukes' quadratic law,
 * a(x) = 0.5431 + 0.01992x + 0.002733x² nm (Dismukes, Ekstrom & Paff, J. Phys.
 * Chem. 68, 3021 (1964); coefficients from Paul, Semicond. Sci. Technol. 19, R75
 * (2004)). Returns m. Throws RangeError for a non-finite x.
 */
export function latticeDismukes(x: number): number {
  checkFinite("x", x);
  return (DISMUKES_A0_NM + DISMUKES_A1_NM * x + DISMUKES_A2_NM * x * x) * 1e-9;
}

/**
 * Inverse of Dismukes' law: Ge fraction x for a relaxed lattice constant a (m),
 * x = [−0.01992 + √(0.01992² + 4·0.002733·(a − 0.5431))] / (2·0.002733), a in nm
 * (REFERENCES §2, derived). Throws RangeError when a is non-finite or so far
 * below Si that the quadratic has no real root.
 */
export function geFractionDismukes(a: number): number {
  checkFinite("a", a);
  const aNm = a * 1e9;
  const disc = DISMUKES_A1_NM ** 2 + 4 * DISMUKES_A2_NM * (aNm - DISMUKES_A0_NM);
  if (disc < 0) throw new RangeError(`geFractionDismukes: a = ${aNm} nm is outside Dismukes' law`);
  return (-DISMUKES_A1_NM + Math.sqrt(disc)) / (2 * DISMUKES_A2_NM);
}

/** Vegard's law a(x) = (1−x)·a_Si + x·a_Ge (Vegard, Z. Phys. 5, 17 (1921)), m, with a_Si = 5.431 Å and a_Ge = 5.658 Å. For comparison only. */
export function latticeVegard(x: number): number {
  checkFinite("x", x);
  return (1 - x) * A_SI + x * A_GE;
}

export interface ElasticConstants {
  /** C11, Pa. */
  c11: number;
  /** C12, Pa. */
  c12: number;
}

/**
 * Elastic constants of Si(1−x)Ge(x), linear interpolation between Si
 * (165.8/63.9 GPa, Hall 1967) and Ge (128.5/48.3 GPa, McSkimin & Andreatch
 * 1963): C11 = 165.8 − 37.3x, C12 = 63.9 − 15.6x GPa. Returns Pa.
 */
export function elasticConstants(x: number): ElasticConstants {
  checkFinite("x", x);
  return { c11: C11_SI + (C11_GE - C11_SI) * x, c12: C12_SI + (C12_GE - C12_SI) * x };
}

/** Poisson ratio for (001) biaxial strain, ν = C12/(C11 + C12) (Si 0.27819, x = 0.3: 0.27695; REFERENCES §3). */
export function poissonRatio(x: number): number {
  const { c11, c12 } = elasticConstants(x);
  return c12 / (c11 + c12);
}

/** Biaxial ratio D = 2C12/C11 = 2ν/(1−ν) for (001) layers, so ε⊥ = −D·ε∥ (Si 0.77081, x = 0.3: 0.76606; REFERENCES §3). */
export function biaxialRatio(x: number): number {
  const { c11, c12 } = elasticConstants(x);
  return (2 * c12) / c11;
}

/**
 * Out-of-plane lattice constant of a (001) layer with relaxed constant aRelaxed
 * (m) forced to the in-plane constant aParallel (m) by biaxial stress:
 * a⊥ = a_r·[1 − D·(a∥/a_r − 1)], D = 2C12/C11 (REFERENCES §3). Returns m.
 */
export function strainedPerpendicular(aRelaxed: number, aParallel: number, d: number): number {
  checkFinite("aRelaxed", aRelaxed);
  checkFinite("aParallel", aParallel);
  checkFinite("D", d);
  return aRelaxed * (1 - d * (aParallel / aRelaxed - 1));
}

export interface StrainedSiWell {
  /** In-plane strain relative to bulk Si (a_Si = 5.431 Å), dimensionless. */
  epsParallel: number;
  /** Out-of-plane strain, −D_Si·ε∥, dimensionless. */
  epsPerpendicular: number;
  /** In-plane lattice constant (= the buffer's relaxed constant), m. */
  aParallel: number;
  /** Out-of-plane lattice constant of the coherent Si well, m. */
  aPerpendicular: number;
}

/**
 * A coherent Si layer held at the in-plane lattice constant aParallel (m) by
 * biaxial stress: ε∥ = (a∥ − a_Si)/a_Si with a_Si = 5.431 Å, ε⊥ = −D_Si·ε∥
 * with D_Si = 2C12/C11 of Si, a⊥ = a_Si·(1 + ε⊥) (REFERENCES §3–§4). Strains
 * dimensionless, lengths in m. Does not throw: a non-finite aParallel gives
 * non-finite strains, so callers check their input (wellStrain,
 * strainedSiOnRelaxedSiGe via latticeDismukes).
 */
export function strainedSiAtParallel(aParallel: number): StrainedSiWell {
  const epsParallel = (aParallel - A_SI) / A_SI;
  const epsPerpendicular = -biaxialRatio(0) * epsParallel;
  return { epsParallel, epsPerpendicular, aParallel, aPerpendicular: A_SI * (1 + epsPerpendicular) };
}

/**
 * A coherent Si well on a fully relaxed Si(1−x)Ge(x) buffer: a∥ = a_Dismukes(x),
 * then ε∥, ε⊥ and a⊥ as in strainedSiAtParallel. For x = 0.3:
 * ε∥ = +1.146 %, ε⊥ = −0.883 %, a⊥ = 0.538305 nm (REFERENCES §4, derived).
 */
export function strainedSiOnRelaxedSiGe(x: number): StrainedSiWell {
  return strainedSiAtParallel(latticeDismukes(x));
}
