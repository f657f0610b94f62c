/**
 * Angles ↔ reciprocal-space coordinates for coplanar high-resolution X-ray
 * diffraction on a (001) surface (Bowen & Tanner, High Resolution X-ray
 * Diffractometry and Topography (1998); Fewster, X-ray Scattering from
 * Semiconductors (2000)).
 *
 * Convention used throughout waferbook:
 *   Qx = k·[cos ω − cos(2θ − ω)],  Qz = k·[sin ω + sin(2θ − ω)],  k = 2π/λ.
 * Q INCLUDES the factor 2π (|Q| = 2π/d) and is in m⁻¹. ω is the incidence angle
 * to the surface, 2θ the scattering angle, both in rad. With this sign, the
 * grazing-incidence geometry of an asymmetric reflection (ω < θ, e.g. 224 with
 * ω = θ − ψ) gives Qx > 0; grazing exit (ω > θ) gives Qx < 0.
 * A layer with in-plane constant a∥ and out-of-plane a⊥ has its hkl peak at
 * |Qx| = 2π√(h²+k²)/a∥, Qz = 2πl/a⊥.
 */
import type { Miller } from "../../model/structureInputs.ts";

export interface QPoint {
  /** In-plane component, m⁻¹ (includes 2π). */
  qx: number;
  /** Out-of-plane component, m⁻¹ (includes 2π). */
  qz: number;
}

export interface AnglePoint {
  /** Incidence angle ω, rad. */
  omega: number;
  /** Scattering angle 2θ, rad. */
  twoTheta: number;
}

/** (ω, 2θ) in rad → (Qx, Qz) in m⁻¹ for wavelength λ (m). */
export function anglesToQ(omega: number, twoTheta: number, wavelength: number): QPoint {
  const k = (2 * Math.PI) / wavelength;
  return { qx: k * (Math.cos(omega) - Math.cos(twoTheta - omega)), qz: k * (Math.sin(omega) + Math.sin(twoTheta - omega)) };
}

/**
 * (Qx, Qz) in m⁻¹ → (ω, 2θ) in rad: |Q| = 2k·sin θ, and the scattering vector
 * tilt φ = atan2(Qx, Qz) gives ω = θ − φ. Throws RangeError when |Q| > 2k
 * (outside the Ewald limit) or Qz ≤ 0 (not reachable in reflection).
 */
export function qToAngles(qx: number, qz: number, wavelength: number): AnglePoint {
  const k = (2 * Math.PI) / wavelength;
  const q = Math.hypot(qx, qz);
  if (!(qz > 0) || q > 2 * k) throw new RangeError(`qToAngles: (Qx, Qz) = (${qx}, ${qz}) m⁻¹ is not reachable in reflection`);
  const theta = Math.asin(q / (2 * k));
  return { omega: theta - Math.atan2(qx, qz), twoTheta: 2 * theta };
}

/** Peak position of reflection hkl for a layer with in-plane a∥ and out-of-plane a⊥ (m), in the grazing-incidence geometry (Qx ≥ 0). */
export function layerPeakQ(aParallel: number, aPerpendicular: number, hkl: Miller): QPoint {
  return { qx: (2 * Math.PI * Math.hypot(hkl[0], hkl[1])) / aParallel, qz: (2 * Math.PI * hkl[2]) / aPerpendicular };
}

/** In-plane lattice constant a∥ = 2π√(h²+k²)/|Qx| (m) from an asymmetric peak; throws RangeError for a symmetric reflection or Qx = 0. */
export function aParallelFromQ(qx: number, hkl: Miller): number {
  const hk = Math.hypot(hkl[0], hkl[1]);
  if (hk === 0 || qx === 0) throw new RangeError("aParallelFromQ: needs an asymmetric reflection with Qx ≠ 0");
  return (2 * Math.PI * hk) / Math.abs(qx);
}

/** Out-of-plane lattice constant a⊥ = 2πl/Qz (m); throws RangeError for l = 0 or Qz ≤ 0. */
export function aPerpendicularFromQ(qz: number, hkl: Miller): number {
  if (hkl[2] === 0 || !(qz > 0)) throw new RangeError("aPerpendicularFromQ: needs l ≠ 0 and Qz > 0");
  return (2 * Math.PI * hkl[2]) / qz;
}
