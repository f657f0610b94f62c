/**
 * Gate-sweep analyses of one device: the sheet conductance of every gate-sweep
 * point, its density from the Hall calibration (densityCalibration.ts), the
 * percolation fit (percolation.ts) on each zero-field sweep, and the up/down
 * hysteresis (gateHysteresis.ts).
 *
 * Sheet resistance of a gate-sweep point: Hall bar ρ = R_xx·W/L (W, L of the
 * device in wafer.md); van der Pauw square ρ from R_A, R_B (vanDerPauw.ts).
 * Points that are insulating (R ≤ 0, non-finite or above 1e9 Ω) get σ = 0 and
 * are left out of the fits, never breaking them.
 * Gate sweeps at a non-zero field are read but not used for percolation or
 * hysteresis (σ_xx at finite B is not the zero-field conductivity); the reason is
 * recorded. Units: n in m⁻², σ in S, ρ in Ω, V in V.
 */
import type { Sweep } from "../../validate/sweep.ts";
import type { AnalysisSettings } from "../../validate/settings.ts";
import { densityAtGate, type DensityCalibration } from "./densityCalibration.ts";
import type { DeviceGeometry } from "./fieldSweep.ts";
import { gateHysteresis, type GateHysteresis } from "./gateHysteresis.ts";
import { percolationFit, sheetConductance, type PercolationFit } from "./percolation.ts";
import { skipped, type Skipped } from "./outcome.ts";
import { vanDerPauwSheetResistance } from "./vanDerPauw.ts";
import { hallBarSheetResistance } from "./sheetResistance.ts";
import { fields } from "../bulk.ts";

/** |B| below which a gate sweep counts as taken at zero field, T. */
export const ZERO_FIELD_LIMIT = 1e-3;

export interface GateSweepDepth {
  file: string;
  direction: "up" | "down";
  field_T: number;
  /** Gate voltage as recorded, V. */
  gateVoltage: number[];
  /** Sheet resistance, Ω per square (huge or negative where insulating). */
  sheetResistance: number[];
  /** Density from the Hall calibration, m⁻² (empty without a calibration). */
  density: number[];
  /** Sheet conductance 1/ρ, S (0 where insulating). */
  conductivity: number[];
  /** Percolation fit of this sweep, or why it was not made. */
  percolation: PercolationFit | Skipped;
}

/** Sheet resistance (Ω/□) of every point of a gate sweep; NaN where the columns are missing. */
export function gateSweepSheetResistance(sweep: Sweep, device: DeviceGeometry): number[] {
  const out: number[] = [];
  for (let i = 0; i < sweep.rows; i++) {
    if (device.geometry === "hall-bar") {
      const r = sweep.rxx ? sweep.rxx[i] : Number.NaN;
      out.push(device.width_um && device.length_um ? hallBarSheetResistance(r, device.width_um, device.length_um) : Number.NaN);
    } else {
      const ra = sweep.ra?.[i] ?? Number.NaN;
      const rb = sweep.rb?.[i] ?? Number.NaN;
      out.push(ra > 0 && rb > 0 ? vanDerPauwSheetResistance(ra, rb) : -1);
    }
  }
  return out;
}

/**
 * Density, conductance and percolation fit of each gate sweep. Without a density
 * calibration every sweep is recorded with the reason and no fit.
 */
export function analyseGateSweeps(
  sweeps: Sweep[],
  device: DeviceGeometry,
  calibration: DensityCalibration | Skipped,
  settings: AnalysisSettings,
): GateSweepDepth[] {
  return sweeps.map((s) => {
    const rho = gateSweepSheetResistance(s, device);
    const sigma = rho.map((r) => sheetConductance(r));
    const field = s.field_T ?? 0;
    const base = { file: s.file, direction: s.direction, field_T: field, gateVoltage: Array.from(s.x), sheetResistance: rho, conductivity: sigma };
    if (!calibration.ok) {
      return { ...base, density: [], percolation: skipped(`no density calibration: ${calibration.reason}`) };
    }
    const density = base.gateVoltage.map((v) => densityAtGate(calibration, v));
    if (Math.abs(field) > ZERO_FIELD_LIMIT) {
      return { ...base, density, percolation: skipped(`taken at ${field} T, not at zero field: not used for the percolation fit`) };
    }
    const percolation = percolationFit(density, sigma, {
      maxDensity: settings.percolation_max_density ?? undefined,
      exponent: settings.percolation_exponent,
    });
    return { ...base, density, percolation };
  });
}

/**
 * The device's percolation result: the fit of the first zero-field up sweep
 * (ascending Vg, from the insulating side) that succeeded, else of any zero-field
 * sweep, else the first reason.
 */
export function devicePercolation(sweeps: GateSweepDepth[]): (PercolationFit & { file: string }) | Skipped {
  const ok = sweeps.filter((s) => s.percolation.ok);
  const pick = ok.find((s) => s.direction === "up") ?? ok[0];
  if (pick?.percolation.ok) return { ...pick.percolation, file: pick.file };
  if (sweeps.length === 0) return skipped("no gate sweeps for this device");
  return skipped(sweeps.map((s) => `${s.file}: ${(s.percolation as Skipped).reason}`).join("; "));
}

/** Hysteresis between the first zero-field up sweep and the first zero-field down sweep. */
export function deviceHysteresis(sweeps: GateSweepDepth[]): (GateHysteresis & { up: string; down: string }) | Skipped {
  const zero = sweeps.filter((s) => Math.abs(s.field_T) <= ZERO_FIELD_LIMIT);
  const up = zero.find((s) => s.direction === "up");
  const down = zero.find((s) => s.direction === "down");
  if (!up || !down) return skipped("needs a zero-field gate sweep in each direction (up and down)");
  const h = gateHysteresis(
    { gateVoltage: up.gateVoltage, resistance: up.sheetResistance },
    { gateVoltage: down.gateVoltage, resistance: down.sheetResistance },
  );
  return h.ok ? { ...h, up: up.file, down: down.file } : h;
}

/** The chart-only columns of a gate sweep (src/analyse/bulk.ts); gateVoltage stays: results.json counts the points by it. */
export const GATE_SWEEP_BULK = fields<GateSweepDepth>("sheetResistance", "density", "conductivity");
