import { describe, expect, it } from "vitest";
import { hallSdhMismatch, sdhDensity, sdhFrequency, shubnikovDeHaas } from "../../../src/analyse/transport/shubnikovDeHaas.ts";
import { fieldGrid, oscillationSweep } from "../../../src/synth/quantumOscillations.ts";
import { lowFieldHallDensity, twoCarrierSweep } from "../../../src/synth/twoCarrier.ts";
import { linearFit } from "../../../src/analyse/numeric/linearFit.ts";
import { ELEMENTARY_CHARGE } from "../../../src/physics/constants.ts";
import { gaussian } from "../../helpers/random.ts";

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("SdH density relation", () => {
  it("n = 9.6720e10 cm⁻² per tesla of frequency for Si(001), g = 4 (REFERENCES §7, derived from n = g·e·f/h, CODATA 2018 e and h)", () => {
    expect(sdhDensity(1, 4) * 1e-4).toBeCloseTo(9.672e10, -7); // 4 significant digits
    expect(rel(sdhDensity(1, 4) * 1e-4, 9.672e10)).toBeLessThan(1e-4);
    // f = 1.033917 T for n = 1e11 cm⁻² (REFERENCES §7, derived)
    expect(sdhFrequency(1e15, 4)).toBeCloseTo(1.033917, 6);
  });
});

describe("shubnikovDeHaas", () => {
  // Synthetic LK + Dingle oscillations (REFERENCES §7, amplitude formula).
  const p = { rho0: 600, density: 3e15, quantumLifetime: 1e-12, temperature: 0.5 };
  it("recovers the density within 1 % from ≥ 5 periods (REFERENCES §7)", () => {
    const s = oscillationSweep(fieldGrid(0, 3, 1501), p);
    const r = shubnikovDeHaas(s.field, s.rhoXX, { minField: 0.45, maxField: 2 });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.periods).toBeGreaterThanOrEqual(5);
    expect(rel(r.density, 3e15)).toBeLessThan(0.01);
    expect(r.spectrum.frequency.length).toBeLessThanOrEqual(400);
    expect(r.trace.inverseField.length).toBe(r.trace.oscillation.length);
  });
  it("gives the same density from a reversed, negative-field, noisy sweep", () => {
    const g = gaussian(11);
    const s = oscillationSweep(fieldGrid(0, 3, 1501), p);
    const field = s.field.map((b) => -b).reverse();
    const rho = s.rhoXX.map((v) => v + 2 * g()).reverse();
    const r = shubnikovDeHaas(field, rho, { minField: 0.45, maxField: 2 });
    expect(r.ok).toBe(true);
    if (r.ok) expect(rel(r.density, 3e15)).toBeLessThan(0.01);
  });
  it("skips (never guesses) with fewer than three periods in range", () => {
    const s = oscillationSweep(fieldGrid(0, 3, 1501), p);
    const r = shubnikovDeHaas(s.field, s.rhoXX, { minField: 1.2, maxField: 3 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/period/);
  });
  it("skips a featureless (noise-only) sweep and too-short or NaN input", () => {
    const g = gaussian(5);
    const b = fieldGrid(0.3, 2, 600);
    const r = shubnikovDeHaas(
      b,
      b.map(() => 600 + g()),
    );
    expect(r.ok).toBe(false);
    expect(shubnikovDeHaas([], []).ok).toBe(false);
    expect(
      shubnikovDeHaas(
        b,
        b.map(() => NaN),
      ).ok,
    ).toBe(false);
    expect(() => shubnikovDeHaas([1], [])).toThrow(RangeError);
  });
});

describe("parallel conduction (Hall vs SdH density)", () => {
  const well = { density: 3e15, mobility: 10 }; // 3e11 cm⁻², 1e5 cm²/Vs
  const osc = { quantumLifetime: 1e-12, temperature: 0.5 };
  const fields = fieldGrid(0, 3, 1501);
  function hallFromLowField(sweep: { field: number[]; rhoXY: number[] }) {
    const idx = sweep.field.map((_, i) => i).filter((i) => sweep.field[i] <= 0.05);
    const f = linearFit(
      idx.map((i) => sweep.field[i]),
      idx.map((i) => sweep.rhoXY[i]),
    );
    return 1 / (ELEMENTARY_CHARGE * f.slope); // REFERENCES §6: n = 1/(e·dR_xy/dB)
  }
  it("flags a two-carrier sweep (well + parallel channel) as parallel conduction (> 5 %)", () => {
    const parallel = { density: 2e15, mobility: 0.5 };
    const s = twoCarrierSweep(fields, { well, parallel, oscillations: osc });
    const nHall = hallFromLowField(s);
    // Drude two-band low-field Hall density (classical result, see twoCarrier.ts)
    expect(rel(nHall, lowFieldHallDensity([well, parallel]))).toBeLessThan(1e-3);
    // the parallel channel adds a parabolic magnetoresistance: quadratic background
    const sdh = shubnikovDeHaas(s.field, s.rhoXX, { minField: 0.45, maxField: 2.5, backgroundOrder: 2 });
    expect(sdh.ok).toBe(true);
    if (!sdh.ok) return;
    expect(rel(sdh.density, well.density)).toBeLessThan(0.01);
    const m = hallSdhMismatch(nHall, sdh.density);
    expect(Math.abs(m.mismatchPercent)).toBeGreaterThan(5);
    expect(m.parallelConduction).toBe(true);
  });
  it("does not flag a one-carrier sweep", () => {
    const s = twoCarrierSweep(fields, { well, oscillations: osc });
    const sdh = shubnikovDeHaas(s.field, s.rhoXX, { minField: 0.45, maxField: 2 });
    expect(sdh.ok).toBe(true);
    if (!sdh.ok) return;
    const m = hallSdhMismatch(hallFromLowField(s), sdh.density);
    expect(Math.abs(m.mismatchPercent)).toBeLessThan(1);
    expect(m.parallelConduction).toBe(false);
  });
  it("mismatch is signed relative to the SdH density and rejects non-positive input", () => {
    expect(hallSdhMismatch(1.1e15, 1e15).mismatchPercent).toBeCloseTo(10, 10);
    expect(hallSdhMismatch(1.04e15, 1e15).parallelConduction).toBe(false);
    expect(hallSdhMismatch(1.04e15, 1e15, 3).parallelConduction).toBe(true);
    expect(() => hallSdhMismatch(0, 1e15)).toThrow(RangeError);
  });
});
