/**
 * Unit spellings as labs write them, brought to one form before the unit
 * grammar (unitGrammar.ts) or the closed column-unit lists read them. The one place that knows that
 * `cm²/(V·s)`, `cm2/Vs`, `cm^2/(V*s)` and `cm^2 V^-1 s^-1` are the same unit.
 *
 * A leading number is left alone, except that the form the site prints,
 * "1.23×10⁵" (or "1.23 x 10^5"), becomes "1.23e5". Rules, applied in order
 * to the unit text:
 *  - no-break and thin spaces → space; U+2212 minus → "-";
 *  - Ω (U+03A9) and the ohm sign (U+2126) → "ohm"; "Ohm", "OHM", "ohms" → "ohm"
 *    (a prefix keeps its case: kOhm → kohm, MΩ → Mohm, mΩ → mohm);
 *  - µ (micro sign U+00B5) and μ (Greek mu U+03BC) → the prefix "u";
 *  - Å → "angstrom";
 *  - "·", "⋅", "×" and a dot between two letters (V.s) → multiplication;
 *  - superscripts (cm⁻², m²) → "^-2", "^2"; a unit followed directly by a
 *    power (cm2, cm-2, V-1) → "cm^2", "cm^-2", "V^-1";
 *  - "Vs" → "(V s)"; after the last slash, units multiplied together are all in
 *    the denominator, as labs mean them: cm²/V·s → cm^2/(V s), cm^2/V*s → cm^2/(V*s)
 *    (the strict reading, cm²·s/V, would fail the dimension check anyway);
 *  - a unit starting "1/" → "/" (the grammar reads "5 /cm^2": an empty numerator);
 *  - "per square": "/sq", "/□", "/square" and a trailing " sq" are dropped
 *    (sheet resistance has the dimension of a resistance).
 * Letter case is otherwise kept: "mT" and "MT" are different units, and a
 * wrong case is reported with a suggestion (suggestUnit), never guessed.
 */
import { UNIT_LIMITS } from "../physics/unitTable.ts";
import { didYouMean } from "../model/problem.ts";

const SUPERSCRIPT_DIGITS: Record<string, string> = {
  "⁰": "0",
  "¹": "1",
  "²": "2",
  "³": "3",
  "⁴": "4",
  "⁵": "5",
  "⁶": "6",
  "⁷": "7",
  "⁸": "8",
  "⁹": "9",
  "⁻": "-",
};

/** The number a quantity starts with (kept as written, so "1e5" is never read as a unit). */
const LEADING_NUMBER = /^\s*[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?/;

/** A number in the form the site prints, "1.23×10⁵" (also "1.23 x 10^5"): mantissa, then the exponent after a caret or in superscript. */
const TIMES_TEN = /^(\s*[-+]?(?:\d+(?:\.\d*)?|\.\d+))\s*[×xX·*]\s*10(?:\^([-+\u2212]?\d+)|([⁻]?[⁰¹²³⁴⁵⁶⁷⁸⁹]+))/;

/** Brings a unit (or "<number> <unit>") to the spelling the unit grammar and the column lists use. */
export function normaliseUnitText(text: string): string {
  // Beyond the limits no pattern runs: the caller refuses the text (unitTextTooLong) with its location.
  if (unitTextTooLong(text)) return text;
  text = text.replace(TIMES_TEN, (_, mantissa: string, caret: string | undefined, sup: string | undefined) =>
    `${mantissa}e${caret ?? [...sup!].map((c) => SUPERSCRIPT_DIGITS[c]).join("")}`.replace("\u2212", "-"),
  );
  const number = LEADING_NUMBER.exec(text)?.[0] ?? "";
  const unit = normaliseUnit(text.slice(number.length));
  return number ? `${number.trim()} ${unit}`.trim() : unit;
}

/** Brings a unit alone (a column header's "[…]", a metadata unit) to its one spelling. */
export function normaliseUnit(text: string): string {
  if (text.length > UNIT_LIMITS.length) return text;
  // Each run of white space becomes one space first, so no pattern below meets a long run (they stay linear).
  let u = text
    .replace(/\s+/g, " ")
    .replace(/\u2212/g, "-")
    .replace(/[Ω\u2126]/g, "ohm")
    .replace(/[µμ]/g, "u")
    .replace(/Å/g, "angstrom")
    .replace(/[·⋅×]/g, " ")
    .replace(/([A-Za-z])\.(?=[A-Za-z])/g, "$1 ")
    .replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+/g, (s) => "^" + [...s].map((c) => SUPERSCRIPT_DIGITS[c]).join(""))
    .trim();
  u = u.replace(/(?<![A-Za-z])([A-Za-z]?)ohms?(?![A-Za-z])/gi, (_, prefix: string) => `${prefix}ohm`);
  // Per square: Ω/sq, Ω/□, ohm per square.
  u = u.replace(/ ?(?:\/ ?(?:sq|□|square)| (?:sq|□)| per square)$/i, "");
  // cm2, cm-2, V-1 (a power written without the caret), each followed by a space so "cm2V-1s-1" splits.
  u = u.replace(/(?<![A-Za-z^])([A-Za-z]+)(-?\d+)(?![\d.])/g, (_, name: string, power: string) => `${name}^${power} `);
  u = u.replace(/(?<![A-Za-z])Vs(?![A-Za-z])/g, "(V s)");
  u = u.replace(/^1\s*\//, "/");
  u = u
    .replace(/\s+/g, " ")
    .replace(/\s*([/*^])\s*/g, "$1")
    .trim();
  // After the last slash, units multiplied together are all in the denominator: cm²/V·s = cm²/(V·s).
  return u.replace(/\/([^/()]*[ *][^/()]*)$/, "/($1)");
}

/**
 * Why a unit text (or "<number> <unit>") is too long to read, or undefined when it is not:
 * longer than UNIT_LIMITS.length characters, or a number of more than UNIT_LIMITS.numberLength.
 * Checked without any pattern, so it is quick on any input.
 */
export function unitTextTooLong(text: string): string | undefined {
  if (text.length > UNIT_LIMITS.length) return `${text.length} characters, more than the ${UNIT_LIMITS.length} a unit may have`;
  let digits = 0;
  let longest = 0;
  for (const c of text) {
    digits = (c >= "0" && c <= "9") || c === "." ? digits + 1 : 0;
    longest = Math.max(longest, digits);
  }
  if (longest > UNIT_LIMITS.numberLength) return `a number of ${longest} digits, more than the ${UNIT_LIMITS.numberLength} a number may have`;
  return undefined;
}

/** A long text shown in a message: its start and its length. */
export function shortText(text: string): string {
  return text.length <= 60 ? JSON.stringify(text) : `${JSON.stringify(text.slice(0, 40))}… (${text.length} characters)`;
}

/**
 * The accepted unit the lab most likely meant: the same letters in another
 * case ("mt" → "mT"), else, for a name of three letters or more, the nearest
 * by edit distance ("kOmh" → "kOhm"); undefined when none is close.
 */
export function suggestUnit(unit: string, accepted: readonly string[]): string | undefined {
  const sameLetters = accepted.find((a) => a.toLowerCase() === unit.toLowerCase());
  if (sameLetters !== undefined) return sameLetters;
  // Edit distance only for longer names: two-letter units are all near one another (mV, mT, kΩ).
  const real = accepted.filter((a) => a.length >= 2);
  return unit.length >= 3 ? didYouMean(unit, real) : undefined;
}
