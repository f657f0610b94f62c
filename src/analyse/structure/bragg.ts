/**
 * Bragg's law for cubic crystals.
 *
 * nλ = 2d·sin θ (W.H. Bragg & W.L. Bragg, Proc. R. Soc. A 88, 428 (1913));
 * d_hkl = a/√(h² + k² + l²) for a cubic lattice. Lengths in m, angles in rad.
 */

import type { Miller } from "../../model/structureInputs.ts";

/** Plane spacing of a cubic lattice, d = a/√(h²+k²+l²), m. Throws RangeError for (000) or a non-positive a. */
export function dSpacing(a: number, hkl: Miller): number {
  const s = Math.hypot(hkl[0], hkl[1], hkl[2]);
  if (!(a > 0) || !Number.isFinite(a)) throw new RangeError(`dSpacing: lattice constant must be > 0, got ${a}`);
  if (!(s > 0)) throw new RangeError("dSpacing: (000) is not a reflection");
  return a / s;
}

/**
 * Bragg angle θ (rad) for spacing d (m) and wavelength λ (m), order n:
 * θ = asin(nλ/2d). Throws RangeError when nλ > 2d (no reflection) or inputs are not positive.
 */
export function braggAngle(d: number, wavelength: number, order = 1): number {
  if (!(d > 0) || !(wavelength > 0)) throw new RangeError("braggAngle: d and λ must be > 0");
  const s = (order * wavelength) / (2 * d);
  if (s > 1) throw new RangeError(`braggAngle: nλ/2d = ${s} > 1, the reflection is not reachable`);
  return Math.asin(s);
}

/** Spacing d = nλ/(2 sin θ), m, from a Bragg angle θ (rad). Throws RangeError for θ outside (0, π/2]. */
export function dFromBraggAngle(theta: number, wavelength: number, order = 1): number {
  if (!(theta > 0 && theta <= Math.PI / 2)) throw new RangeError(`dFromBraggAngle: θ must be in (0, π/2], got ${theta}`);
  return (order * wavelength) / (2 * Math.sin(theta));
}

/** Scattering angle 2θ (rad) of reflection hkl of a cubic crystal with lattice constant a (m). */
export function twoThetaCubic(a: number, hkl: Miller, wavelength: number): number {
  return 2 * braggAngle(dSpacing(a, hkl), wavelength);
}

/** Angle ψ (rad) between the planes hkl and the (001) surface: ψ = atan(√(h²+k²)/l); 224: 35.2644°. */
export function planeTilt(hkl: Miller): number {
  return Math.atan2(Math.hypot(hkl[0], hkl[1]), hkl[2]);
}

export { degToRad, radToDeg } from "../numeric/angle.ts";
