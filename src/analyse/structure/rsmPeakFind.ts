/**
 * Peak search in a reciprocal-space map given as points (ω, 2θ, counts), on a
 * grid or scattered.
 *
 * 1. Background = median of all counts; noise = max(1.4826·MAD, √max(bg, 1))
 *    (robust scale, Hampel 1974; the Poisson floor keeps near-empty maps sane).
 * 2. Coordinates are normalised by the point spacing (grid step, or range/√N
 *    for scattered points). Counts are smoothed by the mean over a radius of 1.5
 *    spacings; a point is a local maximum when its smoothed value exceeds
 *    bg + threshold·noise and every neighbour within `radius` spacings.
 * 3. Each maximum is refined in the natural diffractometer coordinates
 *    (rocking p = ω − 2θ/2, radial t = 2θ): an intensity centroid of
 *    (counts − bg) in a window (two passes: 6 spacings, then 3 second-moment
 *    widths), then a 2-D Gaussian A·exp(−(p−p0)²/2σp² − (t−t0)²/2σt²) + B fitted
 *    by Levenberg–Marquardt (nonlinearFit.ts). Uncertainty: for the Gaussian fit,
 *    the sandwich covariance with Poisson variances (sandwichCovariance.ts; the
 *    pooled Jacobian errors were about half the Monte Carlo scatter, test/analyse/
 *    standardErrors/xray.test.ts), scaled up by √(χ²/(n − k)) where the peak fits
 *    worse than counting noise allows; for the centroid, Poisson counting noise
 *    propagated to the weighted mean, σ²(x̄) = Σ(x_i − x̄)²·var(c_i)/W².
 *    If the fit fails or lands outside the window, the centroid is kept.
 * Angles in rad. Pure; throws only for programming errors.
 */
import { nonlinearFit } from "../numeric/nonlinearFit.ts";
import { sandwichCovariance } from "../numeric/sandwichCovariance.ts";
import { median } from "simple-statistics";
import type { MapPoint } from "../../model/structureInputs.ts";

export interface RawPeak {
  omega: number;
  twoTheta: number;
  omegaStdErr: number;
  twoThetaStdErr: number;
  /** Peak height above background, counts. */
  height: number;
  method: "gaussian" | "centroid";
}

export interface PeakSearchOptions {
  /** Detection threshold in noise units above background (default 6). */
  threshold?: number;
  /** Local-maximum radius in point spacings (default 4). */
  radius?: number;
  /** Refinement: "gaussian" (default, falls back to centroid) or "centroid". */
  refine?: "gaussian" | "centroid";
  /** Keep at most this many maxima, strongest first (default 8). */
  maxPeaks?: number;
}

export interface PeakSearch {
  background: number;
  noise: number;
  peaks: RawPeak[];
}

function spacing(values: number[]): number {
  const uniq = [...new Set(values.map((v) => Math.round(v * 1e9)))].sort((a, b) => a - b);
  const range = (uniq[uniq.length - 1] - uniq[0]) * 1e-9;
  if (uniq.length > 1 && uniq.length <= 3 * Math.sqrt(values.length)) {
    const d = uniq.slice(1).map((u, i) => (u - uniq[i]) * 1e-9);
    return (d.length ? median(d) : 0) || range / Math.sqrt(values.length);
  }
  return range / Math.sqrt(values.length) || 1;
}

type NeighbourQuery = (i: number, r: number, ordered?: boolean) => number[];
/** True when `test` holds for every neighbour j of i within r (stops at the first that fails; no list is made). */
type NeighbourTest = (i: number, r: number, test: (j: number) => boolean) => boolean;

/**
 * Neighbour queries over normalised coordinates: every point j with
 * (u_j − u_i)² + (v_j − v_i)² ≤ r². A flat grid of cells about one spacing wide
 * (cell lists in one Int32Array) keeps each query to the cells the circle
 * touches. With `ordered` (default true) the list comes in a fixed order: by
 * cell of a `cell`-wide grid (column, then row), then by index, so that sums
 * over it (smoothing, centroids, the fit) do not depend on the fine grid.
 * `everyNear` tests a condition over the same neighbours without listing them
 * (the local-maximum test, run for every point above the threshold).
 */
