import { describe, expect, it } from "vitest";
import { densityAtGate, densityCalibration } from "../../../src/analyse/transport/densityCalibration.ts";
import { gateHysteresis } from "../../../src/analyse/transport/gateHysteresis.ts";
import { mobilityPowerLaw } from "../../../src/analyse/transport/mobilityPowerLaw.ts";
import { gateSweeps } from "../../../src/synth/gateSweep.ts";
import { ELEMENTARY_CHARGE } from "../../../src/physics/constants.ts";
import { gaussian } from "../../helpers/random.ts";

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("densityCalibration (parallel-plate gate, n = C(Vg − V_on)/e)", () => {
  const c = 5e-4; // F/m² = 0.05 µF/cm²
  const vOn = 0.3;
  const vg = [0.6, 0.8, 1.0, 1.2, 1.4];
  const n = vg.map((v) => (c * (v - vOn)) / ELEMENTARY_CHARGE);
  it("recovers C and V_on exactly from exact data, in any order", () => {
    const r = densityCalibration(vg.slice().reverse(), n.slice().reverse());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(rel(r.capacitance, c)).toBeLessThan(1e-9);
    expect(r.turnOnVoltage).toBeCloseTo(vOn, 9);
    expect(densityAtGate(r, 1.0)).toBeCloseTo(n[2], -3);
    expect(r.capacitanceStdErr).toBeCloseTo(0, 12);
  });
  it("gives standard errors that cover the truth on noisy data", () => {
    const g = gaussian(3);
    const noisy = n.map((x) => x * (1 + 0.01 * g()));
    const r = densityCalibration(vg, noisy);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.turnOnVoltage - vOn)).toBeLessThan(4 * r.turnOnVoltageStdErr!);
    expect(Math.abs(r.capacitance - c)).toBeLessThan(4 * r.capacitanceStdErr!);
    expect(r.turnOnVoltageStdErr!).toBeGreaterThan(0);
  });
  it("two points: no standard errors; one gate voltage, NaN or empty: a reason", () => {
    const two = densityCalibration([0.6, 1.0], [n[0], n[2]]);
    expect(two.ok && two.capacitanceStdErr === null).toBe(true);
    expect(densityCalibration([1, 1], [n[0], n[1]]).ok).toBe(false);
    expect(densityCalibration([], []).ok).toBe(false);
    expect(densityCalibration([NaN, 1], [1e15, NaN]).ok).toBe(false);
    expect(() => densityCalibration([1], [])).toThrow(RangeError);
  });
});

describe("mobilityPowerLaw (μ ∝ n^α; REFERENCES §12: α = 1.5 is the unscreened remote-impurity limit)", () => {
  // rising branch μ ∝ n^1.5 up to a peak at 3e15 m⁻², then falling (interface roughness)
  const n = Array.from({ length: 30 }, (_, i) => 3e14 + 1.5e14 * i);
  const mu = n.map((x) => (x <= 3e15 ? 10 * (x / 3e15) ** 1.5 : 10 * (x / 3e15) ** -1));
  it("recovers α = 1.5 below the mobility peak (default window)", () => {
    const r = mobilityPowerLaw(n, mu);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.exponent).toBeCloseTo(1.5, 9);
    expect(r.window.rule).toBe("below mobility peak");
    expect(r.window.maxDensity).toBeCloseTo(3e15, -3);
    expect(rel(r.mobilityAtReference, 10 * (1 / 3) ** 1.5)).toBeLessThan(1e-9);
  });
  it("uses a given window (falling branch gives α = −1)", () => {
    const r = mobilityPowerLaw(n, mu, { densityRange: [3.2e15, 5e15] });
    expect(r.ok && r.exponent).toBeCloseTo(-1, 9);
  });
  it("skips when the mobility peaks at the lowest density, or with too few points", () => {
    const falling = n.map((x) => 1e16 / x);
    const r = mobilityPowerLaw(n, falling);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/peak/);
    expect(mobilityPowerLaw([1e15, 2e15], [1, 2]).ok).toBe(false);
    expect(mobilityPowerLaw([NaN, -1, 0], [1, 2, 3]).ok).toBe(false);
  });
});

describe("gateHysteresis", () => {
  const base = { capacitance: 1e-3, turnOnVoltage: 0.2, percolationDensity: 5e14, prefactor: 1e-3 / 2.5e15 ** 1.31, vgStart: 0, vgEnd: 1.2, steps: 121 };
  it("recovers a known 25 mV shift (gateSweep model), ignoring insulating points", () => {
    const { up, down } = gateSweeps({ ...base, hysteresisShift: 0.025 });
    const r = gateHysteresis(up, down);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // linear interpolation in ln R between 10 mV steps: within 1 %
    expect(rel(r.meanShift, 0.025)).toBeLessThan(0.01);
    expect(rel(r.maxShift, 0.025)).toBeLessThan(0.05);
    expect(r.points).toBeGreaterThan(20);
  });
  it("gives the same shift when the sweeps are recorded in reversed or shuffled order", () => {
    const { up, down } = gateSweeps({ ...base, hysteresisShift: -0.04 });
    const order = up.gateVoltage.map((_, i) => (i * 37) % up.gateVoltage.length);
    const shuffled = { gateVoltage: order.map((i) => up.gateVoltage[i]), resistance: order.map((i) => up.resistance[i]) };
    const reversedDown = { gateVoltage: down.gateVoltage.slice().reverse(), resistance: down.resistance.slice().reverse() };
    const r = gateHysteresis(shuffled, reversedDown);
    expect(r.ok && rel(r.meanShift, -0.04)).toBeLessThan(0.01);
  });
  it("zero shift without hysteresis; a reason when no conducting range overlaps", () => {
    const { up, down } = gateSweeps({ ...base });
    const r = gateHysteresis(up, down);
    expect(r.ok && Math.abs(r.meanShift)).toBeLessThan(1e-9);
    const insulating = { gateVoltage: [0, 0.1, 0.2], resistance: [1e12, -3e11, 1e12] };
    const s = gateHysteresis(insulating, insulating);
    expect(s.ok).toBe(false);
    expect(() => gateHysteresis({ gateVoltage: [1], resistance: [] }, insulating)).toThrow(RangeError);
  });
});
