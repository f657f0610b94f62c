/**
 * Quantum lifetime τ_q and SdH frequency f from a least-squares fit of the
 * whole oscillation, not from picked extrema.
 *
 * The symmetrised ρxx between the window's fields is fitted to
 *   ρxx(B) = ρ_bg(B)·[1 + 4·A·(X/sinh X)·exp(−π/(ω_c τ_q))·cos(2π f/B + φ)],
 *   X = 2π²k_B T m* /(ħ e B),  ω_c = eB/m*,
 * with ρ_bg a polynomial in B of order `backgroundOrder` (Coleridge, Phys.
 * Rev. B 44, 3793 (1991); Ando, Fowler & Stern, Rev. Mod. Phys. 54, 437
 * (1982); REFERENCES §14; oscillationModel.ts). Free: the background
 * coefficients, f, τ_q, φ and, by default, the amplitude factor A (1 in the
 * ideal form, ≈ 0.83 with the spin factor cos(π g m* /(2 m_e)) for g = 2,
 * lower with density inhomogeneity), so τ_q follows from how the amplitude
 * decays with 1/B (the Dingle slope) and no assumed prefactor biases it;
 * `amplitudeFactor: <number>` holds A fixed instead.
 * Steps: the window's points thinned to about `maxPoints` steps uniform in
 * 1/B (never averaged, which would damp the fast low-field oscillation); starting values by
 * variable projection from the spectrum's peak and a Dingle estimate
 * (oscillationStart.ts); Levenberg–Marquardt on all parameters with the
 * analytic Jacobian, standard errors from s²(JᵀJ)⁻¹ (denseLevenbergMarquardt.ts).
 * The model carries the second harmonic of the same sum (A₂ free; see
 * oscillationModel.ts), which would otherwise bias f and τ_q.
 * Spin splitting: the one-period second-harmonic content of the relative
 * oscillation is measured along the window (spinSplitting.ts); from the first
 * period where it exceeds ¼ of the fundamental (the maxima of cos θ + h·cos 2θ
 * split for h > ¼) the window is ended below it and the fit repeated, and
 * the result says so.
 * Not determined (reason given): fewer than `minPeriods` periods, R² of the
 * oscillation below `minR2`, a failed fit, or a frequency that ran to the edge
 * of its search range (the spectral peak ± one resolution width 1/Δ(1/B)); τ_q alone also without a
 * temperature or when its relative standard error exceeds `maxLifetimeError`.
 * R² here is 1 − SS_res/Σ(ρ − ρ_bg)²: the share of the background-free
 * variation the oscillation term explains. Units: B, f in T, ρ in Ω, τ in s.
 */
import { denseLevenbergMarquardt } from "../numeric/denseLevenbergMarquardt.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";
import {
  amplitudeIndex,
  background,
  dingleFieldIndex,
  frequencyIndex,
  harmonicIndex,
  lifetimeOfDingleField,
  modelEvaluator,
  modelValue,
  parameterCount,
  phaseIndex,
  type ModelLayout,
} from "./oscillationModel.ts";
import { seedOscillation } from "./oscillationStart.ts";
import { cleanSweep, sdhDensity } from "./shubnikovDeHaas.ts";
import { spinSplittingOnset } from "./spinSplitting.ts";
import { dingleTemperature, thermalFactor } from "./thermalFactor.ts";
import { fields, under } from "../bulk.ts";

export interface OscillationFitOptions {
  minField?: number;
  maxField?: number;
  /** m* /m_e (default 0.19). */
  massRatio?: number;
  /** g_s·g_v (default 4). */
  degeneracy?: number;
  /** Order of the background polynomial in B (default 2, 0–4). */
  backgroundOrder?: number;
  /** Fewest periods in the window (default 3). */
  minPeriods?: number;
  /** Smallest R² of the oscillation (default 0.9). */
  minR2?: number;
  /** Largest relative standard error of τ_q, fraction (default 0.3). */
  maxLifetimeError?: number;
  /** "free" (default) or the fixed amplitude factor A. */
  amplitudeFactor?: number | "free";
  /** About how many field points are fitted (default 200). */
  maxPoints?: number;
}

/** A fitted figure with its standard error (same unit). */
export interface Estimate {
  value: number;
  stdErr: number;
}

export interface LifetimeEstimate extends Estimate {
  ok: true;
  /** Dingle temperature ħ/(2π k_B τ_q), K. */
  dingleTemperature: number;
}

