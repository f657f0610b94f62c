/**
 * Out-of-plane strain of a coherent well expected from the layer stack, for
 * comparison with the strain measured on a lattice image.
 *
 * Definition: the well (relaxed constant a_w, Dismukes' law for its Ge
 * fraction) is forced to the in-plane constant of a relaxed barrier a_b (the
 * reference lattice of the image, Dismukes' law for the barrier's Ge
 * fraction); its out-of-plane constant is a⊥ = a_w·[1 − D_w·(a_b/a_w − 1)],
 * D_w = 2C12/C11 of the well alloy (REFERENCES §2–§3). The value reported is
 * a⊥/a_b − 1 in per cent: the out-of-plane spacing change of the well relative
 * to the reference. For Si on Si0.7Ge0.3 this is −2.006 % (REFERENCES §4,
 * derived: a⊥ = 0.538305 nm against a = 0.549322 nm).
 *
 * The well is the first layer with role `well`; the reference barrier is the
 * first layer below it (stack order is surface first) with role `barrier` or
 * `buffer` and a Ge fraction.
 * Returns { ok: false, reason } when the stack does not say enough.
 */
import { biaxialRatio, latticeDismukes, strainedPerpendicular } from "../../physics/sige.ts";
import type { Layer } from "../../validate/wafer.ts";

export type ExpectedWellStrain =
  | { ok: true; wellGe: number; barrierGe: number; barrierName: string; outOfPlane_pct: number; aPerpendicular_m: number; aReference_m: number }
  | { ok: false; reason: string };

/** Expected out-of-plane strain (%) of the coherent well vs its relaxed lower barrier; see the module comment. */
export function expectedWellStrain(stack: Layer[]): ExpectedWellStrain {
  const iw = stack.findIndex((l) => l.role === "well");
  if (iw < 0) return { ok: false, reason: "the layer stack names no well layer" };
  const well = stack[iw];
  if (well.ge === undefined) return { ok: false, reason: `the well layer "${well.name}" has no Ge fraction` };
  const below = stack.slice(iw + 1).find((l) => l.ge !== undefined && (l.role === "barrier" || l.role === "buffer"));
  if (!below || below.ge === undefined) return { ok: false, reason: "no barrier or buffer with a Ge fraction below the well in the layer stack" };
  const aw = latticeDismukes(well.ge);
  const ab = latticeDismukes(below.ge);
  const aPerp = strainedPerpendicular(aw, ab, biaxialRatio(well.ge));
  return {
    ok: true,
    wellGe: well.ge,
    barrierGe: below.ge,
    barrierName: below.name,
    outOfPlane_pct: (aPerp / ab - 1) * 100,
    aPerpendicular_m: aPerp,
    aReference_m: ab,
  };
}
