/**
 * Units: column units in measurement files, and quantities with units typed in
 * records, settings and targets.
 *
 * Column units come from a closed, documented list (docs/formats.md) so a typo
 * is caught rather than guessed. Quantities typed by people ("1.0e5 cm^2/(V s)",
 * "5e10 cm^-2", "0.6 V") are parsed and converted by mathjs; a dimension
 * mismatch is an error, never a silent assumption.
 */
import { createRequire } from "node:module";
import { normaliseUnit, normaliseUnitText } from "./unitSpelling.ts";

type MathUnit = typeof import("mathjs").unit;
let unitFn: MathUnit | undefined;
/**
 * mathjs's unit(), loaded on first use from the package's single-file build
 * (the same library and version as its ESM entry, which is ~1,000 modules and
 * cost seconds of start-up per build process and worker; the one-file build
 * loads in a fraction of that).
 */
function mathUnit(text: string): import("mathjs").Unit {
  unitFn ??= (createRequire(import.meta.url)("mathjs/lib/browser/math.js") as typeof import("mathjs")).unit;
  return unitFn(text);
}

export type Dimension = "field" | "resistance" | "voltage" | "current" | "temperature" | "angle" | "length" | "fraction" | "concentration" | "counts";

/** Factor to the SI (or base) unit of each dimension. */
export const COLUMN_UNITS: Record<Dimension, Record<string, number>> = {
  field: { T: 1, mT: 1e-3 },
  resistance: { ohm: 1, Ohm: 1, "Ω": 1, kohm: 1e3, kOhm: 1e3, "kΩ": 1e3, Mohm: 1e6, MOhm: 1e6, "MΩ": 1e6 },
  voltage: { V: 1, mV: 1e-3, uV: 1e-6, "µV": 1e-6, "μV": 1e-6 },
  current: { A: 1, mA: 1e-3, uA: 1e-6, "µA": 1e-6, "μA": 1e-6, nA: 1e-9 },
  temperature: { K: 1, mK: 1e-3 },
  angle: { deg: 1 },
  length: { nm: 1, "Å": 0.1, A: 0.1, um: 1e3, "µm": 1e3 },
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
  if (!table) BY_SPELLING.set(dim, (table = new Map(Object.entries(COLUMN_UNITS[dim]).map(([u, f]) => [normaliseUnit(u), f]))));
  return table.get(normaliseUnit(unit));
}

export function acceptedUnits(dim: Dimension): string {
  return Object.keys(COLUMN_UNITS[dim]).filter((u) => u !== "").join(", ");
}

/** "0.35 V" → { value: 0.35, unit: "V" }; returns undefined when the text is not number + unit. */
export function splitValueUnit(text: string): { value: number; unit: string } | undefined {
  const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$/.exec(text);
  if (!m) return undefined;
  const value = Number(m[1]);
  if (!Number.isFinite(value)) return undefined;
  return { value, unit: m[2] };
}

export type QuantityResult = { ok: true; value: number } | { ok: false; expected: string; found: string };

/**
 * Parses "<number> <unit>" and converts it to `target` (a mathjs unit string,
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
  const t = text.trim();
  if (target === "1" || target === "%") {
    const m = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(%?)$/.exec(t);
    if (!m) return { ok: false, expected: target === "%" ? "a percentage such as \"5 %\"" : "a plain number", found: JSON.stringify(t) };
    const v = Number(m[1]);
    if (!Number.isFinite(v)) return { ok: false, expected, found: `${JSON.stringify(t)}, beyond the largest number (about 1.8e308)` };
    if (target === "%") return { ok: true, value: m[2] ? v : v * 100 };
    return { ok: true, value: m[2] ? v / 100 : v };
  }
  try {
    const u = mathUnit(normaliseUnitText(t));
    const v = u.toNumber(normaliseUnitText(target));
    if (!Number.isFinite(v)) return { ok: false, expected, found: Number.isNaN(v) ? JSON.stringify(t) : `${JSON.stringify(t)}, beyond the largest number (about 1.8e308)` };
    return { ok: true, value: v };
  } catch (err) {
    const msg = (err as Error).message;
    const dimension = /do not match|not match/i.test(msg);
    return { ok: false, expected, found: dimension ? `${JSON.stringify(t)}, which has a different dimension` : `${JSON.stringify(t)}, which is not a known quantity` };
  }
}
