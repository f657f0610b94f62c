/**
 * groundStateOnGrid brackets E₁ by a Rayleigh quotient, stops the bisection early and returns the
 * Rayleigh quotient of the converged vector: checked against the discrete box's exact eigenpair
 * (derived: λ₁ = 2t(1 − cos(π/(n+1))), v_j ∝ sin(jπ/(n+1))) and against the solver run without the
 * bracket (Gershgorin bounds, bisection to floating-point resolution).
 */
import { describe, expect, it } from "vitest";
import { tridiagonalGroundState } from "../../../src/analyse/numeric/tridiagonalGroundState.ts";
import { groundStateOnGrid } from "../../../src/analyse/structure/valleyEnvelope.ts";

// Written out here, not imported: SI 2019 exact e and h, CODATA 2018 m_e.
const E = 1.602176634e-19;
const HBAR = 6.62607015e-34 / (2 * Math.PI);
const M = 0.916 * 9.1093837015e-31;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("groundStateOnGrid (bracketed bisection, Rayleigh-quotient energy)", () => {
  const h = 0.01e-9;
  const t = (HBAR * HBAR) / (2 * M * h * h);

  it("flat box of 3000 points: the exact discrete eigenvalue and eigenvector", () => {
    const n = 3000;
    const g = groundStateOnGrid(new Float64Array(n), h, M);
    expect(rel(g.value, 2 * t * (1 - Math.cos(Math.PI / (n + 1))))).toBeLessThan(1e-10);
    const exact = Array.from({ length: n }, (_, j) => Math.sin(((j + 1) * Math.PI) / (n + 1)));
    const norm = Math.hypot(...exact);
    let worst = 0;
    g.vector.forEach((v, j) => {
      worst = Math.max(worst, Math.abs(v - exact[j] / norm));
    });
    expect(worst).toBeLessThan(1e-12);
  });

  it("a well between 0.15 eV barriers in a 5 MV/m field: the same eigenpair as the unbracketed solver", () => {
    const n = 3500;
    const U = Float64Array.from({ length: n }, (_, i) => E * (0.15 * (i < 1000 || i > 2500 ? 1 : 0) + 5e6 * (i + 1) * h));
    const g = groundStateOnGrid(U, h, M);
    const d = U.map((u) => 2 * t + u);
    const ref = tridiagonalGroundState(d, new Float64Array(n - 1).fill(-t));
    expect(rel(g.value, ref.value)).toBeLessThan(1e-7);
    let worst = 0;
    g.vector.forEach((v, j) => {
      worst = Math.max(worst, Math.abs(v - ref.vector[j]));
    });
    expect(worst).toBeLessThan(1e-10 * Math.max(...ref.vector));
  });
});
