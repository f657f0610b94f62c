import { describe, expect, it } from "vitest";
import { hallMobility, hallSlope, sheetDensity } from "../../../src/analyse/transport/hallSlope.ts";
import { vanDerPauwSheetResistance } from "../../../src/analyse/transport/vanDerPauw.ts";
import { symmetriseField } from "../../../src/analyse/transport/symmetrise.ts";
import { ELEMENTARY_CHARGE } from "../../../src/physics/constants.ts";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("Hall slope and sheet density", () => {
  it("n = 1e11 cm⁻² ↔ dRxy/dB = 6241.509 Ω/T (REFERENCES §6, derived from n = 1/(e·slope))", () => {
    expect(1 / (ELEMENTARY_CHARGE * 1e15)).toBeCloseTo(6241.509, 3);
    expect(sheetDensity(6241.509) * 1e-4).toBeCloseTo(1e11, -4);
    expect(rel(sheetDensity(-6241.509), 1e15)).toBeLessThan(1e-7);
  });
  it("μ = 1e5 cm²/Vs at n = 1e11 cm⁻² ↔ ρ = 624.151 Ω/□ (REFERENCES §6, derived)", () => {
    expect(rel(hallMobility(1e15, 624.151), 10)).toBeLessThan(1e-6);
  });
  it("fits only |B| ≤ hall_max_field and reports R²", () => {
    const B = [-1, -0.5, -0.2, -0.1, 0, 0.1, 0.2, 0.5, 1];
    const rxy = B.map((b) => 6241.509 * b + (Math.abs(b) > 0.3 ? 500 * b ** 3 : 0));
    const r = hallSlope(B, rxy, 0.2, 0.995);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.fit.points).toBe(5);
      expect(r.fit.slope).toBeCloseTo(6241.509, 6);
      expect(r.fit.poor).toBe(false);
    }
  });
  it("refuses too few low-field points with a reason", () => {
    const r = hallSlope([0, 0.5, 1], [0, 1, 2], 0.2, 0.995);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/at least 3/);
  });
});

describe("van der Pauw sheet resistance", () => {
  it("symmetric case R_s = πR/ln 2: R_A = R_B = 100 Ω → 453.236 Ω (REFERENCES §6, derived from van der Pauw 1958)", () => {
    expect(vanDerPauwSheetResistance(100, 100)).toBeCloseTo(453.236, 3);
    expect(vanDerPauwSheetResistance(1, 1)).toBeCloseTo(Math.PI / Math.LN2, 12);
  });
  it("asymmetric case R_A = 100, R_B = 200 Ω → 652.850 Ω (REFERENCES §6, derived; vdP factor f = 0.96028)", () => {
    const rs = vanDerPauwSheetResistance(100, 200);
    expect(rs).toBeCloseTo(652.85, 2);
    expect(rs / ((Math.PI / Math.LN2) * 150)).toBeCloseTo(0.96028, 5);
    expect(vanDerPauwSheetResistance(200, 100)).toBeCloseTo(rs, 9);
  });
  it("solves strongly asymmetric squares and rejects non-positive resistances", () => {
    const rs = vanDerPauwSheetResistance(10, 1000);
    expect(Math.exp((-Math.PI * 10) / rs) + Math.exp((-Math.PI * 1000) / rs)).toBeCloseTo(1, 12);
    expect(() => vanDerPauwSheetResistance(0, 100)).toThrow(RangeError);
    expect(() => vanDerPauwSheetResistance(-1, 100)).toThrow(RangeError);
  });
});

describe("field symmetrisation (Onsager–Casimir; Büttiker 1986 via REFERENCES §6)", () => {
  it("removes misalignment mixing exactly on a symmetric grid", () => {
    const B = [-1, -0.5, 0, 0.5, 1];
    const rxx = B.map((b) => 100 + 10 * b * b + 0.05 * (-6000 * b));
    const rxy = B.map((b) => -6000 * b + 0.02 * (100 + 10 * b * b));
    const xx = symmetriseField(B, rxx, "even");
    const xy = symmetriseField(B, rxy, "odd");
    expect(Array.from(xx.b)).toEqual([0, 0.5, 1]);
    expect(Array.from(xx.y)).toEqual([100, 102.5, 110].map((v) => expect.closeTo(v, 10)));
    expect(Array.from(xy.y)).toEqual([0, -3000, -6000].map((v) => expect.closeTo(v, 10)));
    expect(xy.symmetrised).toBe(true);
  });
  it("interpolates a negative branch measured on other fields, and handles reversed sweeps", () => {
    const B = [1, 0.6, 0.2, -0.1, -0.3, -0.7, -1.1];
    const y = B.map((b) => 5 * b);
    const xy = symmetriseField(B, y, "odd");
    for (let i = 0; i < xy.b.length; i++) expect(xy.y[i]).toBeCloseTo(5 * xy.b[i], 10);
    expect(xy.b[0]).toBeCloseTo(0.2, 12);
  });
  it("passes a one-sign sweep through unsymmetrised", () => {
    const r = symmetriseField([0.1, 0.2, 0.3], [1, 2, 3], "odd");
    expect(r.symmetrised).toBe(false);
    expect(Array.from(r.y)).toEqual([1, 2, 3]);
  });
});
