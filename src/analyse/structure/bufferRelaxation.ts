/**
 * Composition and relaxation of a SiGe buffer from a symmetric (004) and an
 * asymmetric (224 by default) reciprocal-space peak.
 *
 * a∥ = 2π√(h²+k²)/|Qx| (asymmetric), a⊥ = 2πl/Qz (from the symmetric peak when
 * given, else from the asymmetric one). Relaxed constant of a biaxially strained
 * (001) layer: a_r = (a⊥ + D·a∥)/(1 + D), D = 2C12/C11 linear in x; iterated with
 * x ← Dismukes⁻¹(a_r) until |Δx| < 1e-12. Relaxation against the substrate:
 * R = (a∥ − a_sub)/(a_r − a_sub) (0 = pseudomorphic, 1 = fully relaxed).
 * Method as in Bowen & Tanner (1998) and Fewster (2000); Dismukes, Ekstrom &
 * Paff, J. Phys. Chem. 68, 3021 (1964). REFERENCES §2–§4.
 *
 * Uncertainties: first-order (linear) propagation of the independent peak
 * position standard errors (Qx of the asymmetric peak, Qz of the peak used for
 * a⊥) through the whole iteration, with partial derivatives by central
 * differences: σ_f² = Σ (∂f/∂q_i · σ_i)². Elastic-constant and a(x)-law
 * uncertainties are not included. Lengths in m, Q in m⁻¹ (includes 2π).
 */
import { biaxialRatio, geFractionDismukes, A_SI } from "../../physics/sige.ts";
import type { Miller } from "../../model/structureInputs.ts";
import { aParallelFromQ, aPerpendicularFromQ } from "./reciprocalSpace.ts";

export interface MeasuredReflection {
  hkl: Miller;
  /** m⁻¹ (includes 2π). */
  qx: number;
  qz: number;
  /** Standard errors, m⁻¹ (0 when unknown). */
  qxStdErr: number;
  qzStdErr: number;
}

export interface BufferRelaxationInput {
  /** Asymmetric reflection of the buffer (e.g. 224), offset-corrected. */
  asymmetric: MeasuredReflection;
  /** Symmetric reflection of the buffer (e.g. 004), optional. */
  symmetric?: MeasuredReflection;
  /** Substrate lattice constant, m (default a_Si = 5.431 Å). */
  substrateLattice?: number;
}

export type BufferRelaxation =
  | {
      ok: true;
      /** Ge fraction, 1. */
      geFraction: number;
      geFractionStdErr: number;
      /** Relaxation, 1 (multiply by 100 for %). */
      relaxation: number;
      relaxationStdErr: number;
      /** Lattice constants, m. */
      aParallel: number;
      aParallelStdErr: number;
      aPerpendicular: number;
      aPerpendicularStdErr: number;
      aRelaxed: number;
      aRelaxedStdErr: number;
      /** D = 2C12/C11 at the final x. */
      biaxialRatio: number;
      iterations: number;
      /** Which peak gave a⊥. */
      aPerpendicularFrom: "symmetric" | "asymmetric";
    }
  | { ok: false; reason: string };

interface Core {
  x: number;
  aPar: number;
  aPerp: number;
  aR: number;
  r: number;
  d: number;
  iterations: number;
}

