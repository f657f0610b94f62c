/**
 * Integration: synthetic field and gate sweeps → file text → readTable →
 * validateSweep → analyseFieldSweep → analyseDeviceDepth, checked against the
 * parameters the sweeps were generated with (all values invented).
 */
import { describe, expect, it } from "vitest";
import { readTable } from "../../../src/read/table.ts";
import { validateSweep } from "../../../src/validate/sweep.ts";
import { analyseFieldSweep, type TransportPoint } from "../../../src/analyse/transport/fieldSweep.ts";
import { analyseDeviceDepth } from "../../../src/analyse/transport/deviceDepth.ts";
import { pointsCalibration, sortByGate, summariseDevice } from "../../../src/analyse/transport/deviceSummary.ts";
import { skipped } from "../../../src/analyse/transport/outcome.ts";
import { DEFAULT_SETTINGS } from "../../../src/validate/settings.ts";
import { formatSweep, hallSweepRows } from "../../../src/synth/hallSweep.ts";
import { oscillatingResistivity } from "../../../src/synth/quantumOscillations.ts";
import { twoCarrierResistivity } from "../../../src/synth/twoCarrier.ts";
import { gateSweeps } from "../../../src/synth/gateSweep.ts";
import { ELECTRON_MASS, ELEMENTARY_CHARGE } from "../../../src/physics/constants.ts";
import { gaussian } from "../../helpers/random.ts";

const rel = (a: number, b: number) => Math.abs(a / b - 1);
const device = { geometry: "hall-bar" as const, length_um: 100, width_um: 20 };
const settings = { ...DEFAULT_SETTINGS, sdh_min_field: 0.6 };
const C = ELEMENTARY_CHARGE * 5.6e15; // F/m², dn/dVg = 5.6e11 cm⁻²/V
const V_ON = 0.3;
const NP = 4.5e14; // m⁻²
const TAU_Q = 1.2e-12;
const GATES = [0.6, 0.75, 0.9, 1.05, 1.2, 1.35];

function mobility(n: number): number {
  return 12 * (n / 3e15) ** 0.8; // μ ∝ n^0.8, m²/(V s)
}

function fieldPoints(parallel?: { density: number; mobility: number }): TransportPoint[] {
  return GATES.map((vg, k) => {
    const n = (C * (vg - V_ON)) / ELEMENTARY_CHARGE;
    const mu = mobility(n);
    const osc = { quantumLifetime: TAU_Q, temperature: 1.6 };
    const rows = hallSweepRows({
      density: n,
      mobility: mu,
      ...device,
      maxField: 2,
      points: 801,
      noise: 2e-4,
      misalignment: 0.02,
      seed: 10 + k,
      oscillation: parallel ? undefined : (b) => oscillatingResistivity(b, { rho0: 1, density: n, ...osc }),
      override: parallel
        ? (B) => {
            const r = twoCarrierResistivity(B, { well: { density: n, mobility: mu }, parallel, oscillations: osc });
            return { rhoxx: r.rhoXX, rxy: -r.rhoXY };
          }
        : undefined,
    });
    const text = formatSweep({ gate: `${vg} V`, temperature: "1.6 K", current: "10 nA" }, rows);
    const r = analyseFieldSweep(validateSweep(readTable(text, `vg${k}.csv`), "hall-bar"), device, settings);
    if (!r.ok) throw new Error(r.reason);
    return r.point;
  });
}

function gateFiles(shift: number, field = "0 T") {
  const g = gaussian(5);
  const { up, down } = gateSweeps({
    capacitance: C,
    turnOnVoltage: V_ON,
    percolationDensity: NP,
    prefactor: 6.2e-3 / (3e15 - NP) ** 1.31,
    vgStart: 0.2,
    vgEnd: 1.4,
    steps: 161,
    hysteresisShift: shift,
    noise: { relative: 0.003, normal: g },
  });
  return (
    [
      ["up.csv", up],
      ["down.csv", down],
    ] as const
  ).map(([name, t]) => {
    const rows = t.gateVoltage.map((v, i) => [Number(v.toFixed(4)), t.resistance[i] * 5, 0.3 * g()]);
    return validateSweep(readTable(formatSweep({ field }, { header: ["Vg [V]", "Rxx [ohm]", "Rxy [ohm]"], rows }), name), "hall-bar");
  });
}

