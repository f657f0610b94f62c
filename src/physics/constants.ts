/**
 * Physical constants, in SI units.
 *
 * Exact values are the defining constants of the SI since 2019 (e, h, k_B).
 * Measured values are pinned to CODATA 2018 (Tiesinga, Mohr, Newell & Taylor,
 * Rev. Mod. Phys. 93, 025010 (2021); NIST CODATA web v8.1). Tests pin this edition.
 */

/** Elementary charge, C (exact, SI 2019). */
export const ELEMENTARY_CHARGE = 1.602176634e-19;
/** Planck constant, J s (exact, SI 2019). */
export const PLANCK = 6.62607015e-34;
/** Reduced Planck constant ħ = h/2π, J s (exact, follows from h). */
export const HBAR = PLANCK / (2 * Math.PI);
/** Boltzmann constant, J/K (exact, SI 2019). */
export const BOLTZMANN = 1.380649e-23;
/** Avogadro constant, mol⁻¹ (exact, SI 2019). */
export const AVOGADRO = 6.02214076e23;
/** Electron rest mass, kg (CODATA 2018, measured: 9.1093837015(28)e-31). */
export const ELECTRON_MASS = 9.1093837015e-31;
/** Vacuum permittivity, F/m (CODATA 2018, measured since 2019: 8.8541878128(13)e-12). */
export const VACUUM_PERMITTIVITY = 8.8541878128e-12;
/** von Klitzing constant h/e², Ω (exact, follows from h and e). */
export const VON_KLITZING = PLANCK / (ELEMENTARY_CHARGE * ELEMENTARY_CHARGE);

/** Conversions used at the boundary between SI inside and lab units outside. */
export const PER_M2_TO_PER_CM2 = 1e-4;
export const M2_PER_VS_TO_CM2_PER_VS = 1e4;
export const S_TO_PS = 1e12;
export const M_TO_UM = 1e6;
/** Capacitance per area: 1 F/m² = 100 µF/cm². */
export const F_PER_M2_TO_UF_PER_CM2 = 100;

/** Cu Kα1 wavelength, m: 1.54059292 Å (International Tables for Crystallography Vol. C, §4.2.2, Deslattes et al.). */
export const CU_KALPHA1 = 1.54059292e-10;
