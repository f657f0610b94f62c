/**
 * The Shubnikov–de Haas model fitted to ρxx(B) of a 2D electron gas, and its
 * partial derivatives.
 *
 *   ρxx(B) = ρ_bg(B)·[1 + 4·A·(X/sinh X)·exp(−π/(ω_c τ_q))·cos(2π f/B + φ)]
 *   X = 2π²k_B T m* /(ħ e B),  ω_c = eB/m*,  ρ_bg(B) = Σ_j c_j·t^j,
 *
 * the fundamental of the Lifshitz–Kosevich sum in the 2D form of Coleridge,
 * Phys. Rev. B 44, 3793 (1991) and Ando, Fowler & Stern, Rev. Mod. Phys. 54,
 * 437 (1982) (REFERENCES §7, §14). A = 1 in the ideal form; the spin factor
 * cos(π g m* /(2 m_e)) (≈ 0.83 for g = 2, m* = 0.19 m_e) and density
 * inhomogeneity lower it. t = (B − B_mid)/B_half maps the field window onto
 * [−1, 1] so the background coefficients are well conditioned.
 * exp(−π/(ω_c τ_q)) is written exp(−β/B) with the Dingle field
 * β = π m* /(e τ_q) (T); the fitted parameters are
 * [c_0 … c_k, A, β, f, φ, A₂]. A₂ is the amplitude factor of the second
 * harmonic of the same Lifshitz–Kosevich sum, 4·A₂·(2X/sinh 2X)·e^(−2β/B)·
 * cos(2·(2πf/B + φ)) (harmonic s: X → sX, e^(−β/B) → e^(−sβ/B), phase s·φ;
 * its spin factor cos(2π g m* /(2 m_e)) may be negative, so A₂ has either
 * sign). Left out, a harmonic of a few per cent of the fundamental biases f
 * and τ_q by several per cent over a window of a few periods.
 * Units: B and f in T, ρ in Ω, φ in rad.
 */
import { ELECTRON_MASS, ELEMENTARY_CHARGE } from "../../physics/constants.ts";

/** The fitted window: fields and the thermal factors there. */
export interface ModelLayout {
  order: number;
  /** Centre and half width of the field window, T (t = (B − mid)/half). */
  mid: number;
  half: number;
  /** The fitted fields, T (ascending). */
  field: Float64Array;
  /** X/sinh X and 2X/sinh 2X at each field (1 without a temperature). */
  thermal: Float64Array;
  thermal2: Float64Array;
}

export const amplitudeIndex = (order: number) => order + 1;
export const dingleFieldIndex = (order: number) => order + 2;
export const frequencyIndex = (order: number) => order + 3;
export const phaseIndex = (order: number) => order + 4;
export const harmonicIndex = (order: number) => order + 5;
export const parameterCount = (order: number) => order + 6;

/** Dingle field β = π m* /(e τ_q), T, of a quantum lifetime τ_q (s). */
export function dingleField(quantumLifetime: number, massRatio: number): number {
  return (Math.PI * massRatio * ELECTRON_MASS) / (ELEMENTARY_CHARGE * quantumLifetime);
}

/** Quantum lifetime τ_q = π m* /(e β), s, of a Dingle field β (T). */
export function lifetimeOfDingleField(beta: number, massRatio: number): number {
  return (Math.PI * massRatio * ELECTRON_MASS) / (ELEMENTARY_CHARGE * beta);
}

/** ρ_bg at field index i. */
export function background(p: ArrayLike<number>, L: ModelLayout, i: number): number {
  const t = (L.field[i] - L.mid) / L.half;
  let v = 0;
  let tj = 1;
  for (let j = 0; j <= L.order; j++) {
    v += p[j] * tj;
    tj *= t;
  }
  return v;
}

/** Relative oscillation ρ/ρ_bg − 1 of the model at field index i. */
export function relativeOscillation(p: ArrayLike<number>, L: ModelLayout, i: number): number {
  const k = L.order;
  const b = L.field[i];
  const d = Math.exp(-p[k + 2] / b);
  const th = (2 * Math.PI * p[k + 3]) / b + p[k + 4];
  return 4 * p[k + 1] * L.thermal[i] * d * Math.cos(th) + 4 * p[k + 5] * L.thermal2[i] * d * d * Math.cos(2 * th);
}

/** ρxx of the model at field index i, Ω. */
export function modelValue(p: ArrayLike<number>, L: ModelLayout, i: number): number {
  return background(p, L, i) * (1 + relativeOscillation(p, L, i));
}

/** ∂ρxx/∂p at field index i, written into out (see the module comment for the form). */
export function modelGradient(p: ArrayLike<number>, L: ModelLayout, i: number, out: Float64Array): void {
  const k = L.order;
  const b = L.field[i];
  const t = (b - L.mid) / L.half;
  const d = Math.exp(-p[k + 2] / b);
  const e1 = 4 * L.thermal[i] * d;
  const e2 = 4 * L.thermal2[i] * d * d;
  const th = (2 * Math.PI * p[k + 3]) / b + p[k + 4];
  const c1 = Math.cos(th);
  const s1 = Math.sin(th);
  const c2 = Math.cos(2 * th);
  const s2 = Math.sin(2 * th);
  writeGradient(p, k, b, t, background(p, L, i), e1, e2, c1, s1, c2, s2, out);
}

/**
 * The gradient's entries from the point's pieces (field b, scaled field t, background bg, damping factors e1 and e2,
 * cos/sin of Θ and 2Θ): shared by modelGradient and the remembering evaluator, so both do the same arithmetic.
 */
