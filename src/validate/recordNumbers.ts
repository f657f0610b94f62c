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
 * - Outside 0.5 µm … 20 mm (from e-beam-defined bars to whole-chip
 *   structures; common practice) they are read, with a warning.
 */
import { InputError, type Problem } from "../model/problem.ts";

/** Hard bounds of a device dimension, µm. */
export const DEVICE_UM_LIMITS = { min: 1e-3, max: 1e6 } as const;
/** The plausible range of a device dimension, µm; outside it a warning. */
export const DEVICE_UM_PLAUSIBLE = { min: 0.5, max: 20_000 } as const;

type LineOf = (field: string) => number | undefined;
interface Dimensions {
  length_um?: number;
  width_um?: number;
}

/** Throws for the first non-finite number in the record's fields (dotted path, as lineOfField reads it). */
export function checkFiniteNumbers(data: Record<string, unknown>, file: string, lineOf: LineOf): void {
  const visit = (value: unknown, field: string): void => {
    if (typeof value === "number" && !Number.isFinite(value)) {
      throw new InputError({ file, line: lineOf(field), field, message: "not a finite number", expected: "a finite number", found: String(value), fix: "write the measured value; .inf, .nan and numbers beyond about 1.8e308 are not values" });
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
      throw new InputError({ file, line: lineOf(field), field, message: "device dimension out of range", expected: `micrometres between ${DEVICE_UM_LIMITS.min} (1 nm) and ${DEVICE_UM_LIMITS.max.toExponential()} (1 m)`, found: String(v), fix: "give the dimension in micrometres, e.g. length_um: 100" });
    }
  });
}

/** Warnings for device lengths and widths outside DEVICE_UM_PLAUSIBLE (already within the hard bounds). */
export function deviceDimensionWarnings(devices: readonly Dimensions[], file: string, lineOf: LineOf): Problem[] {
  const out: Problem[] = [];
  devices.forEach((d, i) => {
    for (const key of ["length_um", "width_um"] as const) {
      const v = d[key];
      if (v === undefined || (v >= DEVICE_UM_PLAUSIBLE.min && v <= DEVICE_UM_PLAUSIBLE.max)) continue;
      const field = `devices[${i}].${key}`;
      out.push({ severity: "warning", file, line: lineOf(field), field, message: "unusual device dimension", expected: `micrometres between ${DEVICE_UM_PLAUSIBLE.min} and ${DEVICE_UM_PLAUSIBLE.max} (0.5 µm to 20 mm)`, found: String(v), fix: "check that the value is in micrometres" });
    }
  });
  return out;
}
