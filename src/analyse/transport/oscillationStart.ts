/**
 * Starting values for the Shubnikov–de Haas fit (oscillationModel.ts), by
 * variable projection (Golub & Pereyra, SIAM J. Numer. Anal. 10, 413 (1973)):
 * with the Dingle field β and the frequency f held fixed, the model
 *   ρ ≈ Σ_j c_j t^j + ρ̂_bg(B)·4(X/sinh X)·e^(−β/B)·[α cos(2πf/B) + γ sin(2πf/B)]
 *       + ρ̂_bg(B)·4(2X/sinh 2X)·e^(−2β/B)·[α₂ cos(4πf/B) + γ₂ sin(4πf/B)]
 * is linear in the background coefficients c_j and in α, γ, α₂, γ₂ (amplitude
 * A = √(α²+γ²), phase φ = atan2(−γ, α), A₂ = α₂ cos 2φ − γ₂ sin 2φ), which a
 * linear least-squares solve gives at once. ρ̂_bg is the previous background (first: a polynomial fitted to ρ
 * alone). The two remaining parameters are searched one at a time:
 * f on a grid of ±½ resolution width 1/Δ(1/B) around the spectrum's peak,
 * β on a log grid around a Dingle estimate (a weighted straight line through
 * ln of the one-period amplitudes of (ρ/ρ̂_bg − 1)/(4X/sinh X) against 1/B,
 * as a Dingle plot; Coleridge, PRB 44, 3793 (1991)), each refined by a
 * parabola through the best grid point and its neighbours. Returns the full
 * parameter vector [c_0 … c_k, A, β, f, φ, A₂], or null when no solve succeeds.
 */
import { fixedColumnsSolver, linearLeastSquares, type LinearSolution } from "../numeric/linearLeastSquares.ts";
import type { ModelLayout } from "./oscillationModel.ts";

interface Work {
  L: ModelLayout;
  rho: Float64Array;
  /** t^j columns of the background. */
  powers: Float64Array[];
  /** ρ̂_bg·4·X/sinh X and ρ̂_bg·4·2X/sinh 2X at each point. */
  scale: Float64Array;
  scale2: Float64Array;
  /** Work columns of the oscillation terms (reused by every solve). */
  osc: Float64Array[];
  /** The linear solve with the background columns t^j and ρ fixed (their sums computed once). */
  solve: (extra: Float64Array[]) => LinearSolution | null;
  /** e^(−β/B) at each point for β = expBeta, and cos, sin of 2πf/B for f = trigF (the grids hold one of the two fixed). */
  decay: Float64Array;
  expBeta: number;
  cos: Float64Array;
  sin: Float64Array;
  trigF: number;
}

/** Work arrays of the projection (see Work). */
function work(L: ModelLayout, rho: Float64Array, powers: Float64Array[], scale: Float64Array, scale2: Float64Array): Work {
  const n = rho.length;
  const column = () => new Float64Array(n);
  return {
    L,
    rho,
    powers,
    scale,
    scale2,
    osc: Array.from({ length: 4 }, column),
    solve: fixedColumnsSolver(powers, rho),
    decay: column(),
    expBeta: Number.NaN,
    cos: column(),
    sin: column(),
    trigF: Number.NaN,
  };
}

function powerColumns(L: ModelLayout): Float64Array[] {
  const n = L.field.length;
  return Array.from({ length: L.order + 1 }, (_, j) => {
    const c = new Float64Array(n);
    for (let i = 0; i < n; i++) c[i] = ((L.field[i] - L.mid) / L.half) ** j;
    return c;
  });
}

/** Linear solve at fixed β, f: coefficients [c_0 … c_k, α, γ] and SS_res. */
function project(w: Work, beta: number, f: number) {
  const n = w.rho.length;
  const field = w.L.field;
  const [cos, sin, cos2, sin2] = w.osc;
  // The exponential and the cosines are the same numbers as computed afresh: kept while β (or f) stays.
  const decay = w.decay;
  if (!(w.expBeta === beta)) {
    for (let i = 0; i < n; i++) decay[i] = Math.exp(-beta / field[i]);
    w.expBeta = beta;
  }
  const wc = w.cos;
  const ws = w.sin;
  if (!(w.trigF === f)) {
    for (let i = 0; i < n; i++) {
      const th = (2 * Math.PI * f) / field[i];
      wc[i] = Math.cos(th);
      ws[i] = Math.sin(th);
    }
    w.trigF = f;
  }
  const scale = w.scale;
  const scale2 = w.scale2;
  for (let i = 0; i < n; i++) {
    const d = decay[i];
    const e = scale[i] * d;
    const e2 = scale2[i] * d * d;
    const c = wc[i];
    const s = ws[i];
    cos[i] = e * c;
    sin[i] = e * s;
    cos2[i] = e2 * (c * c - s * s);
    sin2[i] = e2 * 2 * s * c;
  }
  return w.solve(w.osc);
}

function cost(w: Work, beta: number, f: number): number {
  return project(w, beta, f)?.ssRes ?? Number.POSITIVE_INFINITY;
}

/** Minimum of g over the grid xs, refined by a parabola through its neighbours (xs ascending). */
function gridMinimum(xs: number[], g: (x: number) => number): number {
  const v = xs.map(g);
  let k = 0;
  for (let i = 1; i < v.length; i++) if (v[i] < v[k]) k = i;
  if (k === 0 || k === xs.length - 1 || !Number.isFinite(v[k - 1] + v[k + 1])) return xs[k];
  const [x0, x1, x2] = [xs[k - 1], xs[k], xs[k + 1]];
  const [y0, y1, y2] = [v[k - 1], v[k], v[k + 1]];
  const den = (x1 - x0) * (y1 - y2) - (x1 - x2) * (y1 - y0);
  if (den === 0) return x1;
  const x = x1 - (0.5 * ((x1 - x0) ** 2 * (y1 - y2) - (x1 - x2) ** 2 * (y1 - y0))) / den;
  return x > x0 && x < x2 && g(x) < y1 ? x : x1;
}

