import { describe, expect, it } from "vitest";
import { besselI0Scaled, besselI1Scaled } from "../../../src/analyse/numeric/besselScaled.ts";
import { marcumQ1, ricianCdf, ricianMean, ricianPdf, ricianQuantile } from "../../../src/analyse/numeric/rician.ts";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** I0(x) from its integral representation (1/π)∫₀^π e^(x·cos θ) dθ (Abramowitz & Stegun 9.6.19), scaled by e^(−x); written here, independent of the series in src. */
function i0ScaledByIntegral(x: number): number {
  // The trapezoid rule on a periodic analytic integrand converges exponentially; 400 points resolve the peak at θ = 0 for x ≤ 500.
  const n = 400;
  let s = 0;
  for (let k = 0; k <= n; k++) {
    const th = (Math.PI * k) / n;
    s += (k === 0 || k === n ? 0.5 : 1) * Math.exp(x * (Math.cos(th) - 1));
  }
  return s / n;
}

/** The Rice density written out (Rice 1945), with the integral-form I0 above. */
const riceDensity = (r: number, nu: number, s: number) => (r / (s * s)) * Math.exp(-((r - nu) ** 2) / (2 * s * s)) * i0ScaledByIntegral((r * nu) / (s * s));

/** ∫₀^R f by Simpson's rule on n panels (n even), written here. */
function integrate(f: (r: number) => number, R: number, n = 2000): number {
  const h = R / n;
  let s = f(0) + f(R);
  for (let k = 1; k < n; k++) s += (k % 2 ? 4 : 2) * f(k * h);
  return (s * h) / 3;
}

describe("scaled modified Bessel functions", () => {
  it("match tabulated values (Abramowitz & Stegun table 9.8 [M]): I0(1) = 1.266065878, I1(1) = 0.565159104, I0(10) = 2815.716628, I1(10) = 2670.988304", () => {
    expect(rel(besselI0Scaled(1) * Math.E, 1.266065878)).toBeLessThan(1e-8);
    expect(rel(besselI1Scaled(1) * Math.E, 0.565159104)).toBeLessThan(1e-8);
    expect(rel(besselI0Scaled(10) * Math.exp(10), 2815.716628)).toBeLessThan(1e-8);
    expect(rel(besselI1Scaled(10) * Math.exp(10), 2670.988304)).toBeLessThan(1e-8);
  });
  it("agree with the integral representation on both sides of the series/asymptotic switch (A&S 9.6.19)", () => {
    for (const x of [0, 0.3, 5, 24.9, 25.1, 60, 200]) expect(Math.abs(besselI0Scaled(x) - i0ScaledByIntegral(x))).toBeLessThan(1e-9);
  });
});

describe("Rician distribution", () => {
  it("Rayleigh limit ν = 0 (REFERENCES §16 [D]): mean of E_v = 2R is √(2π)·σ and P(E_v < E) = 1 − exp(−E²/(8σ²))", () => {
    const s = 7.5;
    expect(rel(2 * ricianMean(0, s), Math.sqrt(2 * Math.PI) * s)).toBeLessThan(1e-12);
    for (const E of [1, 10, 21.2, 40, 80]) expect(Math.abs(ricianCdf(E / 2, 0, s) - (1 - Math.exp(-(E * E) / (8 * s * s))))).toBeLessThan(1e-7);
    // 10th percentile of E_v: E = 2σ·√(−2 ln 0.9) (derived from the CDF above).
    expect(rel(2 * ricianQuantile(0.1, 0, s), 2 * s * Math.sqrt(-2 * Math.log(0.9)))).toBeLessThan(1e-6);
  });
  it("mean (Laguerre L_{1/2}), CDF (Marcum Q1) and 10th percentile agree with direct integration of the Rice density", () => {
    const s = 1;
    for (const nu of [1, 3, 10]) {
      const R = nu + 12;
      const mean = integrate((r) => r * riceDensity(r, nu, s), R);
      expect(rel(ricianMean(nu, s), mean)).toBeLessThan(1e-6);
      for (const r of [0.5 * nu, nu, nu + 1.5]) expect(Math.abs(ricianCdf(r, nu, s) - integrate((x) => riceDensity(x, nu, s), r))).toBeLessThan(1e-6);
      const q = ricianQuantile(0.1, nu, s);
      expect(Math.abs(integrate((x) => riceDensity(x, nu, s), q) - 0.1)).toBeLessThan(1e-6);
      expect(Math.abs(ricianPdf(nu, nu, s) - riceDensity(nu, nu, s))).toBeLessThan(1e-9);
    }
  });
  it("large ν/σ: the mean tends to ν + σ²/(2ν) (derived from the asymptotic I0, I1) and Q1 keeps small tails", () => {
    expect(rel(ricianMean(200, 1), 200 + 1 / 400)).toBeLessThan(1e-8);
    // Q1(a, b) far below the peak is ≈ 1 and far above is tiny but positive.
    expect(marcumQ1(20, 5)).toBe(1);
    const tail = marcumQ1(3, 8);
    expect(tail).toBeGreaterThan(0);
    expect(Math.abs(tail - (1 - integrate((x) => riceDensity(x, 3, 1), 8)))).toBeLessThan(1e-7);
  });
  it("refuses σ ≤ 0 and p outside (0, 1)", () => {
    expect(() => ricianMean(1, 0)).toThrow(RangeError);
    expect(() => ricianQuantile(1, 1, 1)).toThrow(RangeError);
  });
});
