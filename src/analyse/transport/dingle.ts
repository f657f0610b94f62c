/**
 * Dingle plot of a fitted Shubnikov–de Haas oscillation: a diagnostic view of
 * the same data the fit used (oscillationFit.ts), with the fitted line.
 *
 * The 2D amplitude is Δρ/ρ_bg = 4A·(X/sinh X)·exp(−π/(ω_c τ_q)) (Dingle, Proc.
 * R. Soc. A 211, 517 (1952); Coleridge, PRB 44, 3793 (1991); REFERENCES §7),
 * so ln[Δρ/(4ρ_bg·X/sinh X)] = ln A − β·(1/B) with β = π m* /(e τ_q): a
 * straight line in 1/B. Amplitudes: per whole period of the fitted
 * oscillation, the background-free, thermal-factor-free trace
 * (ρ − ρ_bg)/(4ρ_bg·X/sinh X) is projected by least squares onto cos Θ, sin Θ
 * (Θ = 2πf/B + φ from the fit) and a constant; the amplitude is √(a² + b²) at
 * the period's mean 1/B, kept when above 3 standard errors. This replaces
 * picking extrema, which noise multiplies. τ_q itself comes from the fit;
 * this plot only shows whether the data follow its line.
 * Dingle ratio τ_t/τ_q (Das Sarma & Stern, PRB 32, 8442 (1985)): ≫ 1 for
 * remote small-angle scattering, ≈ 1 for short-range scattering (REFERENCES §12, §14).
 * Units: 1/B in T⁻¹, τ in s.
 */
import { linearLeastSquares } from "../numeric/linearLeastSquares.ts";
import type { OscillationFit } from "./oscillationFit.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";
import { thermalFactor } from "./thermalFactor.ts";
import { fields } from "../bulk.ts";

export interface DinglePlot {
  ok: true;
  /** Mean 1/B of each period (T⁻¹) and its amplitude Δρ/(4ρ_bg·X/sinh X). */
  inverseField: number[];
  amplitude: number[];
  /** ln of each amplitude. */
  ordinate: number[];
  /** The fit's line ln A − β·(1/B): intercept ln A, slope −β (T). */
  line: { intercept: number; slope: number };
}

/** Dingle plot of a fit (see the module comment); Skipped without a temperature or with fewer than two clear periods. */
export function dinglePlot(fit: OscillationFit): DinglePlot | Skipped {
  const T = fit.temperature;
  if (T === undefined) return skipped("no measurement temperature, so the thermal factor is unknown");
  const { mid, half, coefficients } = fit.background;
  const f = fit.frequency.value;
  const phi = fit.phase.value;
  const u = fit.curve.inverseField;
  const uMin = u[0];
  const groups = new Map<number, number[]>();
  u.forEach((x, i) => {
    const k = Math.floor((x - uMin) * f);
    const g = groups.get(k);
    if (g) g.push(i);
    else groups.set(k, [i]);
  });
  const inverseField: number[] = [];
  const amplitude: number[] = [];
  for (const idx of [...groups.values()]) {
    const m = idx.length;
    if (m < 6 || (u[idx[m - 1]] - u[idx[0]]) * f < 0.8) continue;
    const cols = [new Float64Array(m), new Float64Array(m), new Float64Array(m).fill(1)];
    const z = new Float64Array(m);
    let mean = 0;
    idx.forEach((i, q) => {
      const b = 1 / u[i];
      const t = (b - mid) / half;
      const bg = coefficients.reduce((s, c, j) => s + c * t ** j, 0);
      const th = 2 * Math.PI * f * u[i] + phi;
      cols[0][q] = Math.cos(th);
      cols[1][q] = Math.sin(th);
      z[q] = fit.curve.oscillation[i] / (4 * bg * thermalFactor(T, b, fit.massRatio));
      mean += u[i] / m;
    });
    const sol = linearLeastSquares(cols, z);
    if (!sol) continue;
    const a = Math.hypot(sol.coef[0], sol.coef[1]);
    const se = Math.sqrt(sol.ssRes / Math.max(1, m - 3)) * Math.sqrt(2 / m);
    if (a > 3 * se && Number.isFinite(a)) {
      inverseField.push(mean);
      amplitude.push(a);
    }
  }
  if (inverseField.length < 2) return skipped(`only ${inverseField.length} period(s) with an amplitude clear of the noise`);
  const ordinate = amplitude.map((a) => Math.log(a));
  const A = fit.amplitudeFactor.value;
  const line = { intercept: Math.log(A), slope: -fit.dingleField.value };
  if (!allFinite(line.intercept, line.slope)) return skipped("the fitted line is not finite");
  return { ok: true, inverseField, amplitude, ordinate, line };
}

/**
 * Dingle ratio τ_t/τ_q, dimensionless. Throws RangeError unless both lifetimes
 * (s) are finite and > 0.
 */
export function dingleRatio(transportLifetime: number, quantumLifetime: number): number {
  if (!(transportLifetime > 0 && quantumLifetime > 0) || !allFinite(transportLifetime, quantumLifetime)) {
    throw new RangeError(`dingleRatio: lifetimes must be > 0 s (τ_t ${transportLifetime}, τ_q ${quantumLifetime})`);
  }
  return transportLifetime / quantumLifetime;
}

/** The plotted points of a Dingle plot (src/analyse/bulk.ts). */
export const DINGLE_BULK = fields<DinglePlot>("inverseField", "amplitude");
