/**
 * The unit slip "width_um: 50 um": a key that names its unit (`_um`, `_nm`,
 * `_mm`) given a value with a unit as well. The message says the unit belongs
 * in the key, and gives the number to write, converted when the value was in
 * another unit ("width_um: 0.05 mm" → "width_um: 50").
 */
import { parseQuantity, splitValueUnit } from "./units.ts";

const KEY_UNITS: Record<string, string> = { um: "micrometres", nm: "nanometres", mm: "millimetres" };

export interface UnitSlip {
  message: string;
  expected: string;
  fix: string;
}

/** The slip for `key: value`, or undefined when the value is not a number with a unit or the key names no unit. */
export function unitInKey(key: string, value: unknown): UnitSlip | undefined {
  const m = /_(um|nm|mm)$/.exec(key);
  if (!m || typeof value !== "string") return undefined;
  const vu = splitValueUnit(value);
  if (!vu || vu.unit === "") return undefined;
  const unitName = KEY_UNITS[m[1]];
  const q = parseQuantity(value, m[1]);
  const number = q.ok ? Number(q.value.toPrecision(6)) : undefined;
  return {
    message: `the unit goes in the key, not the value: ${key} is in ${unitName}`,
    expected: `a plain number of ${unitName}, such as ${key}: ${number ?? vu.value}`,
    fix: number !== undefined ? `write ${key}: ${number}` : `write the length in ${unitName} as a plain number (${JSON.stringify(vu.unit)} is not a length)`,
  };
}
