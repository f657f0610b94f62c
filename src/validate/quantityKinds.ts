/**
 * Names of the kinds of quantity a typed value may be, with the units a
 * message offers for each: "150 mV" given for a field is "a voltage, not a
 * magnetic field (T, mT)". A kind is found by its dimension, read from its
 * first unit through the same table and grammar as every typed value.
 */
import { normaliseUnit, suggestUnit } from "./unitSpelling.ts";
import { readUnit, type ParsedUnit } from "./unitGrammar.ts";
import { PREFIXES, UNITS } from "../physics/unitTable.ts";

/** [kind, the units offered in messages (as the site and labs write them)]. */
const KINDS: [string, string[]][] = [
  ["a length", ["m", "cm", "mm", "µm", "nm", "Å"]],
  ["a time", ["s", "ms", "µs", "ns", "ps", "min", "h"]],
  ["a temperature", ["K", "mK", "°C", "°F"]],
  ["a voltage", ["V", "mV", "µV", "kV"]],
  ["a current", ["A", "mA", "µA", "nA", "pA"]],
  ["a resistance", ["Ω", "mΩ", "kΩ", "MΩ"]],
  ["a magnetic field", ["T", "mT"]],
  ["an energy", ["eV", "meV", "µeV", "J"]],
  ["a pressure", ["Torr", "mTorr", "mbar", "Pa", "kPa", "bar", "atm"]],
  // Standard flows (sccm, slm: gas referenced to 0 °C and 101.325 kPa) are an amount of gas per time, not a
  // volume per time (src/physics/unitTable.ts), so an actual volume flow is refused where one is expected.
  ["a standard gas flow", ["sccm", "slm"]],
  ["an actual volume flow", ["L/min", "cm³/min", "m³/s"]],
  ["a growth rate", ["nm/min", "nm/s", "µm/h", "Å/s"]],
  ["a sheet density", ["cm⁻²", "m⁻²"]],
  ["a volume density", ["cm⁻³", "m⁻³"]],
  ["a density per volt", ["cm⁻²/V", "m⁻²/V"]],
  ["a mobility", ["cm²/(V s)", "m²/(V s)"]],
  ["a capacitance per area", ["µF/cm²", "nF/cm²", "F/m²"]],
  ["an electric field", ["MV/m", "V/m", "kV/cm", "V/nm"]],
  ["a capacitance", ["F", "µF", "nF", "pF"]],
  ["a volume", ["L", "mL", "cm³"]],
  ["a mass", ["kg", "g", "mg"]],
  ["a frequency", ["Hz", "kHz", "MHz"]],
];

/**
 * Why one kind is not another, and how to write it, where a person easily takes one for the other:
 * [found kind, wanted kind, the explanation a refusal adds].
 */
const CONFUSIONS: [string, string, string][] = [
  [
    "an actual volume flow",
    "a standard gas flow",
    "an actual volume flow depends on the gas's pressure and temperature and a standard flow does not: write the mass-flow controller's reading in sccm or slm (referenced to 0 °C and 101.325 kPa), or convert the volume flow, sccm = cm³/min × (p / 101.325 kPa) × (273.15 K / T)",
  ],
  [
    "a standard gas flow",
    "an actual volume flow",
    "a standard flow (sccm, slm) is an amount of gas, referenced to 0 °C and 101.325 kPa, not a volume at the gas's own pressure and temperature: convert it, cm³/min = sccm × (101.325 kPa / p) × (T / 273.15 K)",
  ],
];

/** The explanation a refusal adds when `found` is given where `wanted` is expected (CONFUSIONS), if any. */
export function confusionOf(found: string | undefined, wanted: string | undefined): string | undefined {
  return CONFUSIONS.find(([f, w]) => f === found && w === wanted)?.[2];
}

let byDimension: Map<string, [string, string[]]> | undefined;

/** The kind of quantity of a unit's dimension and its units, or undefined for a dimension no kind has. */
export function kindOf(unit: ParsedUnit): { name: string; units: string[] } | undefined {
  if (!byDimension) {
    byDimension = new Map();
    for (const [name, units] of KINDS) {
      const r = readUnit(normaliseUnit(units[0]));
      if (!r.ok) throw new Error(`quantityKinds: ${units[0]}: ${r.reason}`);
      byDimension.set(r.unit.dim.join(","), [name, units]);
    }
  }
  const found = byDimension.get(unit.dim.join(","));
  return found && { name: found[0], units: found[1] };
}

/** Every single unit of the table with every prefix it takes ("mT", "kohm", "sccm"): what a name typo is compared against. */
export function everyUnitName(): string[] {
  return Object.entries(UNITS).flatMap(([name, def]) => [name, ...[...def.prefixes].filter((p) => p in PREFIXES).map((p) => p + name)]);
}

/**
 * The unit most likely meant by an unknown name: first among the units of
 * the expected kind (normalised: "mt" → "mT"), then among all of the table.
 */
export function suggestUnitName(name: string, expected: { units: string[] } | undefined): string | undefined {
  const kindUnits = expected?.units.map((u) => normaliseUnit(u)) ?? [];
  const hint = suggestUnit(name, kindUnits) ?? suggestUnit(name, everyUnitName());
  if (hint === undefined) return undefined;
  // Shown as labs write it: the kind's own spelling where there is one (kohm → kΩ).
  const shown = expected?.units.find((u) => normaliseUnit(u) === hint);
  return shown ?? hint;
}
