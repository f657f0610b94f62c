/**
 * Numbers in a wafer record that the schema's types cannot police: YAML reads
 * `.inf` and `1e999` as Infinity and `.nan` as NaN, all of type "number", and
 * a Hall bar's length and width enter the sheet resistance as W/L, so
 * `length_um: 1e-300` with `width_um: 1e300` gives an infinite resistance.
 *
 * - Every number in the record (outside `analysis:`, which settings.ts checks
 *   with its own messages) must be finite: error.
 * - A device's `length_um` and `width_um` must lie between 1 nm and 1 m
 *   (outside, no device can be meant: a typo or a unit slip): error.
 * - Outside 1 µm … 10 mm (Hall bars run from a few micrometres, e-beam
 *   defined, to millimetre-scale chip structures; common practice) they are
 *   read, with a warning that says what the value would be had it been typed
 *   in millimetres (`width_um: 0.05` → 50 µm) or nanometres, and what the slip
 *   does: the sheet resistance is R·W/L, so a width 1000× too small makes the
 *   mobility 1000× too large (a length, 1000× too small).
 */
import { InputError, type Problem } from "../model/problem.ts";

/** Hard bounds of a device dimension, µm. */
export const DEVICE_UM_LIMITS = { min: 1e-3, max: 1e6 } as const;
/** The plausible range of a device dimension, µm; outside it a warning. */
export const DEVICE_UM_PLAUSIBLE = { min: 1, max: 10_000 } as const;

type LineOf = (field: string) => number | undefined;
interface Dimensions {
  length_um?: number;
  width_um?: number;
}

/** Throws for the first non-finite number in the record's fields (dotted path, as lineOfField reads it). */
export function checkFiniteNumbers(data: Record<string, unknown>, file: string, lineOf: LineOf): void {
  const visit = (value: unknown, field: string): void => {
    if (typeof value === "number" && !Number.isFinite(value)) {
      throw new InputError({
        file,
        line: lineOf(field),
        field,
        message: "not a finite number",
        expected: "a finite number",
        found: String(value),
        fix: "write the measured value; .inf, .nan and numbers beyond about 1.8e308 are not values",
      });
    }
    if (Array.isArray(value)) value.forEach((v, i) => visit(v, `${field}[${i}]`));
    else if (value !== null && typeof value === "object") for (const [k, v] of Object.entries(value)) visit(v, field ? `${field}.${k}` : k);
  };
  for (const [k, v] of Object.entries(data)) if (k !== "analysis") visit(v, k);
}

/** Throws when a device's length or width lies outside DEVICE_UM_LIMITS. */
export function checkDeviceDimensions(devices: readonly Dimensions[], file: string, lineOf: LineOf): void {
  devices.forEach((d, i) => {
    for (const key of ["length_um", "width_um"] as const) {
      const v = d[key];
      if (v === undefined || (v >= DEVICE_UM_LIMITS.min && v <= DEVICE_UM_LIMITS.max)) continue;
      const field = `devices[${i}].${key}`;
      throw new InputError({
        file,
        line: lineOf(field),
        field,
        message: "device dimension out of range",
        expected: `micrometres between ${DEVICE_UM_LIMITS.min} (1 nm) and ${DEVICE_UM_LIMITS.max.toExponential()} (1 m)`,
        found: String(v),
        fix: "give the dimension in micrometres, e.g. length_um: 100",
      });
    }
  });
}

const plausible = (um: number) => um >= DEVICE_UM_PLAUSIBLE.min && um <= DEVICE_UM_PLAUSIBLE.max;
const round6 = (x: number) => Number(x.toPrecision(6));

/** What to write when `v` (read as µm) looks like millimetres or nanometres, and what the slip does to the figures. */
function dimensionFix(key: "length_um" | "width_um", v: number): { found: string; fix: string } {
  const effect = (factor: string) =>
    `${key === "width_um" ? "the width" : "the length"} enters the sheet resistance as ${key === "width_um" ? "W" : "1/L"} (R·W/L), so the mobility comes out ${factor}`;
  if (v < DEVICE_UM_PLAUSIBLE.min && plausible(v * 1000)) {
    return {
      found: `${v} (in millimetres that would be ${round6(v * 1000)} µm)`,
      fix: `if it was typed in millimetres, write ${key}: ${round6(v * 1000)}; as written, ${effect(key === "width_um" ? "1000× too large" : "1000× too small")}`,
    };
  }
  if (v > DEVICE_UM_PLAUSIBLE.max && plausible(v / 1000)) {
    return {
      found: `${v} (in nanometres that would be ${round6(v / 1000)} µm)`,
      fix: `if it was typed in nanometres, write ${key}: ${round6(v / 1000)}; as written, ${effect(key === "width_um" ? "1000× too small" : "1000× too large")}`,
    };
  }
  return { found: String(v), fix: "check that the value is in micrometres" };
}

/** Warnings for device lengths and widths outside DEVICE_UM_PLAUSIBLE (already within the hard bounds). */
export function deviceDimensionWarnings(devices: readonly Dimensions[], file: string, lineOf: LineOf): Problem[] {
  const out: Problem[] = [];
  devices.forEach((d, i) => {
    for (const key of ["length_um", "width_um"] as const) {
      const v = d[key];
      if (v === undefined || plausible(v)) continue;
      const field = `devices[${i}].${key}`;
      out.push({
        severity: "warning",
        file,
        line: lineOf(field),
        field,
        message: "unusual device dimension",
        expected: `micrometres between ${DEVICE_UM_PLAUSIBLE.min} and ${DEVICE_UM_PLAUSIBLE.max} (1 µm to 10 mm, the usual range of Hall bars)`,
        ...dimensionFix(key, v),
      });
    }
  });
  return out;
}
