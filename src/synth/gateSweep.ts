/**
 * Synthetic zero-field gate sweeps (up and down) of a Hall-bar field-effect
 * device, for the demo generator and tests.
 *
 * Density: parallel-plate gate, n(Vg) = C·(Vg − V_on)/e. Conductivity: the
 * percolation law σ = A·(n − n_p)^p above n_p (Tracy et al., PRB 79, 235307
 * (2009); p ≈ 1.31, Grassberger, Physica A 262, 251 (1999)). At or below n_p the
 * device is insulating: the recorded resistance alternates between a huge value
 * and a negative one (an open-circuit lock-in reading), as real instruments do.
 * Up sweep: Vg ascending. Down sweep: Vg descending, with the curve shifted by
 * `hysteresisShift` (V) along Vg, i.e. R_down(Vg) = R_up(Vg − shift).
 * Optional multiplicative noise from a caller-supplied standard-normal source.
 * Units: C in F/m², V in V, n in m⁻², σ in S, A in S·m^(2p), R in Ω.
 */
import { ELEMENTARY_CHARGE } from "../physics/constants.ts";

export interface GateSweepParams {
  /** Gate capacitance per area, F/m². */
  capacitance: number;
  /** Turn-on voltage (n = 0), V. */
  turnOnVoltage: number;
  /** Percolation density n_p, m⁻². */
  percolationDensity: number;
  /** Prefactor A, S·m^(2p). */
  prefactor: number;
  /** Exponent p (default 1.31). */
  exponent?: number;
  /** Sweep limits, V, and number of points per direction. */
  vgStart: number;
  vgEnd: number;
  steps: number;
  /** Vg shift of the down sweep, V (default 0). */
  hysteresisShift?: number;
  /** Resistance recorded when insulating, Ω (default 1e12). */
  insulatingResistance?: number;
  /** Relative noise on R and a standard-normal generator. */
  noise?: { relative: number; normal: () => number };
}

export interface GateSweepTrace {
  /** Gate voltage, V, in recorded order. */
  gateVoltage: number[];
  /** Sheet resistance, Ω (huge or negative where insulating). */
  resistance: number[];
  /** True density at each point, m⁻² (≤ 0 below turn-on). */
  density: number[];
}

function resistanceAt(vg: number, p: GateSweepParams, k: number): { r: number; n: number } {
  const n = (p.capacitance * (vg - p.turnOnVoltage)) / ELEMENTARY_CHARGE;
  if (n <= p.percolationDensity) {
    const big = p.insulatingResistance ?? 1e12;
    return { r: k % 2 === 0 ? big : -big / 3, n };
  }
  const sigma = p.prefactor * (n - p.percolationDensity) ** (p.exponent ?? 1.31);
  const noise = p.noise ? 1 + p.noise.relative * p.noise.normal() : 1;
  return { r: noise / sigma, n };
}

/** Up (ascending Vg) and down (descending Vg, shifted) sweeps. */
export function gateSweeps(p: GateSweepParams): { up: GateSweepTrace; down: GateSweepTrace } {
  const vs = Array.from({ length: p.steps }, (_, i) => p.vgStart + ((p.vgEnd - p.vgStart) * i) / (p.steps - 1));
  const shift = p.hysteresisShift ?? 0;
  const up: GateSweepTrace = { gateVoltage: [], resistance: [], density: [] };
  const down: GateSweepTrace = { gateVoltage: [], resistance: [], density: [] };
  vs.forEach((v, k) => {
    const a = resistanceAt(v, p, k);
    up.gateVoltage.push(v);
    up.resistance.push(a.r);
    up.density.push(a.n);
  });
  vs.slice()
    .reverse()
    .forEach((v, k) => {
      const a = resistanceAt(v - shift, p, k);
      down.gateVoltage.push(v);
      down.resistance.push(a.r);
      down.density.push(a.n);
    });
  return { up, down };
}
