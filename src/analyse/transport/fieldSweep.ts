/**
 * One field sweep → one transport point: symmetrise, Hall slope, sheet
 * density, zero-field sheet resistance, Hall mobility.
 *
 * Pipeline (each step in its own module): symmetriseField (Onsager–Casimir),
 * hallSlope + sheetDensity (Drude), zeroFieldValue, van der Pauw or Hall-bar
 * geometry, hallMobility. SI units throughout.
 */
import type { Sweep } from "../../validate/sweep.ts";
import type { AnalysisSettings } from "../../validate/settings.ts";
import { hallMobility, hallSlope, sheetDensity, type HallFit } from "./hallSlope.ts";
import { hallBarSheetResistance, zeroFieldValue } from "./sheetResistance.ts";
import { fieldBranches, symmetriseBranches } from "./symmetrise.ts";
import { vanDerPauwSheetResistance } from "./vanDerPauw.ts";

export interface DeviceGeometry {
  geometry: "hall-bar" | "van-der-pauw";
  length_um?: number;
  width_um?: number;
}

export interface TransportPoint {
  file: string;
  gate_V: number;
  temperature_K?: number;
  /** Sheet density, m⁻². */
  density: number;
  /** Hall mobility, m²/(V s). */
  mobility: number;
  /** Zero-field sheet resistance, Ω per square. */
  sheetResistance: number;
  hall: HallFit;
  symmetrised: boolean;
  /** Symmetrised traces on the |B| grid, for charts and later analyses (SdH). */
  trace: { b: Float64Array; rhoxx: Float64Array; rxy: Float64Array };
}

export type FieldSweepResult = { ok: true; point: TransportPoint } | { ok: false; file: string; reason: string };

export function analyseFieldSweep(sweep: Sweep, device: DeviceGeometry, settings: AnalysisSettings): FieldSweepResult {
  const fail = (reason: string): FieldSweepResult => ({ ok: false, file: sweep.file, reason });
  const branches = fieldBranches(sweep.x);
  const xy = symmetriseBranches(branches, sweep.rxy!, "odd");
  const hall = hallSlope(xy.b, xy.y, settings.hall_max_field, settings.hall_min_r2);
  if (!hall.ok) return fail(hall.reason);
  const density = sheetDensity(hall.fit.slope);
  let rhoxx: Float64Array;
  let sheetResistance: number;
  if (device.geometry === "hall-bar") {
    const xx = symmetriseBranches(branches, sweep.rxx!, "even");
    const scale = device.width_um! / device.length_um!;
    rhoxx = xx.y.map((v) => v * scale);
    sheetResistance = hallBarSheetResistance(zeroFieldValue(xx.b, xx.y), device.width_um!, device.length_um!);
    if (!sameGrid(xx.b, xy.b)) return fail("Rxx and Rxy traces do not share a field grid");
  } else {
    const a = symmetriseBranches(branches, sweep.ra!, "even");
    const b = symmetriseBranches(branches, sweep.rb!, "even");
    const ra0 = zeroFieldValue(a.b, a.y);
    const rb0 = zeroFieldValue(b.b, b.y);
    if (!(ra0 > 0 && rb0 > 0))
      return fail(
        `van der Pauw resistances at zero field must be positive (found R_A = ${ra0.toPrecision(4)} Ω, R_B = ${rb0.toPrecision(4)} Ω): check the contact configuration`,
      );
    sheetResistance = vanDerPauwSheetResistance(ra0, rb0);
    // Field dependence of ρ: scale the mean of R_A and R_B by the zero-field van der Pauw factor.
    const factor = sheetResistance / ((ra0 + rb0) / 2);
    rhoxx = a.y.map((v, i) => ((v + b.y[i]) / 2) * factor);
  }
  if (!(sheetResistance > 0) || !Number.isFinite(sheetResistance)) {
    return fail(`zero-field sheet resistance is ${sheetResistance.toPrecision(4)} Ω, not a positive number: the device may be insulating or a contact open`);
  }
  const mobility = hallMobility(density, sheetResistance);
  return {
    ok: true,
    point: {
      file: sweep.file,
      gate_V: sweep.gate_V ?? 0,
      temperature_K: sweep.temperature_K,
      density,
      mobility,
      sheetResistance,
      hall: hall.fit,
      symmetrised: xy.symmetrised,
      trace: { b: xy.b, rhoxx, rxy: xy.y },
    },
  };
}

function sameGrid(a: Float64Array, b: Float64Array): boolean {
  return a.length === b.length && a.every((v, i) => v === b[i]);
}
