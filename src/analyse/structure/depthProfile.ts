/**
 * Quantum-well figures from a composition depth profile (SIMS, EDX, atom probe).
 *
 * Well location: the Ge fraction, smoothed by a 5-point running mean, is cut at
 * half-way between its minimum and its 90th percentile (simple-statistics quantile: linear interpolation, Hyndman & Fan type 7); the well is the
 * low-Ge run bounded by high-Ge runs (barriers) on both sides — so a Si cap at
 * the surface is not mistaken for the well. With several, the run with the
 * lowest Ge wins.
 * Interfaces: each edge is fitted by a logistic step on a sloping background
 * (fitSigmoidEdge, Levenberg–Marquardt; REFERENCES §10) over a window from the
 * middle of the well to `window` beyond the crossing (default: the well's run
 * length, stopped at the middle of the neighbouring barrier). "top" is the
 * interface nearer the surface. Widths: 10–90 % = 2·ln 9·τ, and 4τ.
 * Well thickness = bottom centre − top centre (σ from the two centre σ's in
 * quadrature). Barrier Ge = the fitted barrier-side plateau of each edge,
 * evaluated at its centre; the mean of both is reported. Minimum Ge in the well =
 * the smallest 3-point running mean between the centres.
 * Its uncertainty, from the profile's noise: s = 1.4826·median|Δ²x|/√6, Δ²x
 * the second differences x[i+1] − 2x[i] + x[i−1] (variance 6s² for white noise;
 * a robust MAD-type estimate that a straight slope does not raise), centred in
 * the well's interior (between the interface centres less two 10–90 % widths
 * each) when it holds at least 12 of them — counting noise grows with the Ge
 * level, so the barriers' noise would overstate the well's — else over the
 * whole profile except within two 10–90 % widths of either fitted interface,
 * whose curvature would raise it (geNoiseFrom says which).
 * That estimate assumes the points' noise independent. Noise correlated between
 * neighbouring points (a smoothed profile, overlapping atom-probe bins, a
 * detector's memory) hides from the second differences, so s and u would be too
 * small. Check: the lag-1 autocorrelation r₁ = Σ Δ²ᵢΔ²ᵢ₊₁ / Σ (Δ²ᵢ)² of the
 * second differences (winsorised at 2.5 robust standard deviations, so that
 * real curvature does not count) from the middle of the barrier above the
 * well down (clear of a surface edge), outside the interfaces, is −2/3
 * for independent noise (lag 2: +1/6), with variance 0.3025/m for m of them
 * (Bartlett 1946); r₁ above −2/3 + 2·√(0.3025/m) counts as correlated. On a
 * 400-point profile that withholds u for about 5 % of profiles with independent
 * noise (finite-sample bias of r₁ included) and for 94–99 % of profiles with a
 * 3-point moving average, AR(1) ρ = 0.6 or 10-point bins (test/analyse/structure/
 * wellGeMinCorrelated.test.ts, 400 realisations each). The
 * noise's own lag-1 autocorrelation is then estimated from r₁ and r₂ by
 * inverting the Δ² autocovariances under correlation reaching 2 points
 * (c₀ = 6γ₀ − 8γ₁ + 2γ₂, c₁ = −4γ₀ + 7γ₁ − 4γ₂, c₂ = γ₀ − 4γ₁ + 6γ₂) and
 * named; the uncertainty and offset are withheld (wellGeMinUnknown), because
 * longer-range correlation (a 10-point bin, AR(1)) cannot be told from real
 * composition structure by the second differences, and a propagation with a
 * wrong model would give a wrong u.
 * Standard uncertainty by the GUM law of propagation of uncertainty (JCGM
 * 100:2008 §5.1.2) for the running mean that gave the minimum, its points
 * independent with u(x) = s: u = s/√k, k its points (3). Taking the smallest of
 * many noisy means also lowers the value (a selection offset the law of
 * propagation does not see): for a flat well it is the expected shortfall of
 * the minimum of the candidate means (those in the well's interior, between
 * the interface centres less one 10–90 % width each; at least 1) below
 * the true level, found by propagation of distributions by a Monte Carlo
 * method (JCGM 101:2008: 4000 trials of the candidates' noise, N(0, s²),
 * fixed seed); for a well whose minimum stands out it is 0. So the minimum
 * lies between true level − offset and true level, ± u. Both undefined when
 * the profile gives no noise estimate (s = 0: most neighbours equal, e.g. a
 * rounded or model profile) or its noise is correlated (above).
 * Contaminants: peak value inside the well (between the centres) and near it
 * (within `nearDistance` of either centre, default 10 nm).
 * Depth is in nm (any unit works if `window` and `nearDistance` use it too);
 * Ge is a fraction (convert at.% before calling); contaminants in cm⁻³ as given.
 */
