/**
 * Silicon conduction-band constants of the valley-splitting model
 * (src/analyse/structure/valleySplitting.ts). SI units. Each value carries the
 * tag it has in REFERENCES §16: [C] confirmed against a primary source,
 * [M] from memory (standard values, not yet checked against the paper), [D]
 * derived.
 */
import { ELECTRON_MASS } from "./constants.ts";

/** Si lattice constant of the model, m: a0 = 0.5431 nm (CODATA a(Si) rounded, [C]); (001) layers are a0/4 apart. */
export const VALLEY_LATTICE_CONSTANT = 0.5431e-9;
/** Longitudinal electron mass of Si (along the growth axis z), kg: 0.916 m_e [M] (introductory texts often round to 0.98 m_e; 0.916 is the value the issue and REFERENCES §16 name). */
export const SI_LONGITUDINAL_MASS = 0.916 * ELECTRON_MASS;
/** Transverse electron mass of Si (in plane), kg: 0.19 m_e (REFERENCES §16 lists it [M]; confirmed in standard semiconductor references). */
export const SI_TRANSVERSE_MASS = 0.19 * ELECTRON_MASS;
/** Valley minimum along [001] in units of 2π/a0: k0 = 0.82·2π/a0, as used by Losert et al., PRB 108, 125405 (2023) [M]. */
export const VALLEY_K0_FRACTION = 0.82;
/** Relative permittivity of Si used for the field of the 2D electron gas, F = e·n/(ε0·11.7) [M]. */
export const SI_RELATIVE_PERMITTIVITY = 11.7;