function writeGradient(
  p: ArrayLike<number>,
  k: number,
  b: number,
  t: number,
  bg: number,
  e1: number,
  e2: number,
  c1: number,
  s1: number,
  c2: number,
  s2: number,
  out: Float64Array,
): void {
  const a1 = p[k + 1];
  const a2 = p[k + 5];
  const osc = 1 + a1 * e1 * c1 + a2 * e2 * c2;
  let tj = 1;
  for (let j = 0; j <= k; j++) {
    out[j] = tj * osc;
    tj *= t;
  }
  out[k + 1] = bg * e1 * c1;
  out[k + 2] = (-bg * (a1 * e1 * c1 + 2 * a2 * e2 * c2)) / b;
  const dTheta = -bg * (a1 * e1 * s1 + 2 * a2 * e2 * s2);
  out[k + 3] = (dTheta * 2 * Math.PI) / b;
  out[k + 4] = dTheta;
  out[k + 5] = bg * e2 * c2;
}

/** The model of one fitted window with its value and gradient, for the least-squares fit (denseLevenbergMarquardt.ts). */
export interface ModelEvaluator {
  /** ρxx at field index i: the same number as modelValue(p, L, i). */
  value: (p: ArrayLike<number>, i: number) => number;
  /** ∂ρxx/∂p at field index i into out: the same numbers as modelGradient(p, L, i, out). */
  gradient: (p: ArrayLike<number>, i: number, out: Float64Array) => void;
  /** Both at once: writes the gradient into out and returns the value. */
  valueAndGradient: (p: ArrayLike<number>, i: number, out: Float64Array) => number;
}

/**
 * modelValue and modelGradient of one window, with the same arithmetic, less
 * recomputation: t of each field is computed once, and each point remembers
 * e^(−β/B), cos and sin of Θ = 2πf/B + φ and of 2Θ for the (β, f, φ) it last
 * saw. A Levenberg–Marquardt step evaluates the model at a trial point and,
 * once the step is accepted, the gradient at that same point, so the
 * gradient's exponential and cosines come from memory (the very numbers
 * Math.exp and Math.cos would return again). Results are bit-identical to
 * modelValue / modelGradient for any order of calls.
 */
export function modelEvaluator(L: ModelLayout): ModelEvaluator {
  const n = L.field.length;
  const k = L.order;
  const field = L.field;
  const thermal = L.thermal;
  const thermal2 = L.thermal2;
  const ts = new Float64Array(n);
  for (let i = 0; i < n; i++) ts[i] = (field[i] - L.mid) / L.half;
  // The (β, f, φ) each point's memory belongs to; NaN equals nothing, so every point starts empty.
  const keyBeta = new Float64Array(n).fill(Number.NaN);
  const keyF = new Float64Array(n).fill(Number.NaN);
  const keyPhi = new Float64Array(n).fill(Number.NaN);
  const dm = new Float64Array(n);
  const thm = new Float64Array(n);
  const c1m = new Float64Array(n);
  const c2m = new Float64Array(n);
  const s1m = new Float64Array(n);
  const s2m = new Float64Array(n);
  /** 1 when s1m, s2m hold the sines for the point's key. */
  const hasSin = new Uint8Array(n);
  const trig = (p: ArrayLike<number>, i: number): void => {
    const beta = p[k + 2];
    const f = p[k + 3];
    const phi = p[k + 4];
    if (keyBeta[i] === beta && keyF[i] === f && keyPhi[i] === phi) return;
    const b = field[i];
    const th = (2 * Math.PI * f) / b + phi;
    dm[i] = Math.exp(-beta / b);
    thm[i] = th;
    c1m[i] = Math.cos(th);
    c2m[i] = Math.cos(2 * th);
    hasSin[i] = 0;
    keyBeta[i] = beta;
    keyF[i] = f;
    keyPhi[i] = phi;
  };
  const sines = (i: number): void => {
    if (hasSin[i]) return;
    const th = thm[i];
    s1m[i] = Math.sin(th);
    s2m[i] = Math.sin(2 * th);
    hasSin[i] = 1;
  };
  /** background(p, L, i) with the stored t. */
  const bgAt = (p: ArrayLike<number>, i: number): number => {
    const t = ts[i];
    let v = 0;
    let tj = 1;
    for (let j = 0; j <= k; j++) {
      v += p[j] * tj;
      tj *= t;
    }
    return v;
  };
  /** modelValue with the point's memory filled. */
  const valueAt = (p: ArrayLike<number>, i: number, bg: number): number => {
    const d = dm[i];
    return bg * (1 + (4 * p[k + 1] * thermal[i] * d * c1m[i] + 4 * p[k + 5] * thermal2[i] * d * d * c2m[i]));
  };
  /** modelGradient with the point's memory (sines included) filled. */
  const gradientOf = (p: ArrayLike<number>, i: number, bg: number, out: Float64Array): void => {
    const b = field[i];
    const t = ts[i];
    const d = dm[i];
    const e1 = 4 * thermal[i] * d;
    const e2 = 4 * thermal2[i] * d * d;
    writeGradient(p, k, b, t, bg, e1, e2, c1m[i], s1m[i], c2m[i], s2m[i], out);
  };
  return {
    value(p, i) {
      trig(p, i);
      return valueAt(p, i, bgAt(p, i));
    },
    gradient(p, i, out) {
      trig(p, i);
      sines(i);
      gradientOf(p, i, bgAt(p, i), out);
    },
    valueAndGradient(p, i, out) {
      trig(p, i);
      sines(i);
      const bg = bgAt(p, i);
      gradientOf(p, i, bg, out);
      return valueAt(p, i, bg);
    },
  };
}