import { fitSigmoidEdge, LN9, sigmoidAt, type SigmoidEdge } from "../numeric/sigmoidFit.ts";
import { median, min, quantile } from "simple-statistics";
import { fields, under } from "../bulk.ts";

export interface DepthProfileInput {
  /** Depth below the surface, nm. */
  depth: readonly number[];
  /** Ge fraction, 1. */
  ge: readonly number[];
  /** Optional contaminant columns by element, cm⁻³. */
  contaminants?: Record<string, readonly number[]>;
}

export interface DepthProfileOptions {
  /** Fit window beyond each interface, nm. */
  window?: number;
  /** Distance from the well within which contaminant peaks count as "near", nm (default 10). */
  nearDistance?: number;
}

export interface InterfaceFit {
  /** Mid-point depth, nm. */
  centre: number;
  centreStdErr: number;
  /** Logistic τ, nm. */
  tau: number;
  width10to90: number;
  width10to90StdErr: number;
  width4tau: number;
  /** Ge fraction on the barrier side, 1. */
  barrierGe: number;
  r2: number;
  points: number;
  /** The fitted curve over its window, and its 10 % and 90 % points, for plotting (depth nm, Ge fraction). */
  curve: { depth: number[]; ge: number[] };
  marks: [number, number][];
}

export interface ContaminantPeak {
  element: string;
  /** Largest value between the interface centres, cm⁻³ (undefined when no data there). */
  insidePeak?: number;
  insideDepth?: number;
  /** Largest value within nearDistance of the well, cm⁻³. */
  nearPeak?: number;
  nearDepth?: number;
}

export type DepthProfileResult =
  | {
      ok: true;
      top: InterfaceFit;
      bottom: InterfaceFit;
      /** nm */
      wellThickness: number;
      wellThicknessStdErr: number;
      barrierGeFraction: number;
      wellGeMin: number;
      /** Standard uncertainty of wellGeMin from the profile's noise (module comment); undefined without a noise estimate. */
      wellGeMinStdErr?: number;
      /** Expected shortfall of wellGeMin below the true level of a flat well (selection of the minimum), ≥ 0; undefined without a noise estimate. */
      wellGeMinOffset?: number;
      /** Why wellGeMinStdErr and wellGeMinOffset are undefined, when they are (module comment). */
      wellGeMinUnknown?: string;
      /** Point-to-point noise s of the Ge fraction, 1 (0 when the profile gives no noise estimate). */
      geNoise: number;
      /** Where s was estimated: the well's interior, or the whole profile (fewer than 12 second differences in the interior). */
      geNoiseFrom: "well" | "profile";
      nearDistance: number;
      contaminants: ContaminantPeak[];
      /** Median depth spacing of the profile, nm (profileSampling.ts judges it against the interface widths). */
      depthStep: number;
    }
  | { ok: false; reason: string };

const runningMean = (v: number[], half: number) =>
  v.map((_, i) => {
    const s = v.slice(Math.max(0, i - half), i + half + 1);
    return s.reduce((a, b) => a + b, 0) / s.length;
  });

