// Every unit spelling waferbook accepts in a typed quantity (targets.yaml, analysis settings, a key
// naming its unit, the growth block), with the value it must give. Written before mathjs was
// replaced by the closed unit table (src/physics/unitTable.ts, read by src/validate/unitGrammar.ts)
// and run against both: the list is what "accepted" means. Expected values are written out by hand from the unit definitions
// (SI brochure, 9th ed.: prefixes, derived units, °C = K − 273.15, L = 1e-3 m³, min = 60 s,
// h = 3600 s, Å = 1e-10 m, e = 1.602176634e-19 C exact: confirmed; torr = 101325/760 Pa and
// bar = 1e5 Pa: from memory; °F = (x − 32)·5/9 °C: from memory). Nothing is computed by the code
// under test.
import { describe, expect, it } from "vitest";
import { readGrowth } from "../../src/validate/growth.ts";
import { parseQuantity } from "../../src/validate/units.ts";

/** [typed text, target unit, value in the target unit (by hand)]. */
const SPELLINGS: [string, string, number][] = [
  // Length
  ["2 m", "m", 2],
  ["2 cm", "m", 2e-2],
  ["2 mm", "m", 2e-3],
  ["2 um", "m", 2e-6],
  ["2 µm", "m", 2e-6],
  ["2 μm", "m", 2e-6],
  ["2 nm", "m", 2e-9],
  ["2 pm", "m", 2e-12],
  ["2 km", "m", 2e3],
  ["2 Å", "m", 2e-10],
  ["2 angstrom", "m", 2e-10],
  ["0.05 mm", "um", 50],
  ["2 mm", "nm", 2e6],
  ["2 um", "mm", 2e-3],
  ["2 nm", "nm", 2],
  // Time
  ["2 s", "s", 2],
  ["2 ms", "s", 2e-3],
  ["2 us", "s", 2e-6],
  ["2 µs", "s", 2e-6],
  ["2 ns", "s", 2e-9],
  ["2 ps", "s", 2e-12],
  ["2 fs", "s", 2e-15],
  ["2 min", "s", 120],
  ["2 h", "s", 7200],
  ["2 ps", "ps", 2],
  // Temperature
  ["2 K", "K", 2],
  ["2 mK", "K", 2e-3],
  ["2 degC", "K", 275.15],
  ["300 K", "degC", 26.85],
  ["2 degC", "degC", 2],
  // Voltage, current, resistance
  ["2 V", "V", 2],
  ["2 mV", "V", 2e-3],
  ["2 uV", "V", 2e-6],
  ["2 µV", "V", 2e-6],
  ["2 μV", "V", 2e-6],
  ["2 nV", "V", 2e-9],
  ["2 kV", "V", 2e3],
  ["-2 V", "V", -2],
  ["+2 V", "V", 2],
  [".5 V", "V", 0.5],
  ["2e-3 V", "V", 2e-3],
  ["1.23×10⁵ V", "V", 1.23e5],
  ["1.23 x 10^5 V", "V", 1.23e5],
  ["2 A", "A", 2],
  ["2 mA", "A", 2e-3],
  ["2 uA", "A", 2e-6],
  ["2 nA", "A", 2e-9],
  ["2 pA", "A", 2e-12],
  ["2 ohm", "ohm", 2],
  ["2 Ohm", "ohm", 2],
  ["2 Ω", "ohm", 2],
  ["2 \u2126", "ohm", 2],
  ["2 ohms", "ohm", 2],
  ["2 mΩ", "ohm", 2e-3],
  ["2 mohm", "ohm", 2e-3],
  ["2 kohm", "ohm", 2e3],
  ["2 kOhm", "ohm", 2e3],
  ["2 kΩ", "ohm", 2e3],
  ["2 MΩ", "ohm", 2e6],
  ["2 Mohm", "ohm", 2e6],
  ["2 Gohm", "ohm", 2e9],
  ["2 Ω/sq", "ohm", 2],
  ["2 Ω/□", "ohm", 2],
  ["2 Ohm/sq", "ohm", 2],
  ["2 ohm per square", "ohm", 2],
  // Magnetic field
  ["2 T", "T", 2],
  ["2 mT", "T", 2e-3],
  ["150 mT", "T", 0.15],
  // Capacitance per area
  ["2 uF/cm^2", "F/m^2", 2e-2],
  ["2 µF/cm²", "F/m^2", 2e-2],
  ["2 μF/cm²", "F/m^2", 2e-2],
  ["2 nF/cm^2", "F/m^2", 2e-5],
  ["2 F/m^2", "uF/cm^2", 200],
  ["2 uF/cm^2", "uF/cm^2", 2],
  // Energy (eV = 1.602176634e-19 J exactly)
  ["2 eV", "eV", 2],
  ["2 meV", "eV", 2e-3],
  ["2 ueV", "eV", 2e-6],
  ["2 µeV", "eV", 2e-6],
  ["8 µeV", "ueV", 8],
  ["2 meV", "ueV", 2e3],
  ["2 keV", "eV", 2e3],
  ["2 eV", "J", 2 * 1.602176634e-19],
  ["2 J", "eV", 2 / 1.602176634e-19],
  // Electric field
  ["2 MV/m", "MV/m", 2],
  ["2 V/m", "MV/m", 2e-6],
  ["2 V/nm", "MV/m", 2e3],
  ["2 kV/cm", "MV/m", 0.2],
  ["2 mV/nm", "MV/m", 2],
  // Densities
  ["2 cm^-2", "m^-2", 2e4],
  ["2 1/cm^2", "m^-2", 2e4],
  ["2 /cm^2", "m^-2", 2e4],
  ["2 /cm2", "m^-2", 2e4],
  ["2 cm-2", "m^-2", 2e4],
  ["2 cm⁻²", "m^-2", 2e4],
  ["2 cm\u22122", "m^-2", 2e4],
  ["2 m^-2", "cm^-2", 2e-4],
  ["2 1/m^2", "cm^-2", 2e-4],
  ["2.5e11 cm^-2", "cm^-2", 2.5e11],
  ["2 cm^-2/V", "m^-2/V", 2e4],
  ["2 cm−2/V", "m^-2/V", 2e4],
  ["2 cm^-2 V^-1", "m^-2/V", 2e4],
  ["2 cm^-3", "m^-3", 2e6],
  ["2 cm-3", "m^-3", 2e6],
  ["2 cm⁻³", "m^-3", 2e6],
  ["2 1/cm^3", "m^-3", 2e6],
  ["1e18 cm^-3", "cm^-3", 1e18],
  // Mobility, cm²/(V s) = 1e-4 m²/(V s)
  ["2 cm^2/(V s)", "m^2/(V s)", 2e-4],
  ["2 cm^2/Vs", "m^2/(V s)", 2e-4],
  ["2 cm2/Vs", "m^2/(V s)", 2e-4],
  ["2 cm²/(V·s)", "m^2/(V s)", 2e-4],
  ["2 cm^2/(V*s)", "m^2/(V s)", 2e-4],
  ["2 cm²/(V s)", "m^2/(V s)", 2e-4],
  ["2 cm²/V·s", "m^2/(V s)", 2e-4],
  ["2 cm2/V.s", "m^2/(V s)", 2e-4],
  ["2 cm^2 V^-1 s^-1", "m^2/(V s)", 2e-4],
  ["2 cm2V-1s-1", "m^2/(V s)", 2e-4],
  ["2 cm² V⁻¹ s⁻¹", "m^2/(V s)", 2e-4],
  ["2 m^2/Vs", "m^2/(V s)", 2],
  ["2 cm^2 /(V s)", "cm^2/(V s)", 2],
  ["1.0e5 cm^2/(V s)", "cm^2/(V s)", 1e5],
  ["2 m^2/(V s)", "cm^2/(V s)", 2e4],
  // Growth units through parseQuantity's own targets
  ["2 nm/min", "nm/min", 2],
  ["2 nm/s", "nm/min", 120],
  ["2 um/h", "nm/min", 2e3 / 60],
  ["2 Å/s", "nm/min", 12],
  ["2 cm^3/min", "cm^3/min", 2],
  ["2 cm3/min", "cm^3/min", 2],
  ["2 mL/min", "cm^3/min", 2],
  ["2 L/min", "cm^3/min", 2e3],
  ["2 torr", "torr", 2],
  ["2 mbar", "torr", (2 * 100 * 760) / 101325],
  ["2 Pa", "torr", (2 * 760) / 101325],
  ["2 kPa", "torr", (2e3 * 760) / 101325],
  ["2 bar", "Pa", 2e5],
];

