/**
 * Biaxial strain of a Si quantum well relative to bulk Si.
 *
 * ε∥ = (a∥ − a_Si)/a_Si with a_Si = 5.431 Å; ε⊥ = −D·ε∥ with D = 2C12/C11 of Si
 * (elastic theory of a (001) layer under biaxial stress; REFERENCES §3–§4).
 * a∥ comes from the well's own asymmetric peak when it is visible
 * (`source: "well-peak"`); otherwise the well is assumed pseudomorphic on the
 * buffer, so a∥(well) = a∥(buffer) (`source: "pseudomorphic-on-buffer"`).
 * Uncertainty: σ(ε∥) = σ(a∥)/a_Si; σ(ε⊥) = D·σ(ε∥). Lengths in m. The strain
 * relations themselves are sige.ts `strainedSiAtParallel` (shared with
 * `strainedSiOnRelaxedSiGe`).
 */
import { A_SI, biaxialRatio, strainedSiAtParallel } from "../../physics/sige.ts";
import type { MeasuredReflection } from "./bufferRelaxation.ts";
import { aParallelFromQ, aPerpendicularFromQ } from "./reciprocalSpace.ts";

export interface WellStrainInput {
  /** The well's asymmetric peak (offset-corrected), if visible. */
  wellAsymmetric?: MeasuredReflection;
  /** The buffer's in-plane lattice constant and its standard error, m. */
  bufferAParallel?: number;
  bufferAParallelStdErr?: number;
}

export type WellStrain =
  | {
      ok: true;
      source: "well-peak" | "pseudomorphic-on-buffer";
      /** In-plane strain, 1 (×100 for %); positive = tensile. */
      epsParallel: number;
      epsParallelStdErr: number;
      /** Out-of-plane strain from elasticity, −D·ε∥, 1. */
      epsPerpendicular: number;
      epsPerpendicularStdErr: number;
      /** In-plane lattice constant of the well, m. */
      aParallel: number;
      /** Expected out-of-plane constant a_Si·(1 + ε⊥), m. */
      aPerpendicularExpected: number;
      /** Out-of-plane constant measured from the well peak, m (well-peak source only). */
      aPerpendicularMeasured?: number;
    }
  | { ok: false; reason: string };

/** In-plane and out-of-plane strain of the Si well (see module comment); `{ok:false, reason}` when neither a well peak nor the buffer a∥ is usable. */
export function wellStrain(input: WellStrainInput): WellStrain {
  const d = biaxialRatio(0);
  const w = input.wellAsymmetric;
  let aPar: number;
  let aParErr: number;
  let source: "well-peak" | "pseudomorphic-on-buffer";
  let aPerpMeasured: number | undefined;
  if (w && Number.isFinite(w.qx) && w.qx !== 0 && Math.hypot(w.hkl[0], w.hkl[1]) > 0) {
    aPar = aParallelFromQ(w.qx, w.hkl);
    aParErr = Number.isFinite(w.qxStdErr) ? (aPar * w.qxStdErr) / Math.abs(w.qx) : 0;
    source = "well-peak";
    if (w.qz > 0 && w.hkl[2] !== 0) aPerpMeasured = aPerpendicularFromQ(w.qz, w.hkl);
  } else if (input.bufferAParallel !== undefined && Number.isFinite(input.bufferAParallel) && input.bufferAParallel > 0) {
    aPar = input.bufferAParallel;
    const e = input.bufferAParallelStdErr ?? 0;
    aParErr = Number.isFinite(e) ? e : 0;
    source = "pseudomorphic-on-buffer";
  } else {
    return { ok: false, reason: "neither a well peak nor the buffer's in-plane lattice constant is available" };
  }
  const strained = strainedSiAtParallel(aPar);
  const epsErr = aParErr / A_SI;
  return {
    ok: true,
    source,
    epsParallel: strained.epsParallel,
    epsParallelStdErr: epsErr,
    epsPerpendicular: strained.epsPerpendicular,
    epsPerpendicularStdErr: d * epsErr,
    aParallel: aPar,
    aPerpendicularExpected: strained.aPerpendicular,
    ...(aPerpMeasured !== undefined ? { aPerpendicularMeasured: aPerpMeasured } : {}),
  };
}