/** Well interfaces, thickness, barrier and contaminant levels (see module comment). Never throws for data reasons. */
export function analyseDepthProfile(input: DepthProfileInput, options: DepthProfileOptions = {}): DepthProfileResult {
  const n = Math.min(input.depth.length, input.ge.length);
  if (input.depth.length !== input.ge.length) return { ok: false, reason: "depth and Ge columns differ in length" };
  const idx = [...Array(n).keys()].filter((i) => Number.isFinite(input.depth[i]) && Number.isFinite(input.ge[i]));
  if (idx.length < 20) return { ok: false, reason: `only ${idx.length} usable points; a well profile needs at least 20` };
  idx.sort((a, b) => input.depth[a] - input.depth[b]);
  const z = idx.map((i) => input.depth[i]);
  const g = idx.map((i) => input.ge[i]);
  const sm = runningMean(g, 2);
  const lo = min(sm);
  const hi = quantile(sm, 0.9);
  if (!(hi - lo > 0.02)) return { ok: false, reason: "the Ge profile has no contrast between barrier and well" };
  const half = (lo + hi) / 2;
  const runs: { start: number; end: number; low: boolean }[] = [];
  sm.forEach((v, i) => {
    const low = v < half;
    const last = runs[runs.length - 1];
    if (last && last.low === low) last.end = i;
    else runs.push({ start: i, end: i, low });
  });
  const wells = runs.map((r, k) => ({ r, k })).filter(({ r, k }) => r.low && k > 0 && k < runs.length - 1);
  if (wells.length === 0) return { ok: false, reason: "no low-Ge region bounded by barriers on both sides" };
  const minOf = (r: { start: number; end: number }) => Math.min(...sm.slice(r.start, r.end + 1));
  const { r: well, k } = wells.reduce((a, b) => (minOf(b.r) < minOf(a.r) ? b : a));
  const above = runs[k - 1];
  const below = runs[k + 1];
  const zTop = (z[well.start - 1] + z[well.start]) / 2;
  const zBot = (z[well.end] + z[well.end + 1]) / 2;
  const mid = (zTop + zBot) / 2;
  const reach = options.window ?? Math.max(zBot - zTop, 3 * medianStep(z));
  const topLimit = Math.max(zTop - reach, (z[above.start] + z[above.end]) / 2);
  const botLimit = Math.min(zBot + reach, (z[below.start] + z[below.end]) / 2);
  const top = fitEdge(z, g, topLimit, mid, "top");
  if (typeof top === "string") return { ok: false, reason: top };
  const bottom = fitEdge(z, g, mid, botLimit, "bottom");
  if (typeof bottom === "string") return { ok: false, reason: bottom };
  const wellThickness = bottom.centre - top.centre;
  if (!(wellThickness > 0)) return { ok: false, reason: "the fitted interfaces cross: the well is thinner than the interface widths allow to resolve" };
  const inside = z.map((_, i) => i).filter((i) => z[i] >= top.centre && z[i] <= bottom.centre);
  const sm3 = runningMean(g, 1);
  const nearDistance = options.nearDistance ?? 10;
  // The minimum's running means: 3 points between the centres, else (no point between them) the well run's 5-point means.
  const [cands, points] = inside.length ? [inside.map((i) => sm3[i]), 3] : [sm.slice(well.start, well.end + 1), 5];
  const wellGeMin = Math.min(...cands);
  const edges = [top, bottom].map((f) => [f.centre - 2 * f.width10to90, f.centre + 2 * f.width10to90]);
  const outside = (d: number) => edges.every(([a, b]) => d < a || d > b);
  const inWell = (d: number) => d > edges[0][1] && d < edges[1][0];
  const wellD2 = secondDifferences(z, g, inWell);
  const geNoiseFrom = wellD2.length >= MIN_WELL_NOISE_POINTS ? "well" : "profile";
  const geNoise = robustNoise(geNoiseFrom === "well" ? wellD2 : secondDifferences(z, g, outside));
  // The correlation check starts half-way through the barrier above the well, clear of a surface edge's curvature.
  const fromBarrier = (z[above.start] + z[above.end]) / 2;
  const correlation = noiseCorrelation(z, g, (d) => d >= fromBarrier && outside(d));
  const interior = inside.filter((i) => z[i] >= top.centre + top.width10to90 && z[i] <= bottom.centre - bottom.width10to90).length;
  const uncertainty = correlation.correlated ? {} : minimumUncertainty(Math.max(1, interior), points, geNoise);
  const wellGeMinUnknown = !(geNoise > 0)
    ? "the profile gives no noise estimate, most neighbouring points being equal"
    : correlation.correlated
      ? `the profile's noise is correlated between points (lag-1 ≈ ${correlation.lag1.toFixed(2)}), so the point-to-point scatter understates the scatter of the means`
      : undefined;
  return {
    ok: true,
    top,
    bottom,
    wellThickness,
    wellThicknessStdErr: Math.hypot(top.centreStdErr, bottom.centreStdErr),
    barrierGeFraction: (top.barrierGe + bottom.barrierGe) / 2,
    wellGeMin,
    ...uncertainty,
    ...(wellGeMinUnknown ? { wellGeMinUnknown } : {}),
    geNoise,
    geNoiseFrom,
    nearDistance,
    contaminants: contaminantPeaks(input, top.centre, bottom.centre, nearDistance),
    depthStep: medianStep(z),
  };
}

/** Second differences (signed) needed in the well's interior before s is taken from there (module comment). */
const MIN_WELL_NOISE_POINTS = 12;

