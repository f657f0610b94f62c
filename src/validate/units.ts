/**
 * Units: column units in measurement files, and quantities with units typed in
 * records, settings and targets.
 *
 * Column units come from a closed, documented list (docs/formats.md) so a typo
 * is caught rather than guessed. Quantities typed by people ("1.0e5 cm^2/(V s)",
 * "5e10 cm^-2", "0.6 V", "625 °C", "20 sccm") are read with the closed unit
 * table of src/physics/unitTable.ts and its grammar (unitGrammar.ts): each
 * side becomes base-dimension exponents and a factor, the dimensions must be
 * equal, never a silent assumption.
 */
import { normaliseUnit, normaliseUnitText, shortText, unitTextTooLong } from "./unitSpelling.ts";
import { convertUnit, dimensionText, readUnit, sameDimension } from "./unitGrammar.ts";
import { confusionOf, kindOf, suggestUnitName } from "./quantityKinds.ts";

export type Dimension = "field" | "resistance" | "voltage" | "current" | "temperature" | "angle" | "length" | "fraction" | "concentration" | "counts";

/** Factor to the SI (or base) unit of each dimension. */
export const COLUMN_UNITS: Record<Dimension, Record<string, number>> = {
  field: { T: 1, mT: 1e-3 },
  resistance: { ohm: 1, Ohm: 1, Ω: 1, kohm: 1e3, kOhm: 1e3, kΩ: 1e3, Mohm: 1e6, MOhm: 1e6, MΩ: 1e6 },
  voltage: { V: 1, mV: 1e-3, uV: 1e-6, µV: 1e-6, μV: 1e-6 },
  current: { A: 1, mA: 1e-3, uA: 1e-6, µA: 1e-6, μA: 1e-6, nA: 1e-9 },
  temperature: { K: 1, mK: 1e-3 },
  angle: { deg: 1 },
  length: { nm: 1, Å: 0.1, A: 0.1, um: 1e3, µm: 1e3 },
  fraction: { "1": 1, "at.%": 0.01, "%": 0.01 },
  concentration: { "cm^-3": 1, "cm-3": 1, "/cm^3": 1 },
  counts: { "": 1, "1": 1, counts: 1, cps: 1 },
};

/** Each dimension's accepted units, keyed by their one spelling (unitSpelling.ts). */
const BY_SPELLING = new Map<Dimension, Map<string, number>>();

/**
 * The factor to the base unit, or undefined when the unit is not accepted for
 * the dimension. Any lab spelling of an accepted unit is accepted (kΩ, kOhm,
 * µA, μA, uA, cm⁻³, cm-3); letter case otherwise counts (mT, not mt).
 */
export function unitFactor(dim: Dimension, unit: string): number | undefined {
  let table = BY_SPELLING.get(dim);
  if (!table) {
    table = new Map(Object.entries(COLUMN_UNITS[dim]).map(([u, f]) => [normaliseUnit(u), f]));
    BY_SPELLING.set(dim, table);
  }
  return table.get(normaliseUnit(unit));
}

export function acceptedUnits(dim: Dimension): string {
  return Object.keys(COLUMN_UNITS[dim])
    .filter((u) => u !== "")
    .join(", ");
}

/** A number literal whose digits are not all zero but which reads as 0 (below about 5e-324, the smallest number a double holds). */
function underflows(literal: string, value: number): boolean {
  return value === 0 && /[1-9]/.test(literal.replace(/[eE].*$/, ""));
}

const TOO_SMALL = "below the smallest number (about 5e-324), so it would read as 0; write 0 if zero is meant, or the value in a smaller unit";