// The torr rows (mbar, Pa, kPa → torr) and eV ↔ J were within 1e-5 only under mathjs (its torr is 133.322 Pa,
// its eV the CODATA 2010 value); the unit table uses the definitions, so every row now holds to 1e-12.

describe("every accepted spelling gives its SI value", () => {
  it.each(SPELLINGS)("%s → %s = %d", (text, target, expected) => {
    const r = parseQuantity(text, target);
    expect(r, JSON.stringify(r)).toMatchObject({ ok: true });
    if (!r.ok) return;
    expect(Math.abs(r.value / expected - 1)).toBeLessThanOrEqual(1e-12);
    // A no-break space between number and unit, as pasted from a document.
    const nbsp = parseQuantity(text.replace(" ", "\u00a0"), target);
    expect(nbsp.ok && nbsp.value).toBe(r.value);
  });
});

/** Growth quantities as growers write them: [field, text, value in the unit shown (°C, nm/min, Torr, sccm, s)], by hand. */
const GROWTH: ["temperature" | "rate" | "pressure" | "flow" | "time", string, number][] = [
  ["temperature", "625 °C", 625],
  ["temperature", "625 ° C", 625],
  ["temperature", "625 degC", 625],
  ["temperature", "898.15 K", 625],
  ["temperature", "1157 °F", 625],
  ["rate", "12 nm/min", 12],
  ["rate", "0.2 nm/s", 12],
  ["rate", "0.72 um/h", 12],
  ["rate", "0.72 µm/h", 12],
  ["rate", "2 Å/s", 12],
  ["pressure", "10 Torr", 10],
  ["pressure", "10 torr", 10],
  ["pressure", "13.3322368421 mbar", 10],
  ["pressure", "1333.22368421 Pa", 10],
  // Standard flows only: an actual volume flow (cm³/min, L/min) is refused (test/validate/standardFlow.test.ts).
  ["flow", "20 sccm", 20],
  ["flow", "0.5 slm", 500],
  ["flow", "0.5 slpm", 500],
  ["time", "60 s", 60],
  ["time", "2 min", 120],
  ["time", "0.5 h", 1800],
];

