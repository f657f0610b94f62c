import { describe, expect, it } from "vitest";
import { dingleTemperature, thermalArgument, thermalFactor } from "../../../src/analyse/transport/thermalFactor.ts";
import { dinglePlot, dingleRatio } from "../../../src/analyse/transport/dingle.ts";
import { fitOscillations } from "../../../src/analyse/transport/oscillationFit.ts";
import { lkSweep, type LkParams } from "../../helpers/lifshitzKosevich.ts";
import { derivedQuantities, fermiEnergy, fermiWavevector } from "../../../src/analyse/transport/derivedQuantities.ts";
import { ELEMENTARY_CHARGE } from "../../../src/physics/constants.ts";

describe("Lifshitz–Kosevich thermal factor", () => {
  it("X = 2.79170 and X/sinh X = 0.343648 at m* = 0.19, T = 1 K, B = 1 T (REFERENCES §7, derived, CODATA 2018)", () => {
    expect(thermalArgument(1, 1, 0.19)).toBeCloseTo(2.7917, 4);
    expect(thermalFactor(1, 1, 0.19)).toBeCloseTo(0.343648, 6);
    expect(thermalFactor(1, -1, 0.19)).toBeCloseTo(0.343648, 6); // sign of B does not matter
  });
  it("X = 14.69317·(m*/m_e)·T/B (REFERENCES §7, derived); limits 1 at T = 0 and finite at large X", () => {
    expect(thermalArgument(2, 0.5, 1)).toBeCloseTo(14.69317 * 4, 3);
    expect(thermalFactor(0, 1, 0.19)).toBe(1);
    const big = thermalFactor(100, 0.01, 0.19);
    expect(Number.isFinite(big) && big >= 0 && big < 1e-100).toBe(true);
    expect(() => thermalFactor(1, 0, 0.19)).toThrow(RangeError);
    expect(() => thermalFactor(NaN, 1, 0.19)).toThrow(RangeError);
  });
  it("T_D = 1.215662 K·ps / τ_q (REFERENCES §7, derived)", () => {
    expect(dingleTemperature(1e-12)).toBeCloseTo(1.215662, 5);
  });
});

describe("Dingle plot (diagnostic view of the oscillation fit)", () => {
  // Synthetic LK + Dingle oscillations (REFERENCES §7 amplitude formula) from the independent test generator.
  const p: LkParams = { density: 3e15, tauQ: 1e-12, temperature: 0.5, mass: 0.19, rho0: 600, slope: 0, g: 0, harmonic: false };
  const s = lkSweep(p, 3, 1501, 0, 1e-4, 3);
  const fit = fitOscillations(s.B, s.rxx, 0.5, 3.1, { minField: 0.45, maxField: 2 });
  it("per-period amplitudes lie on the fit's line ln A − β/B, with β = π m*/(e τ_q) = 3.3936 T at 1 ps (REFERENCES §7, derived, CODATA 2018)", () => {
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    const d = dinglePlot(fit);
    expect(d.ok).toBe(true);
    if (!d.ok) return;
    expect(d.line.slope).toBeCloseTo(-3.3936, 1);
    expect(d.inverseField.length).toBeGreaterThanOrEqual(4);
    d.inverseField.forEach((u, i) => expect(Math.abs(d.ordinate[i] - (d.line.intercept + d.line.slope * u))).toBeLessThan(0.1));
  });
  it("is skipped without a temperature", () => {
    const noT = fitOscillations(s.B, s.rxx, undefined, 3.1, { minField: 0.45, maxField: 2 });
    expect(noT.ok).toBe(true);
    if (!noT.ok) return;
    const d = dinglePlot(noT);
    expect(d.ok).toBe(false);
    if (!d.ok) expect(d.reason).toMatch(/temperature/);
  });
  it("Dingle ratio τ_t/τ_q and its input check", () => {
    expect(dingleRatio(10.803e-12, 1e-12)).toBeCloseTo(10.803, 10);
    expect(() => dingleRatio(1e-12, 0)).toThrow(RangeError);
  });
});

describe("derived scattering figures", () => {
  // n = 1e11 cm⁻², μ = 1e5 cm²/Vs, m* = 0.19, g = 4 (REFERENCES §9, derived, CODATA 2018 m_e)
  const d = derivedQuantities(1e15, 10, { massRatio: 0.19, degeneracy: 4 });
  it("τ_t = 10.803 ps, l = 0.368927 µm, k_F·l = 20.678, k_F = 5.60499e7 m⁻¹, E_F = 0.62997 meV (REFERENCES §9)", () => {
    expect(d.ok).toBe(true);
    if (!d.ok) return;
    expect(d.transportLifetime * 1e12).toBeCloseTo(10.803, 3);
    expect(d.meanFreePath * 1e6).toBeCloseTo(0.368927, 6);
    expect(d.kfl).toBeCloseTo(20.678, 3);
    expect(d.fermiWavevector).toBeCloseTo(5.60499e7, -2);
    expect((d.fermiEnergy / ELEMENTARY_CHARGE) * 1e3).toBeCloseTo(0.62997, 5);
  });
  it("k_F scales with degeneracy; E_F uses m*", () => {
    expect(fermiWavevector(1e15, 2) / fermiWavevector(1e15, 4)).toBeCloseTo(Math.SQRT2, 12);
    expect(fermiEnergy(1e15, 4, 0.38) / fermiEnergy(1e15, 4, 0.19)).toBeCloseTo(0.5, 12);
  });
  it("returns a reason (never NaN) for missing, zero or negative inputs", () => {
    expect(derivedQuantities(NaN, 10).ok).toBe(false);
    expect(derivedQuantities(1e15, 0).ok).toBe(false);
    expect(derivedQuantities(-1e15, 10).ok).toBe(false);
  });
});