/** "0.35 V" → { value: 0.35, unit: "V" }; returns undefined when the text is not number + unit. */
export function splitValueUnit(text: string): { value: number; unit: string } | undefined {
  if (unitTextTooLong(text)) return undefined;
  const m = /^([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)([\s\S]*)$/.exec(text.trim());
  if (!m) return undefined;
  const value = Number(m[1]);
  if (!Number.isFinite(value)) return undefined;
  return { value, unit: m[2].trim() };
}

export type QuantityResult = { ok: true; value: number } | { ok: false; expected: string; found: string };

/**
 * Parses "<number> <unit>" and converts it to `target` (a unit of the table,
 * "%" or "1"). Plain numbers are accepted only for dimensionless targets.
 */
export function parseQuantity(text: unknown, target: string): QuantityResult {
  const expected = target === "1" ? "a plain number" : `a value with a unit convertible to ${target}, such as "1 ${target}"`;
  if (typeof text === "number") {
    if (!Number.isFinite(text)) return { ok: false, expected, found: String(text) };
    if (target === "1") return { ok: true, value: text };
    return { ok: false, expected, found: `the bare number ${text} (no unit)` };
  }
  if (typeof text !== "string") return { ok: false, expected, found: typeof text };
  const long = unitTextTooLong(text);
  if (long) return { ok: false, expected, found: `${shortText(text)}, too long to be a quantity (${long})` };
  const t = text.trim();
  if (target === "1" || target === "%") {
    const m = /^([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(%?)$/.exec(t);
    if (!m) return { ok: false, expected: target === "%" ? 'a percentage such as "5 %"' : "a plain number", found: JSON.stringify(t) };
    const v = Number(m[1]);
    if (!Number.isFinite(v)) return { ok: false, expected, found: `${JSON.stringify(t)}, beyond the largest number (about 1.8e308)` };
    if (underflows(m[1], v)) return { ok: false, expected, found: `${JSON.stringify(t)}, ${TOO_SMALL}` };
    if (target === "%") return { ok: true, value: m[2] ? v : v * 100 };
    return { ok: true, value: m[2] ? v / 100 : v };
  }
  return quantityWithUnit(t, target, expected);
}

/** "<number> <unit>" → the number in `target` (a unit of the table's grammar). */
function quantityWithUnit(t: string, target: string, expected: string): QuantityResult {
  const to = readUnit(normaliseUnit(target));
  if (!to.ok) throw new Error(`parseQuantity: the target unit ${JSON.stringify(target)} is not readable: ${to.reason}`);
  const wanted = kindOf(to.unit);
  const offer = wanted ? `${wanted.name} is written in ${wanted.units.join(", ")}` : `write it in ${target}`;
  const m = /^([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)(?:\s+(.*))?$/.exec(normaliseUnitText(t));
  if (!m) return { ok: false, expected, found: `${JSON.stringify(t)}, which is not a known quantity (a number first, then its unit)` };
  const value = Number(m[1]);
  if (!Number.isFinite(value)) return { ok: false, expected, found: `${JSON.stringify(t)}, beyond the largest number (about 1.8e308)` };
  if (underflows(m[1], value)) return { ok: false, expected, found: `${JSON.stringify(t)}, ${TOO_SMALL}` };
  if (!m[2]) return { ok: false, expected, found: `${JSON.stringify(t)}, a number without its unit` };
  const from = readUnit(m[2]);
  if (!from.ok) {
    const hint = from.name === undefined ? undefined : suggestUnitName(from.name, wanted);
    return {
      ok: false,
      expected,
      found: `${JSON.stringify(t)}, which is not a known quantity (${from.reason}${hint ? `; did you mean "${hint}"?` : ""}; ${offer})`,
    };
  }
  if (!sameDimension(from.unit, to.unit)) {
    const is = kindOf(from.unit)?.name ?? `a quantity in ${dimensionText(from.unit.dim)}`;
    const why = confusionOf(is, wanted?.name);
    return {
      ok: false,
      expected,
      found: `${JSON.stringify(t)}, which has a different dimension (${is}, not ${wanted?.name ?? `one in ${dimensionText(to.unit.dim)}`}; ${why ? `${why}; ` : ""}${offer})`,
    };
  }
  const v = convertUnit(value, from.unit, to.unit);
  if (v === 0 && value !== 0) return { ok: false, expected, found: `${JSON.stringify(t)}, which in ${target} is below the smallest number (about 1e-308)` };
  if (!Number.isFinite(v)) return { ok: false, expected, found: `${JSON.stringify(t)}, beyond the largest number (about 1.8e308)` };
  return { ok: true, value: v };
}