function solve(qx: number, qz: number, hklAsym: Miller, hklPerp: Miller, aSub: number): Core | string {
  const aPar = aParallelFromQ(qx, hklAsym);
  const aPerp = aPerpendicularFromQ(qz, hklPerp);
  let x = 0;
  let aR = aPerp;
  let d = biaxialRatio(0);
  let it = 0;
  for (; it < 200; it++) {
    d = biaxialRatio(x);
    aR = (aPerp + d * aPar) / (1 + d);
    let xNew: number;
    try {
      xNew = geFractionDismukes(aR);
    } catch {
      return `relaxed lattice constant ${(aR * 1e9).toFixed(5)} nm is outside the SiGe range`;
    }
    if (Math.abs(xNew - x) < 1e-12) {
      x = xNew;
      break;
    }
    x = xNew;
  }
  if (it >= 200) return "the composition iteration did not converge";
  if (x < -0.05 || x > 1.05) return `Ge fraction ${x.toFixed(3)} is outside 0–1: the peak is probably not a SiGe layer`;
  const mismatch = aR - aSub;
  if (Math.abs(mismatch) < 1e-6 * aSub) return "the layer is lattice-matched to the substrate, so relaxation is undefined";
  return { x, aPar, aPerp, aR, r: (aPar - aSub) / mismatch, d, iterations: it + 1 };
}

function finite(m: MeasuredReflection): boolean {
  return [m.qx, m.qz, m.qxStdErr, m.qzStdErr, ...m.hkl].every(Number.isFinite);
}

/** Ge fraction and relaxation of a SiGe buffer (see module comment). Returns `{ok:false, reason}` for unusable peaks; never throws for data. */
export function bufferRelaxation(input: BufferRelaxationInput): BufferRelaxation {
  const { asymmetric: asym, symmetric: sym } = input;
  const aSub = input.substrateLattice ?? A_SI;
  if (!asym || !finite(asym)) return { ok: false, reason: "no usable asymmetric buffer peak" };
  if (sym && !finite(sym)) return { ok: false, reason: "the symmetric buffer peak has non-finite values" };
  if (Math.hypot(asym.hkl[0], asym.hkl[1]) === 0) return { ok: false, reason: "the asymmetric reflection has h = k = 0: it cannot give a∥" };
  if (asym.qx === 0) return { ok: false, reason: "the asymmetric peak has Qx = 0" };
  const perp = sym ?? asym;
  if (perp.hkl[2] === 0 || !(perp.qz > 0)) return { ok: false, reason: "the peak for a⊥ needs l ≠ 0 and Qz > 0" };
  const qzStd = perp.qzStdErr;
  const base = solve(asym.qx, perp.qz, asym.hkl, perp.hkl, aSub);
  if (typeof base === "string") return { ok: false, reason: base };
  // Linear propagation: central differences in Qx and Qz.
  const grads = (dq: number, which: "x" | "z") => {
    const hx = which === "x" ? dq : 0;
    const hz = which === "z" ? dq : 0;
    const up = solve(asym.qx + hx, perp.qz + hz, asym.hkl, perp.hkl, aSub);
    const dn = solve(asym.qx - hx, perp.qz - hz, asym.hkl, perp.hkl, aSub);
    if (typeof up === "string" || typeof dn === "string") return undefined;
    const g = (k: keyof Core) => ((up[k] as number) - (dn[k] as number)) / (2 * dq);
    return { x: g("x"), r: g("r"), aPar: g("aPar"), aPerp: g("aPerp"), aR: g("aR") };
  };
  const gx = grads(Math.abs(asym.qx) * 1e-7, "x");
  const gz = grads(perp.qz * 1e-7, "z");
  if (!gx || !gz) return { ok: false, reason: "the result is at the edge of the SiGe range; uncertainties cannot be propagated" };
  const err = (k: "x" | "r" | "aPar" | "aPerp" | "aR") => Math.hypot(gx[k] * asym.qxStdErr, gz[k] * qzStd);
  return {
    ok: true,
    geFraction: base.x,
    geFractionStdErr: err("x"),
    relaxation: base.r,
    relaxationStdErr: err("r"),
    aParallel: base.aPar,
    aParallelStdErr: err("aPar"),
    aPerpendicular: base.aPerp,
    aPerpendicularStdErr: err("aPerp"),
    aRelaxed: base.aR,
    aRelaxedStdErr: err("aR"),
    biaxialRatio: base.d,
    iterations: base.iterations,
    aPerpendicularFrom: sym ? "symmetric" : "asymmetric",
  };
}