/**
 * Dingle estimate of β (T) from one-period amplitudes of the relative
 * oscillation divided by 4·X/sinh X: ln(amplitude) = ln A − β/B. Null with
 * fewer than two clear periods or no decay towards low field.
 */
export function dingleEstimate(w: { L: ModelLayout; rho: Float64Array; scale: Float64Array }, f: number): number | null {
  const n = w.rho.length;
  const uMin = 1 / w.L.field[n - 1];
  const groups = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const k = Math.floor((1 / w.L.field[i] - uMin) * f);
    const g = groups.get(k);
    if (g) g.push(i);
    else groups.set(k, [i]);
  }
  const us: number[] = [];
  const ys: number[] = [];
  const ws: number[] = [];
  for (const idx of groups.values()) {
    if (idx.length < 6) continue;
    const m = idx.length;
    const one = new Float64Array(m).fill(1);
    const c = new Float64Array(m);
    const s = new Float64Array(m);
    const z = new Float64Array(m);
    let u = 0;
    idx.forEach((i, q) => {
      const b = w.L.field[i];
      c[q] = Math.cos((2 * Math.PI * f) / b);
      s[q] = Math.sin((2 * Math.PI * f) / b);
      z[q] = w.rho[i] / w.scale[i];
      u += 1 / b / m;
    });
    const sol = linearLeastSquares([one, c, s], z);
    if (!sol) continue;
    const amp = Math.hypot(sol.coef[1], sol.coef[2]);
    const se = Math.sqrt(sol.ssRes / Math.max(1, m - 3) / (m / 2));
    if (amp > 3 * se && amp > 0) {
      us.push(u);
      ys.push(Math.log(amp));
      ws.push((amp / Math.max(se, 1e-300)) ** 2);
    }
  }
  if (us.length < 2) return null;
  let sw = 0,
    su = 0,
    sy = 0;
  us.forEach((u, i) => {
    sw += ws[i];
    su += ws[i] * u;
    sy += ws[i] * ys[i];
  });
  const um = su / sw;
  const ym = sy / sw;
  let num = 0,
    den = 0;
  us.forEach((u, i) => {
    num += ws[i] * (u - um) * (ys[i] - ym);
    den += ws[i] * (u - um) ** 2;
  });
  const beta = den > 0 ? -num / den : Number.NaN;
  return beta > 0 && Number.isFinite(beta) ? beta : null;
}

/** Seed parameters [c_0 … c_k, A, β, f, φ, A₂] for the fit; see the module comment. */
export function seedOscillation(L: ModelLayout, rho: Float64Array, f0: number, span: number): number[] | null {
  const n = rho.length;
  const powers = powerColumns(L);
  const bg = linearLeastSquares(powers, rho);
  if (!bg) return null;
  const scale = new Float64Array(n);
  const scale2 = new Float64Array(n);
  const setScale = (coef: ArrayLike<number>) => {
    for (let i = 0; i < n; i++) {
      let v = 0;
      for (let j = 0; j <= L.order; j++) v += coef[j] * powers[j][i];
      scale[i] = 4 * L.thermal[i] * v;
      scale2[i] = 4 * L.thermal2[i] * v;
    }
  };
  setScale(bg.coef);
  const w = work(L, rho, powers, scale, scale2);
  // Dingle estimate on ρ − ρ̂_bg relative to 4ρ̂_bg·X/sinh X.
  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let v = 0;
    for (let j = 0; j <= L.order; j++) v += bg.coef[j] * powers[j][i];
    resid[i] = rho[i] - v;
  }
  const width = 1 / span;
  let f = gridMinimum(
    Array.from({ length: 7 }, (_, q) => f0 + (q - 3) * 0.16 * width),
    (x) => cost(w, 0, x),
  );
  const d = dingleEstimate({ L, rho: resid, scale }, f);
  const betaGrid = d ? Array.from({ length: 7 }, (_, q) => d * 2 ** ((q - 3) / 2)) : [0, ...Array.from({ length: 12 }, (_, q) => 0.05 * 10 ** (q / 4))];
  let beta = gridMinimum(betaGrid, (x) => cost(w, x, f));
  f = gridMinimum(
    Array.from({ length: 5 }, (_, q) => f + (q - 2) * 0.06 * width),
    (x) => cost(w, beta, x),
  );
  const first = project(w, beta, f);
  if (!first) return null;
  setScale(first.coef);
  const lo = Math.max(beta / 1.5, 1e-3);
  beta = gridMinimum(
    Array.from({ length: 5 }, (_, q) => lo * 1.5 ** (q / 2)),
    (x) => cost(w, x, f),
  );
  const sol = project(w, beta, f);
  if (!sol) return null;
  const c = Array.from(sol.coef.subarray(0, L.order + 1));
  const alpha = sol.coef[L.order + 1];
  const gamma = sol.coef[L.order + 2];
  const phi = Math.atan2(-gamma, alpha);
  const a2 = sol.coef[L.order + 3] * Math.cos(2 * phi) - sol.coef[L.order + 4] * Math.sin(2 * phi);
  return [...c, Math.hypot(alpha, gamma), beta, f, phi, a2];
}
