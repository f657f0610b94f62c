/**
 * Number and unit formatting for pages. Templates never compute: every number
 * shown was formatted here, with its unit.
 */
import type { MetricSpec } from "./metricSpec.ts";

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/**
 * A unit as stored ("ueV", "uF/cm^2": the micro prefix written "u" in ASCII) with the micro sign µ
 * (U+00B5) instead, as the site prints it: "µeV", "µF/cm^2". Every other character is kept, so the
 * result still reads back in as input (src/validate/unitSpelling.ts takes µ, μ and u alike).
 */
export function microSign(unit: string): string {
  return unit.replace(/\bu([FVAme])/g, "µ$1");
}

/** "cm^2/(V s)" → "cm²/(V s)"; "uF/cm^2" → "µF/cm²"; "1" → "". */
export function prettyUnit(unit: string): string {
  if (unit === "1") return "";
  return microSign(unit.replace(/\^(-?\d+)/g, (_, e: string) => [...e].map((c) => SUPERSCRIPT[c] ?? c).join("")));
}

/**
 * v rounded to 6 significant digits, as a number: Number(v.toPrecision(6)),
 * e.g. 1234.5678 → 1234.57, 1.23456789e15 → 1.23457e15. Exported numbers
 * (charts, CSV/JSON exports, provenance) use it: six digits is well beyond any
 * measurement's precision and keeps files small. Non-finite values pass through
 * unchanged (NaN → NaN, ±Infinity → ±Infinity); each caller decides what a
 * non-finite value becomes (0, empty cell, null, or printed as is). −0 becomes 0.
 */
export function sig6(v: number): number {
  return Number(v.toPrecision(6));
}

/**
 * sig6(v) for a finite number; null for undefined, null, NaN and ±Infinity.
 * The form exported JSON uses (results.json, the summary export), where a
 * missing or non-finite figure is written as null.
 */
export function sig6OrNull(v: number | undefined | null): number | null {
  return v == null || !Number.isFinite(v) ? null : sig6(v);
}

/**
 * A count with its noun in the right number: countText(1, "wafer") → "1 wafer",
 * countText(0, "wafer") → "0 wafers", countText(2, "match", "matches") → "2 matches".
 * English plural: 1 takes the singular, every other count the plural.
 */
export function countText(n: number, singular: string, plural = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : plural}`;
}

/** Significant-digit formatting with engineering-friendly exponents: 1.23×10¹¹. */
export function formatNumber(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e4) {
    const s = v.toPrecision(digits);
    return s.includes("e") ? Number(s).toString() : s;
  }
  const [mant, exp] = v.toExponential(digits - 1).split("e");
  const e = String(Number(exp))
    .split("")
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join("");
  return `${mant}×10${e}`;
}

export function formatValue(v: number | undefined, spec: MetricSpec): string {
  if (v === undefined) return "—";
  const u = prettyUnit(spec.unit);
  return u ? `${formatNumber(v, spec.digits)} ${u}` : formatNumber(v, spec.digits);
}
