/**
 * Transport-in-depth demo inputs: Shubnikov–de Haas oscillations for the field
 * sweeps, zero-field gate sweeps (up and down) for each Hall bar, and the
 * two-carrier override of the wafer with a parallel conducting channel.
 * All numbers are invented for the fictional lab.
 */
import { ELEMENTARY_CHARGE } from "../../src/physics/constants.ts";
import { gateSweeps } from "../../src/synth/gateSweep.ts";
import { formatSweep } from "../../src/synth/hallSweep.ts";
import { oscillatingResistivity } from "../../src/synth/quantumOscillations.ts";
import { seededGaussian } from "../../src/synth/random.ts";
import { twoCarrierResistivity } from "../../src/synth/twoCarrier.ts";
import type { DemoWafer } from "../generate-demo.ts";

/** Measurement temperature of the demo (as in the sweep metadata), K. */
const TEMPERATURE = 1.6;

/** Quantum lifetime of a wafer, s: about 1 ps, longer for cleaner wafers. */
export function quantumLifetime(w: DemoWafer): number {
  return 1.1e-12 * Math.sqrt(w.peakMobility / 1.2e5);
}

/** Percolation density of a wafer, m⁻²: lower for cleaner wafers. */
export function percolationDensity(w: DemoWafer): number {
  return 4.5e10 * (1.3e5 / w.peakMobility) * 1e4;
}

/** Multiplier of ρxx: LK + Dingle oscillations at the point's density (n in m⁻²). */
export function oscillationHook(w: DemoWafer, density: number): (absB: number) => number {
  const p = { rho0: 1, density, quantumLifetime: quantumLifetime(w), temperature: TEMPERATURE };
  return (b) => oscillatingResistivity(b, p);
}

/** ρxx, Rxy (electron sign) of the quantum well in parallel with the wafer's second channel. */
export function parallelChannelOverride(w: DemoWafer, density: number, mobility: number): (B: number) => { rhoxx: number; rxy: number } {
  const par = w.parallel!;
  const p = {
    well: { density, mobility },
    parallel: { density: par.density * 1e4, mobility: par.mobility * 1e-4 },
    oscillations: { quantumLifetime: quantumLifetime(w), temperature: TEMPERATURE },
  };
  return (B) => {
    const r = twoCarrierResistivity(B, p);
    return { rhoxx: r.rhoXX, rxy: -r.rhoXY };
  };
}

/**
 * Zero-field gate sweeps (up and down) of a Hall bar (L/W = 5) as CSV texts keyed
 * by file name. Percolation law through the wafer's peak point; a parallel
 * channel, when present, adds its conductance everywhere (the well then never
 * looks insulating). Rxy is instrument noise only (zero field).
 */
export function demoGateSweeps(w: DemoWafer, device: string, spread: number, seed: number): Record<string, string> {
  const g = seededGaussian(seed);
  const np = percolationDensity(w);
  const nPeak = w.peakDensity * 1e4;
  const sigmaPeak = nPeak * ELEMENTARY_CHARGE * w.peakMobility * 1e-4 * spread;
  const { up, down } = gateSweeps({
    capacitance: ELEMENTARY_CHARGE * w.gateSlope * 1e4,
    turnOnVoltage: w.turnOn,
    percolationDensity: np,
    prefactor: sigmaPeak / (nPeak - np) ** 1.31,
    vgStart: Math.round((w.turnOn - 0.1) * 100) / 100,
    vgEnd: 1.3,
    steps: 161,
    hysteresisShift: 0.01 + 0.02 * ((seed % 7) / 7),
    noise: { relative: 0.004, normal: g },
  });
  const sigmaPar = w.parallel ? w.parallel.density * 1e4 * ELEMENTARY_CHARGE * w.parallel.mobility * 1e-4 : 0;
  const out: Record<string, string> = {};
  for (const [name, t] of [
    ["gate_up.csv", up],
    ["gate_down.csv", down],
  ] as const) {
    const rows = t.gateVoltage.map((v, i) => {
      const r = t.resistance[i];
      const sigma = (r > 0 && r < 1e9 ? 1 / r : 0) + sigmaPar;
      const rho = sigma > 0 && (sigmaPar > 0 || (r > 0 && r < 1e9)) ? 1 / sigma : r;
      return [Number(v.toFixed(4)), Number((rho * 5).toPrecision(7)), Number((0.5 * g()).toPrecision(4))];
    });
    out[name] = formatSweep(
      { field: "0 T", temperature: `${TEMPERATURE} K`, current: "10 nA", device },
      { header: ["Vg [V]", "Rxx [ohm]", "Rxy [ohm]"], rows },
    );
  }
  return out;
}