function neighbourIndex(u: number[], v: number[], cell: number): { near: NeighbourQuery; everyNear: NeighbourTest } {
  const n = u.length;
  let uMin = Infinity,
    uMax = -Infinity,
    vMin = Infinity,
    vMax = -Infinity;
  for (let i = 0; i < n; i++) {
    uMin = Math.min(uMin, u[i]);
    uMax = Math.max(uMax, u[i]);
    vMin = Math.min(vMin, v[i]);
    vMax = Math.max(vMax, v[i]);
  }
  // Fine cells of width f (≥ 1 spacing), widened until the grid has at most ~4 cells per point.
  let f = 1;
  while (((uMax - uMin) / f + 1) * ((vMax - vMin) / f + 1) > 4 * n + 1024) f *= 2;
  const cols = n ? Math.floor((uMax - uMin) / f) + 1 : 0;
  const rows = n ? Math.floor((vMax - vMin) / f) + 1 : 0;
  const cellOf = new Int32Array(n);
  const start = new Int32Array(cols * rows + 1);
  for (let i = 0; i < n; i++) {
    cellOf[i] = Math.floor((u[i] - uMin) / f) * rows + Math.floor((v[i] - vMin) / f);
    start[cellOf[i] + 1]++;
  }
  for (let c = 0; c < cols * rows; c++) start[c + 1] += start[c];
  const items = new Int32Array(n);
  const fill = start.slice(0, cols * rows);
  for (let i = 0; i < n; i++) items[fill[cellOf[i]]++] = i;
  // Rank of each point in the fixed output order.
  const ca = u.map((x) => Math.floor(x / cell));
  const cb = v.map((x) => Math.floor(x / cell));
  const byOrder = Array.from({ length: n }, (_, i) => i).sort((i, j) => ca[i] - ca[j] || cb[i] - cb[j] || i - j);
  const rank = new Int32Array(n);
  byOrder.forEach((i, k) => (rank[i] = k));
  const everyNear: NeighbourTest = (i, r, test) => {
    const reach = Math.ceil(r / f);
    const cu = Math.floor((u[i] - uMin) / f);
    const cv = Math.floor((v[i] - vMin) / f);
    const ui = u[i],
      vi = v[i];
    for (let a = Math.max(0, cu - reach); a <= Math.min(cols - 1, cu + reach); a++) {
      const base = a * rows;
      const end = start[base + Math.min(rows - 1, cv + reach) + 1];
      for (let k = start[base + Math.max(0, cv - reach)]; k < end; k++) {
        const j = items[k];
        if ((u[j] - ui) ** 2 + (v[j] - vi) ** 2 <= r * r && !test(j)) return false;
      }
    }
    return true;
  };
  const near: NeighbourQuery = (i, r, ordered = true) => {
    const out: number[] = [];
    const reach = Math.ceil(r / f);
    const cu = Math.floor((u[i] - uMin) / f);
    const cv = Math.floor((v[i] - vMin) / f);
    const ui = u[i],
      vi = v[i];
    for (let a = Math.max(0, cu - reach); a <= Math.min(cols - 1, cu + reach); a++) {
      const base = a * rows;
      const end = start[base + Math.min(rows - 1, cv + reach) + 1];
      for (let k = start[base + Math.max(0, cv - reach)]; k < end; k++) {
        const j = items[k];
        if ((u[j] - ui) ** 2 + (v[j] - vi) ** 2 <= r * r) out.push(j);
      }
    }
    if (ordered) {
      // Insertion sort by rank: lists are short and nearly in order.
      for (let x = 1; x < out.length; x++) {
        const j = out[x];
        let y = x - 1;
        while (y >= 0 && rank[out[y]] > rank[j]) {
          out[y + 1] = out[y];
          y--;
        }
        out[y + 1] = j;
      }
    }
    return out;
  };
  return { near, everyNear };
}