describe("analyseDeviceDepth on a synthetic one-carrier device", () => {
  const points = fieldPoints();
  const depth = analyseDeviceDepth(points, gateFiles(0.02), settings, device)!;
  it("recovers the gate capacitance, percolation density, exponent and hysteresis it was built with", () => {
    // C = e·dn/dVg (parallel-plate model; REFERENCES §9 units): 5.6e11 cm⁻²/V → 0.08972 µF/cm² (derived)
    expect(rel(depth.metrics.gate_capacitance, 0.0897)).toBeLessThan(0.01);
    // Percolation law σ = A(n − n_p)^1.31 (REFERENCES §8); n_p = 4.5e10 cm⁻², 0.3 % noise
    expect(rel(depth.metrics.percolation_density, 4.5e10)).toBeLessThan(0.05);
    // μ ∝ n^0.8 exactly in the model (REFERENCES §12 form)
    expect(depth.metrics.mobility_exponent).toBeCloseTo(0.8, 1);
    expect(rel(depth.metrics.gate_hysteresis, 0.02)).toBeLessThan(0.15);
  });
  it("finds SdH densities that agree with Hall (no parallel conduction) and a τ_q of the right size", () => {
    // n = g·e·f/h (REFERENCES §7); the one-carrier Hall and SdH densities agree
    expect(depth.metrics.hall_sdh_mismatch).toBeLessThan(2);
    expect(depth.parallelConduction).toEqual([]);
    expect(depth.points.filter((p) => p.sdh.ok).length).toBeGreaterThanOrEqual(3);
    // Least-squares fit of the LK form (REFERENCES §7, §14) to the generator's τ_q = 1.2 ps at 2e-4 noise: within 2 %
    expect(rel(depth.metrics.quantum_lifetime, 1.2)).toBeLessThan(0.02);
    // τ_t/τ_q with τ_t = μm*/e (REFERENCES §9) and the generator's τ_q: median over the points with a determined τ_q
    const ratios = depth.points
      .flatMap((p, i) => (p.scatteringTimeRatio !== undefined ? [(points[i].mobility * 0.19 * ELECTRON_MASS) / ELEMENTARY_CHARGE / TAU_Q] : []))
      .sort((a, b) => a - b);
    expect(ratios.length).toBeGreaterThanOrEqual(3);
    const mid = ratios.length % 2 ? ratios[(ratios.length - 1) / 2] : (ratios[ratios.length / 2 - 1] + ratios[ratios.length / 2]) / 2;
    expect(rel(depth.metrics.scattering_time_ratio, mid)).toBeLessThan(0.02);
  });
  it("skips the low-density points with too few periods, giving the reason", () => {
    const low = depth.points[0];
    expect(low.sdh.ok).toBe(false);
    if (!low.sdh.ok) expect(low.sdh.reason).toMatch(/period|slow swing|peak/);
  });
  it("derives τ_t = μm*/e at every point (REFERENCES §9 formula)", () => {
    depth.points.forEach((p, i) => {
      expect(p.derived.ok).toBe(true);
      if (p.derived.ok) expect(rel(p.derived.transportLifetime, (points[i].mobility * 0.19 * ELECTRON_MASS) / ELEMENTARY_CHARGE)).toBeLessThan(1e-12);
    });
  });
});

describe("analyseDeviceDepth outcomes", () => {
  it("flags a two-carrier (parallel channel) device through the device path", () => {
    const depth = analyseDeviceDepth(fieldPoints({ density: 1.2e15, mobility: 1.5 }), [], settings, device)!;
    expect(depth.metrics.hall_sdh_mismatch).toBeGreaterThan(5);
    expect(depth.parallelConduction.length).toBeGreaterThan(0);
  });
  it("does not use a gate sweep at non-zero field for percolation, and says so", () => {
    const depth = analyseDeviceDepth(fieldPoints(), gateFiles(0, "0.5 T"), settings, device)!;
    expect(depth.percolation.ok).toBe(false);
    expect(depth.gateSweeps.every((s) => !s.percolation.ok && /not at zero field/.test(s.percolation.reason))).toBe(true);
    expect(depth.hysteresis.ok).toBe(false);
    expect(depth.metrics.percolation_density).toBeUndefined();
  });
  it("reports missing gate sweeps and no points as reasons, not errors", () => {
    const depth = analyseDeviceDepth(fieldPoints().slice(0, 1), [], settings, device)!;
    expect(depth.calibration.ok).toBe(false);
    expect(depth.percolation.ok).toBe(false);
    expect(depth.hysteresis.ok).toBe(false);
    expect(analyseDeviceDepth([], [], settings, device)).toBeUndefined();
  });
});

describe("one gate calibration per device (pointsCalibration shared by summary and depth)", () => {
  const points = [...fieldPoints()].reverse();
  const gates = gateFiles(0.02);
  const cal = pointsCalibration(sortByGate(points));
  it("a calibration passed in gives exactly what each function computes itself", () => {
    const sorted = sortByGate(points);
    expect(analyseDeviceDepth(sorted, gates, settings, device, cal)).toEqual(analyseDeviceDepth(sorted, gates, settings, device));
    expect(summariseDevice(points, cal)).toEqual(summariseDevice(points));
    // Synthetic slope set above: dn/dVg = C/e = 5.6e15 m⁻²/V ([D] from the generator's parameters), within the 2e-4 noise.
    expect(cal.ok && rel(cal.slope, C / ELEMENTARY_CHARGE)).toBeLessThan(1e-3);
  });
  it("the passed calibration is the one used (no second fit)", () => {
    const none = skipped("calibration withheld for this check");
    const depth = analyseDeviceDepth(sortByGate(points), gates, settings, device, none)!;
    expect(depth.calibration).toBe(none);
    expect(depth.metrics.gate_capacitance).toBeUndefined();
    expect(summariseDevice(points, none)?.gateFitSkipped).toBe("calibration withheld for this check");
  });
});