describe("growth quantities", () => {
  const where = { file: "wafers/W-1/wafer.md", lineOf: () => undefined, stackNames: [] };
  it.each(GROWTH)("%s: %s = %d in the shown unit", (field, text, expected) => {
    const layer: Record<string, unknown> = { layer: "well" };
    if (field === "flow") layer.flows = { SiH4: text };
    else if (field !== "time") layer[field] = text;
    const g = readGrowth(field === "time" ? { anneals: [{ name: "a", temperature: "800 °C", time: text }] } : { layers: [layer] }, where)!;
    const value =
      field === "time"
        ? g.anneals[0].time_s
        : field === "flow"
          ? g.layers[0].flows_sccm[0][1]
          : field === "temperature"
            ? g.layers[0].temperature_C
            : field === "rate"
              ? g.layers[0].rate_nm_per_min
              : g.layers[0].pressure_Torr;
    // Stored to 12 significant digits; the mbar and Pa rows were written to 12 digits by hand.
    expect(Math.abs(value! / expected - 1)).toBeLessThan(field === "pressure" ? 1e-5 : 1e-11);
  });
});

/** Refused, and for which reason. */
const REFUSED: [string, string, RegExp][] = [
  ["2 kg", "ohm", /different dimension/],
  ["150 mV", "T", /different dimension/],
  ["1e5 cm2/V", "cm^2/(V s)", /different dimension/],
  ["5", "V", /./],
  ["2 mcm", "m", /not a known quantity/],
  ["2 furlong", "m", /not a known quantity/],
  ["lots", "V", /not a known quantity/],
  ["2 v", "V", /not a known quantity/],
  ["2 micron", "m", /not a known quantity/],
  ["2 mt", "T", /./],
];