/** Signed second differences x[i+1] − 2x[i] + x[i−1] centred at the depths `keep` accepts, with their centre index. */
function secondDifferences(z: readonly number[], g: readonly number[], keep: (depth: number) => boolean): { i: number; d: number }[] {
  const d2: { i: number; d: number }[] = [];
  for (let i = 1; i + 1 < g.length; i++) if (keep(z[i])) d2.push({ i, d: g[i + 1] - 2 * g[i] + g[i - 1] });
  return d2;
}

/** Robust point noise s = 1.4826·median|Δ²x|/√6 (module comment); 0 without any second difference. */
function robustNoise(d2: readonly { d: number }[]): number {
  return d2.length ? (1.4826 * median(d2.map((v) => Math.abs(v.d)))) / Math.sqrt(6) : 0;
}

/**
 * Is the noise correlated between neighbouring points? The lag-1 and lag-2 autocorrelations r₁, r₂ of the
 * second differences (pairs of adjacent ones only), tested against −2/3 (independent noise) with Bartlett's
 * variance 0.3025/m; lag1 is the noise's own lag-1 autocorrelation from r₁ and r₂ (module comment), or, when
 * that inversion gives no positive variance, r₁ + 2/3.
 */
export function noiseCorrelation(
  z: readonly number[],
  g: readonly number[],
  keep: (depth: number) => boolean,
): { correlated: boolean; lag1: number; r1: number; m: number } {
  // Winsorised at 2.5 robust standard deviations, so that a few large second differences from real curvature (a
  // surface edge, a spike) do not pass for correlation.
  const raw = secondDifferences(z, g, keep);
  const clip = raw.length ? 2.5 * 1.4826 * median(raw.map((v) => Math.abs(v.d))) : 0;
  const d2 = raw.map((v) => ({ i: v.i, d: Math.max(-clip, Math.min(clip, v.d)) }));
  const m = d2.length;
  let c0 = 0;
  let c1 = 0;
  let c2 = 0;
  for (let j = 0; j < m; j++) {
    c0 += d2[j].d ** 2;
    if (j + 1 < m && d2[j + 1].i === d2[j].i + 1) c1 += d2[j].d * d2[j + 1].d;
    if (j + 2 < m && d2[j + 2].i === d2[j].i + 2) c2 += d2[j].d * d2[j + 2].d;
  }
  if (!(c0 > 0) || m < 3) return { correlated: false, lag1: 0, r1: -2 / 3, m };
  const r1 = c1 / c0;
  const r2 = c2 / c0;
  const correlated = r1 > -2 / 3 + 2 * Math.sqrt(0.3025 / m);
  // Solve 6γ₀ − 8γ₁ + 2γ₂ = 1, −4γ₀ + 7γ₁ − 4γ₂ = r₁, γ₀ − 4γ₁ + 6γ₂ = r₂ (Cramer's rule).
  const det3 = (a: number[][]) =>
    a[0][0] * (a[1][1] * a[2][2] - a[1][2] * a[2][1]) - a[0][1] * (a[1][0] * a[2][2] - a[1][2] * a[2][0]) + a[0][2] * (a[1][0] * a[2][1] - a[1][1] * a[2][0]);
  const A = [
    [6, -8, 2],
    [-4, 7, -4],
    [1, -4, 6],
  ];
  const rhs = [1, r1, r2];
  const col = (k: number) => A.map((row, i) => row.map((v, j) => (j === k ? rhs[i] : v)));
  const D = det3(A);
  const g0 = det3(col(0)) / D;
  const g1 = det3(col(1)) / D;
  const lag1 = g0 > 0 && Number.isFinite(g1 / g0) ? Math.max(-1, Math.min(1, g1 / g0)) : r1 + 2 / 3;
  return { correlated, lag1, r1, m };
}

/** Trials of the Monte Carlo selection offset (JCGM 101:2008 §7.2; 4000 gives the offset to about 1 %). */
const OFFSET_TRIALS = 4000;

/** u and selection offset of the minimum of n candidate running means of k points (module comment); {} without a noise estimate. */
function minimumUncertainty(n: number, k: number, s: number): { wellGeMinStdErr?: number; wellGeMinOffset?: number } {
  if (!(s > 0)) return {};
  return { wellGeMinStdErr: s / Math.sqrt(k), wellGeMinOffset: s * minimumOffset(n, k) };
}

