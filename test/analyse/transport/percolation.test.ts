import { describe, expect, it } from "vitest";
import { percolationConductivity, percolationFit, sheetConductance } from "../../../src/analyse/transport/percolation.ts";
import { gateSweeps } from "../../../src/synth/gateSweep.ts";
import { ELEMENTARY_CHARGE } from "../../../src/physics/constants.ts";

const rel = (a: number, b: number) => Math.abs(a / b - 1);

// Exact synthetic law σ = A·(n − n_p)^p (REFERENCES §8: model; p = 1.31 from
// Grassberger 1999, from memory; p = 1.2 as reported by Tracy et al. 2009 [C abstract]).
function exactLaw(np: number, a: number, p: number) {
  const n: number[] = [];
  const s: number[] = [];
  for (let k = 0; k <= 60; k++) {
    const nn = 5e13 * k; // 0 … 3e15 m⁻² (0 … 3e11 cm⁻²)
    n.push(nn);
    // Written out here, not the module's percolationConductivity: σ = A·(n − n_p)^p above n_p, 0 at and below.
    s.push(nn > np ? a * (nn - np) ** p : 0);
  }
  return { n, s };
}

describe("percolationConductivity (the charts' forward law)", () => {
  it("σ = A·(n − n_p)^p above n_p, 0 at and below (hand values)", () => {
    expect(percolationConductivity(5, 1, 2, 1.5)).toBeCloseTo(16, 12); // 2·4^1.5 = 16
    expect(percolationConductivity(10, 1, 1, 2)).toBe(81);
    expect(percolationConductivity(1, 1, 2, 1.5)).toBe(0);
    expect(percolationConductivity(0.5, 1, 2, 1.5)).toBe(0);
  });
});

describe("percolationFit", () => {
  const np = 5e14; // 5e10 cm⁻²
  it("recovers n_p and A within 1 % with p fixed at 1.31 (REFERENCES §8, model)", () => {
    const a = 1e-3 / 2.5e15 ** 1.31;
    const { n, s } = exactLaw(np, a, 1.31);
    const r = percolationFit(n, s, { maxDensity: 2e15 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(rel(r.density, np)).toBeLessThan(0.01);
    expect(rel(r.prefactor, a)).toBeLessThan(0.01);
    expect(r.exponent).toBe(1.31);
    expect(r.exponentStdErr).toBe(0);
    expect(r.r2).toBeGreaterThan(0.9999);
    expect(r.window).toMatchObject({ maxDensity: 2e15, rule: "given" });
    // points at and below n_p have σ = 0: excluded as insulating
    expect(r.excludedInsulating).toBe(11);
    expect(r.points).toBe(30);
  });
  it("recovers n_p, A and p within 1 % with p free, true p = 1.2 (Tracy et al. 2009, REFERENCES §8)", () => {
    const a = 2e-3 / 2.5e15 ** 1.2;
    const { n, s } = exactLaw(np, a, 1.2);
    const r = percolationFit(n, s, { exponent: "free" });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(rel(r.density, np)).toBeLessThan(0.01);
    expect(rel(r.exponent, 1.2)).toBeLessThan(0.01);
    expect(rel(r.prefactor, a)).toBeLessThan(0.01);
    expect(r.exponentFixed).toBe(false);
    expect(r.window.rule).toBe("derived");
    // derived rule: n_max = 3·n_p⁰ from the linearised first estimate (made with
    // p = 1.31, so n_p⁰ is a little off); the top point used lies at or below it
    expect(r.window.maxDensity).toBeGreaterThan(1.2e15);
    expect(r.window.maxDensity).toBeLessThan(1.6e15);
  });
  it("insulating points (huge or negative resistance) do not break the fit (gateSweep model)", () => {
    const c = 1e-3; // F/m² (0.1 µF/cm²)
    const a = 1e-3 / 2.5e15 ** 1.31;
    const { up } = gateSweeps({ capacitance: c, turnOnVoltage: 0.2, percolationDensity: np, prefactor: a, vgStart: 0, vgEnd: 0.8, steps: 81 });
    const sigma = up.resistance.map((r) => sheetConductance(r));
    const insulating = up.resistance.filter((r) => r <= 0 || r > 1e9).length;
    expect(insulating).toBeGreaterThan(5);
    expect(up.resistance.some((r) => r < 0)).toBe(true);
    const r = percolationFit(up.density, sigma, { maxDensity: 2e15 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.excludedInsulating).toBe(insulating);
    expect(rel(r.density, np)).toBeLessThan(0.01);
    expect((c * 0.6) / ELEMENTARY_CHARGE).toBeGreaterThan(2e15); // sweep reaches past the window
  });
  it("skips with a reason when the sweep never approaches the insulating side", () => {
    const a = 1e-3 / 2.5e15 ** 1.31;
    const n = Array.from({ length: 20 }, (_, k) => 2e15 + 5e13 * k);
    const s = n.map((x) => a * (x - np) ** 1.31); // all above n_p (written out, REFERENCES §8 model)
    const r = percolationFit(n, s);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/insulating side/);
  });
  it("skips empty, too-short and all-NaN input; throws on length mismatch", () => {
    expect(percolationFit([], []).ok).toBe(false);
    expect(percolationFit([1e15, 2e15], [1e-4, 2e-4]).ok).toBe(false);
    expect(percolationFit([NaN, NaN, NaN, NaN, NaN, NaN], [1, 2, 3, 4, 5, 6]).ok).toBe(false);
    expect(() => percolationFit([1], [1, 2])).toThrow(RangeError);
  });
  it("sheetConductance maps negative, huge and non-finite resistance to 0", () => {
    expect(sheetConductance(-5e5)).toBe(0);
    expect(sheetConductance(1e12)).toBe(0);
    expect(sheetConductance(NaN)).toBe(0);
    expect(sheetConductance(500)).toBeCloseTo(2e-3, 15);
  });
});