describe("refused", () => {
  it.each(REFUSED)("%s for %s", (text, target, reason) => {
    const r = parseQuantity(text, target);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.found).toMatch(reason);
  });
});

describe("what a refusal says", () => {
  const found = (text: string, target: string) => {
    const r = parseQuantity(text, target);
    if (r.ok) throw new Error(`${text} was accepted`);
    return r.found;
  };
  it("an unknown unit: what was found, a did-you-mean, the units of the quantity", () => {
    expect(found("150 mt", "T")).toBe(
      '"150 mt", which is not a known quantity ("mt" is not a unit waferbook knows; did you mean "mT"?; a magnetic field is written in T, mT)',
    );
    expect(found("1e4 furlongs", "cm^2/(V s)")).toBe(
      '"1e4 furlongs", which is not a known quantity ("furlongs" is not a unit waferbook knows; a mobility is written in cm²/(V s), m²/(V s))',
    );
  });
  it("a prefix the unit does not take is refused, not read as another unit: MT, mcm, kmin", () => {
    expect(found("2 MT", "T")).toBe(
      '"2 MT", which is not a known quantity (T takes the prefixes n, u, m, not M; did you mean "mT"?; a magnetic field is written in T, mT)',
    );
    expect(found("2 mcm", "m")).toMatch(/^"2 mcm", which is not a known quantity \("mcm" is not a unit waferbook knows/);
    expect(found("2 kmin", "s")).toMatch(/min takes no prefix/);
  });
  it("a dimension mismatch names both kinds of quantity", () => {
    expect(found("150 mV", "T")).toBe('"150 mV", which has a different dimension (a voltage, not a magnetic field; a magnetic field is written in T, mT)');
    // cm²/V = m² / (m² kg s⁻³ A⁻¹) = kg⁻¹ s³ A (derived by hand).
    expect(found("1e5 cm2/V", "cm^2/(V s)")).toMatch(/different dimension \(a quantity in kg\^-1 s\^3 A, not a mobility;/);
    expect(found("20 sccm", "torr")).toMatch(
      /different dimension \(a standard gas flow, not a pressure; a pressure is written in Torr, mTorr, mbar, Pa, kPa, bar, atm\)/,
    );
  });
  it("grammar: one slash, °C only on its own, no stray characters, a number first", () => {
    expect(found("2 m/s/s", "m/s^2")).toMatch(/one "\/" at most/);
    expect(found("2 °C/min", "K/min")).toMatch(/°C and °F are read only on their own/);
    expect(found("2 V$", "V")).toMatch(/the character "\$" is not part of a unit/);
    expect(found("V", "V")).toMatch(/a number first, then its unit/);
    expect(found("5", "V")).toBe('"5", a number without its unit');
  });
  it("prefixes and powers the grammar reads: mTorr, hPa, (V s)^-1, m/s^2, 1/(V s)", () => {
    // By hand: 1 mTorr = 1e-3 Torr; 1 hPa = 100 Pa; 1 m²·(V s)⁻¹ = 1 m²/(V s); 1 /(V s) = 1 V⁻¹ s⁻¹.
    expect(parseQuantity("5 mTorr", "torr")).toEqual({ ok: true, value: 5e-3 });
    expect(parseQuantity("5 hPa", "Pa")).toEqual({ ok: true, value: 500 });
    expect(parseQuantity("5 m^2 (V s)^-1", "m^2/(V s)")).toEqual({ ok: true, value: 5 });
    expect(parseQuantity("5 m/s^2", "m s^-2")).toEqual({ ok: true, value: 5 });
    expect(parseQuantity("5 1/(V s)", "V^-1 s^-1")).toEqual({ ok: true, value: 5 });
    expect(parseQuantity("5 cm^2V^-1s^-1", "cm^2/(V s)")).toEqual({ ok: true, value: 5 });
  });
});