/**
 * Expected shortfall, in units of the point noise, of the smallest of n consecutive k-point running means of
 * independent N(0, 1) points below 0 (JCGM 101:2008 Monte Carlo, OFFSET_TRIALS trials, mulberry32 uniforms
 * with a fixed seed and Box–Muller normals, so the figure is the same on every build).
 */
function minimumOffset(n: number, k: number): number {
  if (n <= 1) return 0;
  const key = `${n}/${k}`;
  const known = OFFSETS.get(key);
  if (known !== undefined) return known;
  const offset = simulateOffset(n, k);
  OFFSETS.set(key, offset);
  return offset;
}

/** minimumOffset by (n, k): a pure function of both (fixed seed), so computed once per process. */
const OFFSETS = new Map<string, number>();

function simulateOffset(n: number, k: number): number {
  let a = 0x5eed;
  const uni = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const x = new Float64Array(n + k - 1);
  let sum = 0;
  for (let trial = 0; trial < OFFSET_TRIALS; trial++) {
    for (let i = 0; i < x.length; i++) x[i] = Math.sqrt(-2 * Math.log(uni() + 1e-300)) * Math.cos(2 * Math.PI * uni());
    let lowest = Infinity;
    for (let i = 0; i < n; i++) {
      let m = 0;
      for (let j = 0; j < k; j++) m += x[i + j];
      lowest = Math.min(lowest, m / k);
    }
    sum += lowest;
  }
  return -sum / OFFSET_TRIALS;
}

function medianStep(z: number[]): number {
  return z.length > 1 ? median(z.slice(1).map((v, i) => v - z[i])) || 1 : 1;
}

function fitEdge(z: number[], g: number[], from: number, to: number, which: "top" | "bottom"): InterfaceFit | string {
  const sel = z.map((_, i) => i).filter((i) => z[i] >= from && z[i] <= to);
  if (sel.length < 8) return `the ${which} interface has only ${sel.length} points in its fit window; at least 8 are needed`;
  const zs = sel.map((i) => z[i]);
  let fit: SigmoidEdge;
  try {
    fit = fitSigmoidEdge(
      zs,
      sel.map((i) => g[i]),
    );
  } catch (e) {
    return `the ${which} interface fit failed: ${(e as Error).message}`;
  }
  const values = [fit.centre, fit.tau, fit.width10to90, fit.centreStdErr, fit.width10to90StdErr];
  if (!values.every(Number.isFinite)) return `the ${which} interface fit did not converge to finite values`;
  if (fit.centre < zs[0] || fit.centre > zs[zs.length - 1]) return `the ${which} interface fit put the edge outside its window`;
  const bg = fit.base + fit.slope * (fit.centre - fit.zReference);
  // Top edge falls (barrier first, z → −∞ plateau = base); bottom edge rises (barrier plateau = base + step).
  const barrierGe = which === "top" ? bg : bg + fit.step;
  return {
    centre: fit.centre,
    centreStdErr: fit.centreStdErr,
    tau: fit.tau,
    width10to90: fit.width10to90,
    width10to90StdErr: fit.width10to90StdErr,
    width4tau: fit.width4tau,
    barrierGe,
    r2: fit.r2,
    points: fit.points,
    curve: { depth: zs, ge: zs.map((zz) => sigmoidAt(fit, zz)) },
    marks: [-1, 1].map((sgn): [number, number] => {
      const zz = fit.centre + sgn * LN9 * fit.tau;
      return [zz, sigmoidAt(fit, zz)];
    }),
  };
}

function contaminantPeaks(input: DepthProfileInput, zTop: number, zBot: number, near: number): ContaminantPeak[] {
  return Object.entries(input.contaminants ?? {}).map(([element, values]) => {
    const inRange = (a: number, b: number) => {
      let best: { v: number; z: number } | undefined;
      input.depth.forEach((z, i) => {
        const v = values[i];
        if (Number.isFinite(z) && Number.isFinite(v) && z >= a && z <= b && (!best || v > best.v)) best = { v, z };
      });
      return best;
    };
    const ins = inRange(zTop, zBot);
    const nr = inRange(zTop - near, zBot + near);
    return { element, insidePeak: ins?.v, insideDepth: ins?.z, nearPeak: nr?.v, nearDepth: nr?.z };
  });
}

/** The fitted curves of both interfaces (src/analyse/bulk.ts). */
export const DEPTH_PROFILE_BULK = [
  ...under(["top", "curve"], fields<InterfaceFit["curve"]>("depth", "ge")),
  ...under(["bottom", "curve"], fields<InterfaceFit["curve"]>("depth", "ge")),
];
