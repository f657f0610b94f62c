/**
 * The Rician (Rice) distribution: R = |ν + δ| with δ a circular complex
 * Gaussian whose real and imaginary parts each have standard deviation σ
 * (S. O. Rice, Bell Syst. Tech. J. 24, 46 (1945)).
 *
 *  - density f(r) = (r/σ²)·exp(−(r² + ν²)/(2σ²))·I0(rν/σ²), r ≥ 0;
 *  - mean E[R] = σ·√(π/2)·L_{1/2}(−ν²/(2σ²)), with the Laguerre function
 *    L_{1/2}(x) = e^(x/2)·[(1 − x)·I0(−x/2) − x·I1(−x/2)]; written with the
 *    scaled Bessel functions (besselScaled.ts) for y = ν²/(4σ²):
 *    L_{1/2}(−2y) = (1 + 2y)·e^(−y)I0(y) + 2y·e^(−y)I1(y);
 *  - CDF P(R ≤ r) = 1 − Q1(ν/σ, r/σ), Q1 the first-order Marcum Q function
 *    (J. I. Marcum, IRE Trans. Inf. Theory 6, 59 (1960)), here by its integral
 *    definition Q1(a, b) = ∫_b^∞ t·exp(−(t² + a²)/2)·I0(a·t) dt, integrated
 *    numerically (composite Simpson, step ≤ 1/32 in t, so the integrand,
 *    a bump of width ≈ 1, is resolved to about 1e-8). The side of b holding
 *    less probability is integrated, so small tails keep their relative
 *    accuracy; beyond 10 standard deviations of the bump the integrand is
 *    below 1e-20 and is left out;
 *  - quantile: the root of CDF(r) = p, by Newton steps (the density is the
 *    derivative) kept inside a bisection bracket.
 * ν ≥ 0 and σ > 0; r, ν, σ in any one unit. Throws RangeError for invalid
 * parameters (programming errors: callers check σ > 0).
 */
import { besselI0Scaled, besselI1Scaled } from "./besselScaled.ts";

function check(nu: number, sigma: number): void {
  if (!(nu >= 0) || !Number.isFinite(nu) || !(sigma > 0) || !Number.isFinite(sigma))
    throw new RangeError(`rician: need ν ≥ 0 and σ > 0, got ν = ${nu}, σ = ${sigma}`);
}

/** The Marcum integrand t·exp(−(t − a)²/2)·e^(−at)I0(at), written so nothing overflows. */
function marcumIntegrand(a: number, t: number): number {
  return t * Math.exp(-0.5 * (t - a) * (t - a)) * besselI0Scaled(a * t);
}

function simpson(a: number, from: number, to: number): number {
  if (!(to > from)) return 0;
  const panels = 2 * Math.max(8, Math.ceil((to - from) * 16));
  const h = (to - from) / panels;
  let s = marcumIntegrand(a, from) + marcumIntegrand(a, to);
  for (let i = 1; i < panels; i++) s += (i % 2 ? 4 : 2) * marcumIntegrand(a, from + i * h);
  return (s * h) / 3;
}

const REACH = 10;

/** Both sides of b: ∫_0^b and ∫_b^∞ of the Marcum integrand; the smaller is integrated, the other is 1 minus it. */
function marcumSides(a: number, b: number): { below: number; above: number } {
  const lo = Math.max(0, a - REACH);
  const hi = a + REACH;
  if (b <= lo) return { below: 0, above: 1 };
  if (b >= hi) return { below: 1, above: 0 };
  // The mass lies near t ≈ max(a, 1): integrate the side of b away from it.
  const clip = (v: number) => Math.min(1, Math.max(0, v));
  if (b < Math.max(a, 1)) {
    const below = clip(simpson(a, lo, b));
    return { below, above: 1 - below };
  }
  const above = clip(simpson(a, b, hi));
  return { below: 1 - above, above };
}

/** First-order Marcum Q function Q1(a, b), a ≥ 0, b ≥ 0. */
export function marcumQ1(a: number, b: number): number {
  if (!(a >= 0) || !(b >= 0) || !Number.isFinite(a) || !Number.isFinite(b)) throw new RangeError(`marcumQ1: need finite a, b ≥ 0, got ${a}, ${b}`);
  return marcumSides(a, b).above;
}

export function ricianPdf(r: number, nu: number, sigma: number): number {
  check(nu, sigma);
  if (!(r >= 0)) return 0;
  return marcumIntegrand(nu / sigma, r / sigma) / sigma;
}

export function ricianCdf(r: number, nu: number, sigma: number): number {
  check(nu, sigma);
  if (!(r > 0)) return 0;
  return marcumSides(nu / sigma, r / sigma).below;
}

export function ricianMean(nu: number, sigma: number): number {
  check(nu, sigma);
  const y = (nu * nu) / (4 * sigma * sigma);
  const laguerreHalf = (1 + 2 * y) * besselI0Scaled(y) + 2 * y * besselI1Scaled(y);
  return sigma * Math.sqrt(Math.PI / 2) * laguerreHalf;
}

/** The p-quantile (0 < p < 1) of the Rician distribution. */
export function ricianQuantile(p: number, nu: number, sigma: number): number {
  check(nu, sigma);
  if (!(p > 0 && p < 1)) throw new RangeError(`ricianQuantile: p must lie in (0, 1), got ${p}`);
  let lo = Math.max(0, nu - REACH * sigma);
  let hi = nu + REACH * sigma;
  // Start from the Rayleigh quantile shifted by ν (exact for ν = 0), clipped to the bracket.
  let r = Math.min(hi, Math.max(lo, Math.max(0, nu - sigma) + sigma * Math.sqrt(-2 * Math.log(1 - p))));
  for (let it = 0; it < 100; it++) {
    const f = ricianCdf(r, nu, sigma) - p;
    if (f > 0) hi = r;
    else lo = r;
    if (hi - lo < 1e-12 * sigma) break;
    const d = ricianPdf(r, nu, sigma);
    let next = d > 0 ? r - f / d : NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - r) < 1e-12 * sigma) {
      r = next;
      break;
    }
    r = next;
  }
  return r;
}
