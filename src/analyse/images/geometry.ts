/**
 * Image geometry shared by the lattice-image analyses.
 *
 * Pixel coordinates: x to the right (columns), y downward (rows), pixel
 * centres at integer positions, row-major storage (index = y·width + x).
 *
 * Growth axis: the direction in the image toward the wafer surface
 * (`up` = toward row 0). A tilt θ (radians) rotates that direction in pixel
 * coordinates by the usual matrix [[cos, −sin], [sin, cos]]; because y points
 * down, a positive tilt appears clockwise on screen.
 *
 * Growth coordinate s (pixels): the distance along the tilted growth
 * direction from the image centre, positive toward the surface. Interfaces
 * are lines of constant s; the in-plane direction t is n rotated by +90°.
 */
import type { GrowthAxis } from "../../model/imageInputs.ts";

export interface Vec2 {
  x: number;
  y: number;
}

/** Unit vector toward the surface, rotated by tilt (radians). */
export function growthNormal(axis: GrowthAxis, tilt_rad = 0): Vec2 {
  const base: Record<GrowthAxis, Vec2> = {
    up: { x: 0, y: -1 },
    down: { x: 0, y: 1 },
    left: { x: -1, y: 0 },
    right: { x: 1, y: 0 },
  };
  const b = base[axis];
  const c = Math.cos(tilt_rad);
  const s = Math.sin(tilt_rad);
  return { x: c * b.x - s * b.y, y: s * b.x + c * b.y };
}

/** In-plane unit vector (parallel to the interfaces): the normal rotated by +90°. */
export function inPlaneDirection(axis: GrowthAxis, tilt_rad = 0): Vec2 {
  const n = growthNormal(axis, tilt_rad);
  return { x: -n.y, y: n.x };
}

/** Growth coordinate s (pixels) of pixel (x, y); see the module comment. */
export function growthCoordinate(x: number, y: number, width: number, height: number, axis: GrowthAxis, tilt_rad = 0): number {
  const n = growthNormal(axis, tilt_rad);
  return n.x * (x - (width - 1) / 2) + n.y * (y - (height - 1) / 2);
}

/** Half the extent of the image along the growth normal, pixels (largest |s|). */
export function growthHalfExtent(width: number, height: number, axis: GrowthAxis, tilt_rad = 0): number {
  const n = growthNormal(axis, tilt_rad);
  return (Math.abs(n.x) * (width - 1) + Math.abs(n.y) * (height - 1)) / 2;
}