/** Finds and refines peaks in a map (see module comment). Points with non-finite values are dropped. */
export function searchMapPeaks(points: readonly MapPoint[], options: PeakSearchOptions = {}): PeakSearch {
  const pts = points.filter((p) => Number.isFinite(p.omega) && Number.isFinite(p.twoTheta) && Number.isFinite(p.counts));
  const counts = pts.map((p) => p.counts);
  const background = median(counts);
  const mad = median(counts.map((c) => Math.abs(c - background)));
  const noise = Math.max(1.4826 * mad, Math.sqrt(Math.max(background, 1)));
  // Rocking/radial coordinates, normalised by spacing.
  const pRaw = pts.map((p) => p.omega - p.twoTheta / 2);
  const tRaw = pts.map((p) => p.twoTheta);
  const sp = spacing(pts.map((p) => p.omega));
  const st = spacing(tRaw);
  const u = pRaw.map((x) => x / sp);
  const v = tRaw.map((x) => x / st);
  const radius = options.radius ?? 4;
  const { near, everyNear } = neighbourIndex(u, v, radius);
  const smooth = counts.map((_, i) => {
    const nb = near(i, 1.5);
    let sum = 0;
    for (const j of nb) sum += counts[j];
    return sum / nb.length;
  });
  const level = background + (options.threshold ?? 6) * noise;
  const maxima: number[] = [];
  smooth.forEach((s, i) => {
    if (s <= level) return;
    const isMax = everyNear(i, radius, (j) => j === i || smooth[j] < s || (smooth[j] === s && j > i));
    if (isMax) maxima.push(i);
  });
  maxima.sort((a, b) => smooth[b] - smooth[a]);
  const chosen = maxima.slice(0, options.maxPeaks ?? 8);
  const peaks = chosen.map((i) => refinePeak(i, { u, v, counts, background, near, sp, st, refine: options.refine ?? "gaussian" }));
  return { background, noise, peaks };
}

interface RefineCtx {
  u: number[];
  v: number[];
  counts: number[];
  background: number;
  near: NeighbourQuery;
  sp: number;
  st: number;
  refine: "gaussian" | "centroid";
}

function centroid(idx: number[], ctx: RefineCtx) {
  let w = 0,
    mu = 0,
    mv = 0;
  for (const j of idx) {
    const c = Math.max(0, ctx.counts[j] - ctx.background);
    w += c;
    mu += c * ctx.u[j];
    mv += c * ctx.v[j];
  }
  if (!(w > 0)) return undefined;
  mu /= w;
  mv /= w;
  let su = 0,
    sv = 0,
    eu = 0,
    ev = 0;
  for (const j of idx) {
    const c = Math.max(0, ctx.counts[j] - ctx.background);
    const variance = Math.max(ctx.counts[j], 1);
    su += c * (ctx.u[j] - mu) ** 2;
    sv += c * (ctx.v[j] - mv) ** 2;
    eu += (ctx.u[j] - mu) ** 2 * variance;
    ev += (ctx.v[j] - mv) ** 2 * variance;
  }
  return { mu, mv, sdu: Math.sqrt(su / w), sdv: Math.sqrt(sv / w), eu: Math.sqrt(eu) / w, ev: Math.sqrt(ev) / w };
}

function refinePeak(i: number, ctx: RefineCtx): RawPeak {
  const first = centroid(ctx.near(i, 6), ctx) ?? { mu: ctx.u[i], mv: ctx.v[i], sdu: 1, sdv: 1, eu: 0.5, ev: 0.5 };
  const r = Math.min(20, Math.max(2, 3 * Math.max(first.sdu, first.sdv)));
  const win = ctx.near(i, r);
  const c = centroid(win, ctx) ?? first;
  let result = { mu: c.mu, mv: c.mv, eu: c.eu, ev: c.ev, method: "centroid" as "gaussian" | "centroid" };
  const height = ctx.counts[i] - ctx.background;
  if (ctx.refine === "gaussian" && win.length >= 12) {
    const g = gaussianFit(win, ctx, c, height);
    if (g) result = { ...g, method: "gaussian" };
  }
  const p = result.mu * ctx.sp;
  const t = result.mv * ctx.st;
  const ep = result.eu * ctx.sp;
  const et = result.ev * ctx.st;
  return {
    omega: p + t / 2,
    twoTheta: t,
    omegaStdErr: Math.hypot(ep, et / 2),
    twoThetaStdErr: et,
    height,
    method: result.method,
  };
}

