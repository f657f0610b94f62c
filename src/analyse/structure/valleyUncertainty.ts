/**
 * Standard uncertainties of the predicted valley-splitting figures from the
 * uncertainties of the fitted depth profile.
 *
 * Method: the variance of each figure y over a Gaussian spread of each input
 * x_i (standard uncertainty u_i, inputs uncorrelated), one input at a time, by
 * three-point Gauss–Hermite quadrature (nodes 0, ±√3, weights 2/3, 1/6, 1/6;
 * exact for polynomials up to degree 5; Abramowitz & Stegun 25.4.46):
 *   ȳ_i = (2/3)·y0 + (1/6)·(y₊ + y₋),  u_i²(y) = (2/3)(y0 − ȳ_i)² + (1/6)[(y₊ − ȳ_i)² + (y₋ − ȳ_i)²],
 * with y± = y(x_i ± √3·u_i), and u(y) = √Σ u_i²(y) (the sum of GUM, JCGM
 * 100:2008 §5.1.2, eq. 10, with each term taken over the input's spread rather
 * than from a derivative: the deterministic part 2|Δ0| is a modulus, not
 * smooth where Δ0 passes near zero, and a derivative there understates its
 * spread about twofold). Inputs: the centre and τ of each
 * interface (depth-profile sigmoid fits; u(τ) = u(w10–90)/(2·ln 9)). Their
 * covariance within one fit is not carried by the fit result and is taken as
 * zero (small for a symmetric logistic edge: centre and width are nearly
 * orthogonal). Left out: the barrier and well Ge fractions, the constants
 * (k0, m_l, b, ε_r) and the field — systematic choices the caution names,
 * which move all wafers alike. Deterministic (no random draws). A figure whose
 * shifted prediction fails gets NaN.
 */
import { LN9 } from "../numeric/sigmoidFit.ts";
import type { InterfaceFit } from "./depthProfile.ts";
import { valleyFigures, type ValleyFigures, type ValleyInput, type ValleySettings } from "./valleySplitting.ts";

const KEYS = ["mean", "p10", "deterministicSplitting", "sigma", "yieldFraction"] as const;

/** u of each figure (same units as the figure); see the module comment. `central`: the figures of the unshifted input when the caller has them (else computed here). */
export function valleyUncertainty(input: ValleyInput, settings: ValleySettings, central?: ValleyFigures): ValleyFigures {
  const y0 = central ?? valleyFigures(input, settings);
  const shifts: ((sign: number) => ValleyInput)[] = [];
  for (const side of ["top", "bottom"] as const) {
    const fit: InterfaceFit = input[side];
    const uTau = fit.width10to90StdErr / (2 * LN9);
    if (fit.centreStdErr > 0 && Number.isFinite(fit.centreStdErr))
      shifts.push((k) => ({ ...input, [side]: { ...fit, centre: fit.centre + k * fit.centreStdErr } }));
    if (uTau > 0 && Number.isFinite(uTau)) shifts.push((k) => ({ ...input, [side]: { ...fit, tau: Math.max(fit.tau + k * uTau, 1e-3 * fit.tau) } }));
  }
  const sum: ValleyFigures = { mean: 0, p10: 0, deterministicSplitting: 0, sigma: 0, yieldFraction: 0 };
  for (const shift of shifts) {
    const up = valleyFigures(shift(Math.sqrt(3)), settings);
    const down = valleyFigures(shift(-Math.sqrt(3)), settings);
    for (const key of KEYS) {
      if (!y0 || !up || !down) {
        sum[key] = NaN;
        continue;
      }
      const mean = (2 / 3) * y0[key] + (up[key] + down[key]) / 6;
      sum[key] += (2 / 3) * (y0[key] - mean) ** 2 + ((up[key] - mean) ** 2 + (down[key] - mean) ** 2) / 6;
    }
  }
  return {
    mean: Math.sqrt(sum.mean),
    p10: Math.sqrt(sum.p10),
    deterministicSplitting: Math.sqrt(sum.deterministicSplitting),
    sigma: Math.sqrt(sum.sigma),
    yieldFraction: Math.sqrt(sum.yieldFraction),
  };
}
