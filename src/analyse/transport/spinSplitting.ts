/**
 * Where spin-split Shubnikov–de Haas maxima appear along a fitted window.
 *
 * Once the Zeeman splitting is resolved, each maximum of ρxx splits in two and
 * the oscillation gains a strong second harmonic (2f in the 1/B spectrum).
 * Per period of the fitted oscillation (uniform steps in 1/B), the relative
 * oscillation divided by the fitted envelope of the fundamental,
 * z = (ρ/ρ_bg − 1)/(4A·(X/sinh X)·e^(−β/B)), is projected by least squares onto
 * cos Θ, sin Θ, cos 2Θ, sin 2Θ (Θ = 2πf/B + φ, from the fit) and a local
 * straight line in 1/B (what is left of the background). The maxima of
 * cos Θ + h·cos 2Θ split when h > ¼ (its second derivative at Θ = 0 changes
 * sign; derived), so the onset is the lowest-field whole period whose
 * second-harmonic amplitude exceeds ¼ of the fundamental, both clear of the
 * noise (each above 4 standard errors), and whose next period towards high
 * field does too (splitting grows with field; one period alone may be noise). Returns that period's low-field edge
 * (T) and the ratio, or null when no period qualifies.
 */
import { linearLeastSquares } from "../numeric/linearLeastSquares.ts";
import { background, frequencyIndex, parameterCount, phaseIndex, type ModelLayout } from "./oscillationModel.ts";

/** Second-harmonic/fundamental ratio above which the maxima split (derived above). */
export const SPLIT_RATIO = 0.25;

export function spinSplittingOnset(
  L: ModelLayout,
  rho: Float64Array,
  fit: {
    frequency: { value: number };
    phase: { value: number };
    amplitudeFactor: { value: number };
    dingleField: { value: number };
    background: { coefficients: number[] };
  },
): { field: number; ratio: number } | null {
  const n = rho.length;
  const f = fit.frequency.value;
  const phi = fit.phase.value;
  const p = new Array<number>(parameterCount(L.order)).fill(0);
  fit.background.coefficients.forEach((c, j) => (p[j] = c));
  p[frequencyIndex(L.order)] = f;
  p[phaseIndex(L.order)] = phi;
  const uMin = 1 / L.field[n - 1];
  const segments = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const k = Math.floor((1 / L.field[i] - uMin) * f);
    const s = segments.get(k);
    if (s) s.push(i);
    else segments.set(k, [i]);
  }
  // From low field (large 1/B, large k) upwards; whole periods only (a part
  // period makes the harmonics and the local line nearly collinear).
  const keys = [...segments.keys()].sort((a, b) => b - a);
  const flagged: { key: number; field: number; ratio: number }[] = [];
  for (const key of keys) {
    const idx = segments.get(key)!;
    const m = idx.length;
    const extent = 1 / L.field[idx[0]] - 1 / L.field[idx[m - 1]];
    if (m < 10 || extent < 0.9 / f) continue;
    const cols = Array.from({ length: 6 }, () => new Float64Array(m));
    const z = new Float64Array(m);
    idx.forEach((i, q) => {
      const th = (2 * Math.PI * f) / L.field[i] + phi;
      cols[0][q] = Math.cos(th);
      cols[1][q] = Math.sin(th);
      cols[2][q] = Math.cos(2 * th);
      cols[3][q] = Math.sin(2 * th);
      cols[4][q] = 1;
      cols[5][q] = 1 / L.field[i] - 1 / L.field[idx[0]];
      // Divided by the fitted envelope of the fundamental, which changes several-fold within one period when damping is strong.
      const envelope = 4 * fit.amplitudeFactor.value * L.thermal[i] * Math.exp(-fit.dingleField.value / L.field[i]);
      z[q] = (rho[i] / background(p, L, i) - 1) / envelope;
    });
    const sol = linearLeastSquares(cols, z);
    if (!sol) continue;
    const a1 = Math.hypot(sol.coef[0], sol.coef[1]);
    const a2 = Math.hypot(sol.coef[2], sol.coef[3]);
    const se = Math.sqrt(sol.ssRes / Math.max(1, m - 6)) * Math.sqrt(2 / m);
    if (a1 > 4 * se && a2 > 4 * se && a2 > SPLIT_RATIO * a1) flagged.push({ key, field: Math.min(...idx.map((i) => L.field[i])), ratio: a2 / a1 });
  }
  // Splitting grows with field: the onset is the lowest-field flagged period whose higher-field neighbour is flagged too.
  for (const s of flagged) {
    if (flagged.some((t) => t.key === s.key - 1)) return { field: s.field, ratio: s.ratio };
  }
  return null;
}