function gaussianFit(win: number[], ctx: RefineCtx, c: { mu: number; mv: number; sdu: number; sdv: number }, height: number) {
  // Window coordinates gathered once; the per-point expression is unchanged (same operations, same result bits).
  const wu = win.map((j) => ctx.u[j]);
  const wv = win.map((j) => ctx.v[j]);
  // The fitter evaluates the model at 2 × 6 finite-difference neighbours per
  // step; the four that move only A or B share the Gaussian factor of the
  // current shape, so each shape's factors are computed once (same bits).
  const shapes = new Map<string, Float64Array>();
  const gaussianFactors = (u0: number, v0: number, su: number, sv: number): Float64Array => {
    const key = `${u0},${v0},${su},${sv}`;
    let e = shapes.get(key);
    if (!e) {
      if (shapes.size >= 16) shapes.clear();
      const du = 2 * su * su;
      const dv = 2 * sv * sv;
      e = new Float64Array(win.length);
      for (let k = 0; k < win.length; k++) e[k] = Math.exp(-((wu[k] - u0) ** 2) / du - (wv[k] - v0) ** 2 / dv);
      shapes.set(key, e);
    }
    return e;
  };
  const model = ([a, u0, v0, su, sv, b]: number[]) => {
    const e = gaussianFactors(u0, v0, su, sv);
    return (k: number) => a * e[k] + b;
  };
  // Analytic partial derivatives in (A, u0, v0, σu, σv, B), from the same Gaussian factors.
  const jacobian = ([a, u0, v0, su, sv]: number[]) => {
    const e = gaussianFactors(u0, v0, su, sv);
    const g = new Float64Array(6);
    g[5] = 1;
    return (k: number) => {
      const du = wu[k] - u0;
      const dv = wv[k] - v0;
      const ae = a * e[k];
      g[0] = e[k];
      g[1] = (ae * du) / (su * su);
      g[2] = (ae * dv) / (sv * sv);
      g[3] = (ae * du * du) / (su * su * su);
      g[4] = (ae * dv * dv) / (sv * sv * sv);
      return g;
    };
  };
  const sdu = Math.max(c.sdu, 0.5);
  const sdv = Math.max(c.sdv, 0.5);
  try {
    const fit = nonlinearFit(
      model,
      win.map((_, k) => k),
      win.map((j) => ctx.counts[j]),
      {
        initial: [Math.max(height, 1), c.mu, c.mv, sdu, sdv, ctx.background],
        scale: [Math.max(height, 1), 1, 1, sdu, sdv, Math.max(ctx.background, 1)],
        min: [0, c.mu - 3 * sdu - 1, c.mv - 3 * sdv - 1, 0.1, 0.1, -Infinity],
        max: [Infinity, c.mu + 3 * sdu + 1, c.mv + 3 * sdv + 1, 50, 50, Infinity],
        jacobian,
      },
    );
    const [, u0, v0] = fit.params;
    // Counts are Poisson: the centre's errors come from the sandwich covariance with
    // var(c_k) = max(fitted count, 1), not the pooled s²(JᵀJ)⁻¹ of the unweighted fit.
    const f = model(fit.params);
    const jac = jacobian(fit.params);
    const rows = win.map((_, k) => Float64Array.from(jac(k)));
    const variance = win.map((_, k) => Math.max(f(k), 1));
    const cov = sandwichCovariance(rows, variance);
    // Poisson variances give the counting-statistics floor only. When the peak is not the Gaussian the fit
    // assumes (analyser streaks, mosaic tails), the residuals exceed the counting noise: the errors are then
    // scaled by √(Pearson χ²/(n − k)) when that exceeds 1 (common practice, e.g. Bevington & Robinson, Data
    // Reduction and Error Analysis, 3rd ed., §8.1), so a poor fit cannot report a counting-limited centre.
    const chi2 = win.reduce((acc, j, k) => acc + (ctx.counts[j] - f(k)) ** 2 / variance[k], 0);
    const inflate = Math.sqrt(Math.max(1, chi2 / Math.max(1, win.length - 6)));
    const eu = Math.sqrt(cov[1][1]) * inflate;
    const ev = Math.sqrt(cov[2][2]) * inflate;
    const ok = [u0, v0, eu, ev].every(Number.isFinite) && Math.abs(u0 - c.mu) < 3 * sdu + 1 && Math.abs(v0 - c.mv) < 3 * sdv + 1;
    return ok ? { mu: u0, mv: v0, eu, ev } : undefined;
  } catch {
    return undefined;
  }
}
