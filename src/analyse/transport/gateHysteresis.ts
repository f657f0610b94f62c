/**
 * Gate hysteresis: the gate-voltage shift between an up and a down sweep of the
 * same device at equal resistance.
 *
 * Method: each sweep is sorted by Vg (any recorded order works) and restricted to
 * its conducting range, 0 < R ≤ maxResistance (default h/e² = 25.8 kΩ, the 2D
 * metal–insulator scale σ ~ e²/h). For every conducting point of the up sweep,
 * the down-sweep gate voltage with the same resistance is found by linear
 * interpolation in ln R (the crossing nearest in Vg when there are several);
 * shift = Vg_down − Vg_up (V). Crossings where the down sweep is flat
 * (|d ln R/dVg| below `minRelativeSlope`, default 5 %, of its steepest value)
 * are skipped: there the shift is ill-defined. Common practice for charge
 * trapping in gated heterostructures; no single published reference.
 */
import { VON_KLITZING } from "../../physics/constants.ts";
import { allFinite, skipped, type Skipped } from "./outcome.ts";
import { median } from "simple-statistics";

export interface SweepData {
  /** Gate voltage, V. */
  gateVoltage: ArrayLike<number>;
  /** Resistance (or sheet resistance), Ω. */
  resistance: ArrayLike<number>;
}

export interface HysteresisOptions {
  /** Upper resistance of the conducting range, Ω (default h/e²). */
  maxResistance?: number;
  /** Fewest matched points (default 3). */
  minPoints?: number;
  /** Smallest |d ln R/dVg| at a crossing, relative to the steepest (default 0.05). */
  minRelativeSlope?: number;
}

export interface GateHysteresis {
  ok: true;
  /** Mean of Vg_down − Vg_up at equal resistance, V. */
  meanShift: number;
  /** Median shift, V. */
  medianShift: number;
  /** Shift of largest magnitude (signed), V. */
  maxShift: number;
  points: number;
  /** Matched points: up-sweep Vg (V), resistance (Ω) and shift (V). */
  matches: { gateVoltage: number[]; resistance: number[]; shift: number[] };
}

function conducting(s: SweepData, rMax: number): { v: number[]; lnR: number[] } {
  if (s.gateVoltage.length !== s.resistance.length) {
    throw new RangeError(`gateHysteresis: ${s.gateVoltage.length} gate voltages, ${s.resistance.length} resistances`);
  }
  const idx: number[] = [];
  for (let i = 0; i < s.gateVoltage.length; i++) {
    const r = s.resistance[i];
    if (Number.isFinite(s.gateVoltage[i]) && Number.isFinite(r) && r > 0 && r <= rMax) idx.push(i);
  }
  idx.sort((a, b) => s.gateVoltage[a] - s.gateVoltage[b]);
  return { v: idx.map((i) => s.gateVoltage[i]), lnR: idx.map((i) => Math.log(s.resistance[i])) };
}

/**
 * Shift between up and down sweeps. Returns { ok: false, reason } when either sweep
 * has fewer than two conducting points or fewer than `minPoints` resistances
 * can be matched. Throws RangeError when a sweep's arrays differ in length.
 */
export function gateHysteresis(up: SweepData, down: SweepData, options: HysteresisOptions = {}): GateHysteresis | Skipped {
  const rMax = options.maxResistance ?? VON_KLITZING;
  const minPoints = Math.max(1, options.minPoints ?? 3);
  const u = conducting(up, rMax);
  const d = conducting(down, rMax);
  if (u.v.length < 2 || d.v.length < 2) return skipped("an up or down sweep has fewer than two conducting points");
  const slopes = d.v.slice(1).map((v, j) => (d.lnR[j + 1] - d.lnR[j]) / (v - d.v[j] || Number.NaN));
  const steepest = Math.max(0, ...slopes.filter(Number.isFinite).map(Math.abs));
  const minSlope = (options.minRelativeSlope ?? 0.05) * steepest;
  const gv: number[] = [];
  const rs: number[] = [];
  const shifts: number[] = [];
  u.v.forEach((vu, i) => {
    let best: number | null = null;
    for (let j = 0; j + 1 < d.v.length; j++) {
      const a = d.lnR[j] - u.lnR[i];
      const b = d.lnR[j + 1] - u.lnR[i];
      if (a * b > 0 || a === b || !(Math.abs(slopes[j]) >= minSlope) || steepest === 0) continue;
      const vd = d.v[j] + (a / (a - b)) * (d.v[j + 1] - d.v[j]);
      if (best === null || Math.abs(vd - vu) < Math.abs(best - vu)) best = vd;
    }
    if (best !== null && Number.isFinite(best)) {
      gv.push(vu);
      rs.push(Math.exp(u.lnR[i]));
      shifts.push(best - vu);
    }
  });
  if (shifts.length < minPoints) return skipped(`only ${shifts.length} equal-resistance points in the conducting range; need ${minPoints}`);
  const mean = shifts.reduce((s, v) => s + v, 0) / shifts.length;
  const medianShift = median(shifts);
  const maxShift = shifts.reduce((m, v) => (Math.abs(v) > Math.abs(m) ? v : m), 0);
  if (!allFinite(mean, medianShift, maxShift)) return skipped("hysteresis shift is not finite");
  return { ok: true, meanShift: mean, medianShift, maxShift, points: shifts.length, matches: { gateVoltage: gv, resistance: rs, shift: shifts } };
}