export interface OscillationFit {
  ok: true;
  /** SdH frequency, T. */
  frequency: Estimate;
  /** n_SdH = g·e·f/h, m⁻². */
  density: Estimate;
  /** τ_q in s, or why it is not determined. */
  quantumLifetime: LifetimeEstimate | Skipped;
  /** Dingle field β = π m* /(e τ_q), T (also when τ_q is not determined). */
  dingleField: Estimate;
  /** Amplitude factor A (fixed: stdErr 0). */
  amplitudeFactor: Estimate & { fixed: boolean };
  /** Amplitude factor A₂ of the second harmonic. */
  harmonicFactor: Estimate;
  /** Phase φ, rad in (−π, π]. */
  phase: Estimate;
  /** Background coefficients c_j of Σ c_j·t^j, t = (B − mid)/half; Ω. */
  background: { order: number; mid: number; half: number; coefficients: number[] };
  /** R² of the oscillation (see the module comment). */
  r2: number;
  /** Periods in the fitted window, f·Δ(1/B). */
  periods: number;
  /** Residual standard deviation √(SS_res/(n − p)), Ω, and relative to the mean background. */
  residualNoise: number;
  residualNoiseRelative: number;
  points: number;
  iterations: number;
  /** Field window actually fitted, T. */
  fieldRange: [number, number];
  /** Set when the window was ended below resolved spin splitting. */
  spinSplitting?: { onsetField: number; harmonicRatio: number; note: string };
  temperature?: number;
  massRatio: number;
  /** Fitted data and model, background removed, against 1/B (ascending), Ω; at most 200 points each, for charts. */
  curve: { inverseField: number[]; oscillation: number[] };
  model: { inverseField: number[]; oscillation: number[] };
}

interface Prepared {
  L: ModelLayout;
  rho: Float64Array;
}

/**
 * The points of [lo, hi] from an ascending clean sweep, thinned to about
 * maxPoints steps uniform in 1/B: a point is kept when its 1/B lies at least
 * Δ(1/B)/maxPoints from the last kept one. A sweep uniform in B is densest in
 * 1/B at high field, so the thinning takes points there and keeps every point
 * of the fast low-field oscillation (no averaging, which would damp it).
 */
function prepare(b: number[], r: number[], lo: number, hi: number, order: number, temperature: number | undefined, m: number, maxPoints: number): Prepared {
  const idx: number[] = [];
  for (let i = 0; i < b.length; i++) if (b[i] >= lo && b[i] <= hi) idx.push(i);
  const pick: number[] = [];
  if (idx.length) {
    const gap = (1 / b[idx[0]] - 1 / b[idx[idx.length - 1]]) / maxPoints;
    let last = Number.POSITIVE_INFINITY;
    for (const i of idx) {
      if (last - 1 / b[i] >= gap || i === idx[idx.length - 1]) {
        pick.push(i);
        last = 1 / b[i];
      }
    }
  }
  const count = pick.length;
  const field = new Float64Array(count);
  const rho = new Float64Array(count);
  const thermal = new Float64Array(count).fill(1);
  const thermal2 = new Float64Array(count).fill(1);
  for (let q = 0; q < count; q++) {
    const x = b[pick[q]];
    field[q] = x;
    rho[q] = r[pick[q]];
    if (temperature !== undefined) {
      thermal[q] = thermalFactor(temperature, x, m);
      thermal2[q] = thermalFactor(2 * temperature, x, m);
    }
  }
  const first = field[0] ?? 0;
  const last = field[field.length - 1] ?? 0;
  return { L: { order, mid: (first + last) / 2, half: (last - first) / 2 || 1, field, thermal, thermal2 }, rho };
}

/** At most CURVE_POINTS evenly spaced entries of a chart curve. */
const CURVE_POINTS = 200;
function thin(x: number[], y: number[]): { inverseField: number[]; oscillation: number[] } {
  const step = Math.max(1, x.length / CURVE_POINTS);
  const inverseField: number[] = [];
  const oscillation: number[] = [];
  for (let q = 0; Math.floor(q * step) < x.length; q++) {
    inverseField.push(x[Math.floor(q * step)]);
    oscillation.push(y[Math.floor(q * step)]);
  }
  return { inverseField, oscillation };
}

