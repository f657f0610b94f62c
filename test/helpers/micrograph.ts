import type { SyntheticMicrographSpec } from "../../src/synth/micrograph.ts";

/** Pixel size of the synthetic test micrographs, m. */
export const PX = 0.05e-9;

/**
 * The 256 × 256 synthetic cross-section shared by the image tests: in-plane
 * period 6.4 px, barrier out-of-plane period 7 px, an 80 px well with
 * τ = 3 px interfaces. `outOfPlaneStep` is the well's out-of-plane strain
 * relative to the barrier (fraction); the rest (noise, tilt, seed) each test sets.
 */
export function testMicrograph(outOfPlaneStep: number, rest: Partial<SyntheticMicrographSpec>): SyntheticMicrographSpec {
  return {
    width: 256,
    height: 256,
    pixelSize_m: PX,
    inPlaneSpacing_m: 6.4 * PX,
    barrierSpacing_m: 7 * PX,
    wellSpacing_m: 7 * PX * (1 + outOfPlaneStep),
    wellThickness_m: 80 * PX,
    interfaceTau_m: 3 * PX,
    ...rest,
  };
}
