/**
 * The closed table of units a person may type in a quantity (targets.yaml,
 * analysis settings, a record's growth block): each unit's dimension in SI
 * base units, its factor to the coherent SI unit, an offset for the two
 * temperature scales that have one, and the prefixes it takes. Nothing
 * outside this table is a unit, so a typo ("mcm", "MT" for a field) is
 * refused and reported rather than read as something else.
 *
 * Definitions: SI brochure, 9th edition (2019): prefixes (Table 7), derived
 * units (Table 4), units accepted for use with the SI (Table 8: min, h, L,
 * eV, bar, Å); the electronvolt from the exact elementary charge
 * (ELEMENTARY_CHARGE). Torr = 101325/760 Pa and atm = 101325 Pa by
 * definition; °F = (x + 459.67)·5/9 K.
 *
 * Standard gas flows have their own dimension, an amount of gas per time
 * (mol/s), not a volume per time: a standard cubic centimetre per minute
 * (sccm) is the gas that fills 1 cm³ per minute at the reference conditions
 * 0 °C (273.15 K) and 101.325 kPa, n = p0·V/(R·T0) with R = N_A·k (exact since
 * SI 2019): 1 sccm = 101325 × 1e-6 / (8.31446261815324 × 273.15) mol/min
 * = 4.4615e-5 mol/min; a standard litre per minute (slm, slpm) is 1000 sccm.
 * So an actual volume flow (L/min, cm³/min: a volume at whatever pressure and
 * temperature the gas had) is refused where a standard flow is expected
 * rather than read as one. The reference is 0 °C and 101.325 kPa, as most
 * mass-flow controllers are calibrated; a lab whose controllers use a 20 °C
 * (or 25 °C) reference must convert its readings (× 273.15/293.15 for 20 °C)
 * before writing them as sccm or slm.
 *
 * A factor is split into a mantissa and a power of ten (`decade`), and a
 * prefix is a power of ten, so conversions between decimal multiples
 * (mm → µm, slm → sccm) are exact powers of ten, not products of rounded
 * decimals.
 */
import { AVOGADRO, BOLTZMANN, ELEMENTARY_CHARGE } from "./constants.ts";

/** The SI base units a dimension is counted in, in this order. */
export const BASE_UNITS = ["m", "kg", "s", "A", "K", "mol"] as const;
/** Exponents of the base units (m, kg, s, A, K, mol). */
export type Exponents = readonly [number, number, number, number, number, number];

/** SI prefixes (as powers of ten) that some unit of the table takes; "u" is micro (µ and μ are brought to it first). */
export const PREFIXES: Readonly<Record<string, number>> = { f: -15, p: -12, n: -9, u: -6, m: -3, c: -2, h: 2, k: 3, M: 6, G: 9 };

export interface UnitDefinition {
  /** Dimension as exponents of BASE_UNITS. */
  dim: Exponents;
  /** Factor to the coherent SI unit is mantissa × 10^decade. */
  mantissa: number;
  decade: number;
  /** Temperature scales only: kelvin = (value + offset) × mantissa. */
  offset?: number;
  /** The prefixes the unit takes (keys of PREFIXES), "" for none. */
  prefixes: string;
}

