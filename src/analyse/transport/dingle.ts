/**
 * Quantum lifetime τ_q from a Dingle plot of Shubnikov–de Haas amplitudes.
 *
 * The 2D amplitude is Δρ/ρ0 = 4·(X/sinh X)·exp(−π/(ω_c τ_q)) with ω_c = eB/m*
 * (Dingle, Proc. R. Soc. A 211, 517 (1952); Coleridge, Stoner & Fletcher, PRB 39,
 * 1120 (1989); REFERENCES §7). So ln[Δρ/(4ρ0·X/sinh X)] is a straight line in 1/B
 * with slope −π m* / (e τ_q) and intercept 0 for an ideal gas; fitted by least squares.
 * Amplitudes: at each inner local extremum of the background-free trace
 * (uniform in 1/B), half its distance from the mean of its two neighbouring
 * extrema (cancels a residual background linear over one period). Amplitudes below `minRelativeAmplitude` (default
 * 2 %) of the largest are dropped as noise.
 * Dingle ratio τ_t/τ_q (Das Sarma & Stern, PRB 32, 8442 (1985)): ≫ 1 for remote
 * small-angle scattering, ≈ 1 for short-range scattering (REFERENCES §12).
 * The LK form holds for small oscillations (Δρ/ρ0 ≲ 0.5); larger swings, spin
 * splitting or a poor background bias τ_q (synthetic tests: within 10 %).
 * Units: 1/B in T⁻¹, ρ in Ω, T in K, τ in s.
 */
import { ELECTRON_MASS, ELEMENTARY_CHARGE } from "../../physics/constants.ts";
import { linearFit } from "../numeric/linearFit.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";
import { dingleTemperature, thermalFactor } from "./thermalFactor.ts";

export interface DingleOptions {
  /** m* / m_e (default 0.19). */
  massRatio?: number;
  /** Fewest extrema with an amplitude (default 4). */
  minExtrema?: number;
  /** Smallest extremum kept, relative to the largest (default 0.02). */
  minRelativeAmplitude?: number;
}

export interface DingleFit {
  ok: true;
  /** Quantum lifetime τ_q, s. */
  quantumLifetime: number;
  quantumLifetimeStdErr: number;
  /** Dingle temperature T_D = ħ/(2π k_B τ_q), K. */
  dingleTemperature: number;
  /** Slope of the Dingle plot, T. */
  slope: number;
  /** Intercept of the Dingle plot (0 for ideal amplitudes). */
  intercept: number;
  r2: number;
  /** Amplitudes used: 1/B of each extremum (T⁻¹) and its amplitude Δρ (Ω). */
  extrema: { inverseField: number[]; amplitude: number[] };
  /** Dingle-plot ordinate ln[Δρ/(4ρ0·X/sinh X)] at each extremum. */
  dingleOrdinate: number[];
}

/**
 * Oscillation amplitudes at the extrema: the local maxima and minima of the
 * trace are found (sign changes of its first difference); at each inner
 * extremum k the amplitude is |v_k − (v_k−1 + v_k+1)/2|/2, measured from the
 * mean of its two neighbouring opposite extrema. This cancels a residual
 * background that is linear over one period.
 */
export function oscillationAmplitudes(u: number[], value: number[]): { inverseField: number[]; amplitude: number[] } {
  const eu: number[] = [];
  const ev: number[] = [];
  for (let i = 1; i + 1 < value.length; i++) {
    if ((value[i] - value[i - 1]) * (value[i + 1] - value[i]) < 0) {
      eu.push(u[i]);
      ev.push(value[i]);
    }
  }
  const inverseField: number[] = [];
  const amplitude: number[] = [];
  for (let k = 1; k + 1 < eu.length; k++) {
    inverseField.push(eu[k]);
    amplitude.push(Math.abs(ev[k] - (ev[k - 1] + ev[k + 1]) / 2) / 2);
  }
  return { inverseField, amplitude };
}

/**
 * Dingle analysis of a background-free oscillation trace (from shubnikovDeHaas):
 * inverseField ascending in T⁻¹, oscillation Δρ in Ω, rho0 the zero-field ρ_xx in Ω,
 * temperature in K. Returns { ok: false, reason } without a temperature, with
 * too few extrema, or when the amplitude does not decay towards low field.
 */
export function dinglePlot(
  inverseField: number[],
  oscillation: number[],
  rho0: number,
  temperature: number | undefined,
  options: DingleOptions = {},
): DingleFit | Skipped {
  if (temperature === undefined || !(temperature >= 0) || !Number.isFinite(temperature)) {
    return skipped("no measurement temperature, so the thermal factor is unknown");
  }
  if (!(rho0 > 0) || !Number.isFinite(rho0)) return skipped("no positive zero-field resistivity ρ0");
  const m = options.massRatio ?? 0.19;
  const minExtrema = Math.max(3, options.minExtrema ?? 4);
  const all = oscillationAmplitudes(inverseField, oscillation);
  const top = Math.max(0, ...all.amplitude);
  const keep = all.amplitude.map((a, i) => i).filter((i) => all.amplitude[i] >= (options.minRelativeAmplitude ?? 0.02) * top && all.inverseField[i] > 0);
  if (keep.length < minExtrema) return skipped(`only ${keep.length} clear oscillation extrema; the Dingle plot needs ${minExtrema}`);
  const u = keep.map((i) => all.inverseField[i]);
  const amp = keep.map((i) => all.amplitude[i]);
  const y = keep.map((i, k) => Math.log(amp[k] / (4 * rho0 * thermalFactor(temperature, 1 / u[k], m))));
  if (!y.every(Number.isFinite)) return skipped("thermal factor underflows at these fields (temperature too high)");
  const fit = linearFit(u, y);
  if (!(fit.slope < 0)) return skipped("oscillation amplitude does not decay towards low field");
  const tau = (-Math.PI * m * ELECTRON_MASS) / (ELEMENTARY_CHARGE * fit.slope);
  const tauErr = (tau * fit.slopeStdErr) / Math.abs(fit.slope);
  if (!allFinite(tau, tauErr, fit.r2)) return skipped("Dingle fit gave non-finite values");
  return {
    ok: true,
    quantumLifetime: tau,
    quantumLifetimeStdErr: tauErr,
    dingleTemperature: dingleTemperature(tau),
    slope: fit.slope,
    intercept: fit.intercept,
    r2: fit.r2,
    extrema: { inverseField: u, amplitude: amp },
    dingleOrdinate: y,
  };
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