/** Every other point (the starting values need fewer points than the fit), when there are more than 150. */
function halve(L: ModelLayout, rho: Float64Array): [ModelLayout, Float64Array] {
  if (rho.length <= 150) return [L, rho];
  const pick = (a: Float64Array) => {
    const out = new Float64Array((a.length + 1) >> 1);
    for (let q = 0; q < out.length; q++) out[q] = a[2 * q];
    return out;
  };
  return [{ ...L, field: pick(L.field), thermal: pick(L.thermal), thermal2: pick(L.thermal2) }, pick(rho)];
}

/** The fit of one prepared window; Skipped for a failed or rejected fit. */
function fitWindow(
  P: Prepared,
  f0: number,
  o: Required<Omit<OscillationFitOptions, "minField" | "maxField">>,
  temperature: number | undefined,
): OscillationFit | Skipped {
  const { L, rho } = P;
  const n = rho.length;
  const k = L.order;
  const nParams = parameterCount(k);
  if (n < Math.max(16, nParams + 8)) return skipped(`only ${n} field points in the SdH window; need ${Math.max(16, nParams + 8)}`);
  const span = 1 / L.field[0] - 1 / L.field[n - 1];
  const seed = seedOscillation(...halve(L, rho), f0, span);
  if (!seed) return skipped("the oscillation fit could not be started (collinear background and oscillation)");
  const fixedA = o.amplitudeFactor !== "free";
  if (fixedA) seed[amplitudeIndex(k)] = o.amplitudeFactor as number;
  const min = seed.map((_, i) => (i === dingleFieldIndex(k) ? 0 : i === frequencyIndex(k) ? f0 - 1 / span : -Infinity));
  const max = seed.map((_, i) => (i === frequencyIndex(k) ? f0 + 1 / span : Infinity));
  const model = modelEvaluator(L);
  const fit = denseLevenbergMarquardt({ n, y: rho, ...model }, seed, {
    min,
    max,
    fixed: fixedA ? [amplitudeIndex(k)] : [],
    maxIterations: 30,
  });
  if (!fit) return skipped("the oscillation fit failed (singular Jacobian)");
  const p = fit.params.slice();
  const se = fit.stdErr;
  if (p[amplitudeIndex(k)] < 0) {
    // A·cos(Θ) = (−A)·cos(Θ + π); the harmonic's cos 2Θ is unchanged.
    p[amplitudeIndex(k)] = -p[amplitudeIndex(k)];
    p[phaseIndex(k)] += Math.PI;
  }
  p[phaseIndex(k)] = Math.PI - ((((Math.PI - p[phaseIndex(k)]) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI));
  let ssOsc = 0;
  let bgSum = 0;
  const u: number[] = [];
  const data: number[] = [];
  const fitted: number[] = [];
  for (let i = n - 1; i >= 0; i--) {
    const bg = background(p, L, i);
    bgSum += bg;
    ssOsc += (rho[i] - bg) ** 2;
    u.push(1 / L.field[i]);
    data.push(rho[i] - bg);
    fitted.push(modelValue(p, L, i) - bg);
  }
  const r2 = ssOsc > 0 ? 1 - fit.ssRes / ssOsc : 0;
  const free = nParams - (fixedA ? 1 : 0);
  const noise = Math.sqrt(fit.ssRes / Math.max(1, n - free));
  const freq = p[frequencyIndex(k)];
  const beta = p[dingleFieldIndex(k)];
  const periods = freq * span;
  if (!allFinite(freq, beta, r2, noise, se[frequencyIndex(k)], se[dingleFieldIndex(k)])) return skipped("the oscillation fit gave non-finite values");
  if (Math.abs(freq - f0) >= 0.999 / span)
    return skipped(
      `the fitted frequency ran to the edge of its search range (${(f0 - 1 / span).toPrecision(3)}–${(f0 + 1 / span).toPrecision(3)} T around the spectral peak): no consistent oscillation`,
    );
  if (periods < o.minPeriods)
    return skipped(`only ${periods.toFixed(1)} oscillation periods between ${L.field[0]} T and ${L.field[n - 1]} T; need ${o.minPeriods}`);
  if (r2 < o.minR2)
    return skipped(`the oscillation fit explains too little of the signal (R² ${r2.toFixed(3)} < ${o.minR2}): no clear Lifshitz–Kosevich oscillation`);
  const g = o.degeneracy;
  const betaSe = se[dingleFieldIndex(k)];
  let lifetime: LifetimeEstimate | Skipped;
  if (temperature === undefined) lifetime = skipped("no measurement temperature, so the thermal factor is unknown");
  else if (!(beta > 0)) lifetime = skipped("the amplitude does not decay towards low field (τ_q unbounded)");
  else {
    const tau = lifetimeOfDingleField(beta, o.massRatio);
    const rel = betaSe / beta;
    lifetime =
      rel > o.maxLifetimeError
        ? skipped(
            `τ_q = ${(tau * 1e12).toPrecision(3)} ps is too uncertain: relative standard error ${(100 * rel).toFixed(0)} % above the ${(100 * o.maxLifetimeError).toFixed(0)} % limit`,
          )
        : { ok: true, value: tau, stdErr: tau * rel, dingleTemperature: dingleTemperature(tau) };
  }
  return {
    ok: true,
    frequency: { value: freq, stdErr: se[frequencyIndex(k)] },
    density: { value: sdhDensity(freq, g), stdErr: sdhDensity(se[frequencyIndex(k)], g) },
    quantumLifetime: lifetime,
    dingleField: { value: beta, stdErr: betaSe },
    amplitudeFactor: { value: p[amplitudeIndex(k)], stdErr: se[amplitudeIndex(k)], fixed: fixedA },
    harmonicFactor: { value: p[harmonicIndex(k)], stdErr: se[harmonicIndex(k)] },
    phase: { value: p[phaseIndex(k)], stdErr: se[phaseIndex(k)] },
    background: { order: k, mid: L.mid, half: L.half, coefficients: p.slice(0, k + 1) },
    r2,
    periods,
    residualNoise: noise,
    residualNoiseRelative: noise / Math.abs(bgSum / n),
    points: n,
    iterations: fit.iterations,
    fieldRange: [L.field[0], L.field[n - 1]],
    temperature,
    massRatio: o.massRatio,
    curve: thin(u, data),
    model: thin(u, fitted),
  };
}

/**
 * Fit of one symmetrised sweep (field in T, any sign and order; rhoXX in Ω)
 * starting from the spectrum's frequency `seedFrequency` (T). temperature in
 * K (undefined: no τ_q). Throws RangeError when the arrays differ in length.
 */
export function fitOscillations(
  field: ArrayLike<number>,
  rhoXX: ArrayLike<number>,
  temperature: number | undefined,
  seedFrequency: number,
  options: OscillationFitOptions = {},
): OscillationFit | Skipped {
  if (field.length !== rhoXX.length) throw new RangeError(`fitOscillations: ${field.length} fields, ${rhoXX.length} values`);
  const o = {
    massRatio: options.massRatio ?? 0.19,
    degeneracy: options.degeneracy ?? 4,
    backgroundOrder: Math.max(0, Math.min(4, Math.round(options.backgroundOrder ?? 2))),
    minPeriods: options.minPeriods ?? 3,
    minR2: options.minR2 ?? 0.9,
    maxLifetimeError: options.maxLifetimeError ?? 0.3,
    amplitudeFactor: options.amplitudeFactor ?? "free",
    maxPoints: options.maxPoints ?? 200,
  };
  const T = temperature !== undefined && temperature >= 0 && Number.isFinite(temperature) ? temperature : undefined;
  const { b, r } = cleanSweep(field, rhoXX, options.minField ?? 0, options.maxField ?? Number.POSITIVE_INFINITY);
  if (b.length < 2) return skipped(`only ${b.length} field points in the SdH window`);
  const P = prepare(b, r, b[0], b[b.length - 1], o.backgroundOrder, T, o.massRatio, o.maxPoints);
  const first = fitWindow(P, seedFrequency, o, T);
  if (!first.ok) return first;
  const onset = spinSplittingOnset(P.L, P.rho, first);
  if (!onset) return first;
  const note = `window ended at ${onset.field.toPrecision(3)} T: spin-split maxima above it (second harmonic ${(100 * onset.ratio).toFixed(0)} % of the fundamental)`;
  const cut = prepare(b, r, b[0], onset.field, o.backgroundOrder, T, o.massRatio, o.maxPoints);
  const second = fitWindow(cut, first.frequency.value, o, T);
  if (!second.ok) return skipped(`${note}; below it: ${second.reason}`);
  return { ...second, spinSplitting: { onsetField: onset.field, harmonicRatio: onset.ratio, note } };
}

/** The plotted data and fitted curve of an oscillation fit (src/analyse/bulk.ts). */
export const OSCILLATION_FIT_BULK = [
  ...under(["curve"], fields<OscillationFit["curve"]>("inverseField", "oscillation")),
  ...under(["model"], fields<OscillationFit["model"]>("inverseField", "oscillation")),
];
