import { describe, expect, it } from "vitest";
import { sturmCount, tridiagonalGroundState } from "../../../src/analyse/numeric/tridiagonalGroundState.ts";
import { groundStateOnGrid } from "../../../src/analyse/structure/valleyEnvelope.ts";

// Constants written out here, not imported: SI 2019 exact e and h, CODATA 2018 m_e.
const E = 1.602176634e-19;
const HBAR = 6.62607015e-34 / (2 * Math.PI);
const M_L = 0.916 * 9.1093837015e-31; // Si longitudinal mass (REFERENCES §16, from memory)
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("tridiagonalGroundState: Sturm bisection + inverse iteration", () => {
  it("finds the lowest eigenpair of the discrete Laplacian tridiag(−1, 2, −1) (derived: λ₁ = 2 − 2cos(π/(n+1)), v_j ∝ sin(jπ/(n+1)))", () => {
    const n = 200;
    const g = tridiagonalGroundState(new Float64Array(n).fill(2), new Float64Array(n - 1).fill(-1));
    expect(rel(g.value, 2 - 2 * Math.cos(Math.PI / (n + 1)))).toBeLessThan(1e-9);
    const exact = Array.from({ length: n }, (_, j) => Math.sin(((j + 1) * Math.PI) / (n + 1)));
    const norm = Math.hypot(...exact);
    g.vector.forEach((v, j) => expect(v).toBeCloseTo(exact[j] / norm, 10));
  });
  it("counts eigenvalues below λ with the Sturm sequence (diagonal matrix: derived)", () => {
    expect(sturmCount([3, 1, 2], [0, 0], 2.5)).toBe(2);
    expect(sturmCount([3, 1, 2], [0, 0], 0.5)).toBe(0);
  });
  it("handles a 1 × 1 matrix and refuses mismatched lengths", () => {
    expect(tridiagonalGroundState([4], []).value).toBeCloseTo(4, 12);
    expect(() => tridiagonalGroundState([1, 2], [])).toThrow(RangeError);
  });
});

describe("finite-difference Schrödinger ground state on a 0.01 nm grid (groundStateOnGrid)", () => {
  it("infinite square well of 10 nm: E₁ = ħ²π²/(2 m_l L²) to 0.1 % (textbook particle in a box)", () => {
    const L = 10e-9;
    const h = 0.01e-9;
    const interior = Math.round(L / h) - 1;
    const g = groundStateOnGrid(new Float64Array(interior), h, M_L);
    const expected = (HBAR * HBAR * Math.PI * Math.PI) / (2 * M_L * L * L);
    expect(rel(g.value, expected)).toBeLessThan(1e-3);
  });
  it("triangular well V = eFz beside a hard wall: E₁ = a₁·(ħ²e²F²/(2 m_l))^(1/3), a₁ = 2.33811 (first Airy zero, Abramowitz & Stegun table 10.13, REFERENCES §16 [M]) to 0.5 %", () => {
    const F = 5e6;
    const h = 0.01e-9;
    const L = 40e-9; // far wall: ψ ∝ Ai(z/z0 − a₁) has decayed by e^(−60) there (z0 ≈ 2 nm)
    const interior = Math.round(L / h) - 1;
    const V = new Float64Array(interior).map((_, i) => E * F * (i + 1) * h);
    const g = groundStateOnGrid(V, h, M_L);
    const expected = 2.33811 * Math.cbrt((HBAR * HBAR * E * E * F * F) / (2 * M_L));
    expect(rel(g.value, expected)).toBeLessThan(5e-3);
  });
});