const LENGTH: Exponents = [1, 0, 0, 0, 0, 0];
const MASS: Exponents = [0, 1, 0, 0, 0, 0];
const TIME: Exponents = [0, 0, 1, 0, 0, 0];
const CURRENT: Exponents = [0, 0, 0, 1, 0, 0];
const TEMPERATURE: Exponents = [0, 0, 0, 0, 1, 0];
const VOLTAGE: Exponents = [2, 1, -3, -1, 0, 0];
const RESISTANCE: Exponents = [2, 1, -3, -2, 0, 0];
const CAPACITANCE: Exponents = [-2, -1, 4, 2, 0, 0];
const FLUX_DENSITY: Exponents = [0, 1, -2, -1, 0, 0];
const ENERGY: Exponents = [2, 1, -2, 0, 0, 0];
const PRESSURE: Exponents = [-1, 1, -2, 0, 0, 0];
const FREQUENCY: Exponents = [0, 0, -1, 0, 0, 0];
const VOLUME: Exponents = [3, 0, 0, 0, 0, 0];
const AMOUNT: Exponents = [0, 0, 0, 0, 0, 1];
/** A standard gas flow: amount of gas per time (module comment). */
const STANDARD_FLOW: Exponents = [0, 0, -1, 0, 0, 1];
/** Molar gas constant R = N_A·k, J/(mol K), exact (SI 2019). */
const GAS_CONSTANT = AVOGADRO * BOLTZMANN;
/** mol/s of 1 sccm, over 1e-6: p0 × 1 cm³ / (R × T0) per 60 s at p0 = 101325 Pa, T0 = 273.15 K (module comment). */
const SCCM_MANTISSA = 101325 / (GAS_CONSTANT * 273.15 * 60);

const unit = (dim: Exponents, prefixes: string, mantissa = 1, decade = 0, offset?: number): UnitDefinition => ({
  dim,
  mantissa,
  decade,
  prefixes,
  ...(offset === undefined ? {} : { offset }),
});

/**
 * Every unit, by the spelling the unit text has after unitSpelling.ts
 * (normaliseUnit): micro as "u", Ω as "ohm", Å as "angstrom".
 */
export const UNITS: Readonly<Record<string, UnitDefinition>> = {
  m: unit(LENGTH, "pnumck"),
  angstrom: unit(LENGTH, "", 1, -10),
  g: unit(MASS, "umk", 1, -3),
  s: unit(TIME, "fpnum"),
  sec: unit(TIME, ""),
  second: unit(TIME, ""),
  seconds: unit(TIME, ""),
  min: unit(TIME, "", 60),
  minute: unit(TIME, "", 60),
  minutes: unit(TIME, "", 60),
  h: unit(TIME, "", 3600),
  hr: unit(TIME, "", 3600),
  hour: unit(TIME, "", 3600),
  hours: unit(TIME, "", 3600),
  A: unit(CURRENT, "pnumk"),
  K: unit(TEMPERATURE, "um"),
  degC: unit(TEMPERATURE, "", 1, 0, 273.15),
  degF: unit(TEMPERATURE, "", 5 / 9, 0, 459.67),
  V: unit(VOLTAGE, "numkM"),
  ohm: unit(RESISTANCE, "umkMG"),
  F: unit(CAPACITANCE, "fpnum"),
  T: unit(FLUX_DENSITY, "num"),
  eV: unit(ENERGY, "umkM", ELEMENTARY_CHARGE),
  J: unit(ENERGY, "umk"),
  Hz: unit(FREQUENCY, "kMG"),
  Pa: unit(PRESSURE, "mhkM"),
  bar: unit(PRESSURE, "m", 1, 5),
  torr: unit(PRESSURE, "m", 101325 / 760),
  Torr: unit(PRESSURE, "m", 101325 / 760),
  atm: unit(PRESSURE, "", 101325),
  L: unit(VOLUME, "um", 1, -3),
  l: unit(VOLUME, "um", 1, -3),
  mol: unit(AMOUNT, "umk"),
  sccm: unit(STANDARD_FLOW, "", SCCM_MANTISSA, -6),
  slm: unit(STANDARD_FLOW, "", SCCM_MANTISSA, -3),
  slpm: unit(STANDARD_FLOW, "", SCCM_MANTISSA, -3),
};

/**
 * Limits on a unit as typed (common practice: a unit that a person writes is a
 * few characters long). Texts beyond them are refused with a located message
 * before any pattern reads them, so no input can make the reading slow or deep.
 */
export const UNIT_LIMITS = {
  /** Characters of a unit text (a column header's "[…]", the unit of a quantity). */
  length: 200,
  /** Characters of the number a quantity starts with. */
  numberLength: 60,
  /** Brackets inside one another: "((m s))" is depth 2. */
  bracketDepth: 8,
  /** Largest integer power, in absolute value ("m^12"). */
  power: 12,
} as const;
