// Unit spellings as labs (and waferbook's own pages) write them: each must give the same SI value.
// Expected factors are written out by hand from the unit definitions (SI brochure, 9th ed., prefixes
// and derived units: confirmed); nothing here is computed by the code under test.
import { describe, expect, it } from "vitest";
import { METRICS } from "../../src/model/metrics.ts";
import { formatValue, microSign, prettyUnit } from "../../src/model/format.ts";
import type { MetricSpec } from "../../src/model/metrics.ts";
import { SETTING_SPECS } from "../../src/validate/settings.ts";
import { COLUMN_UNITS, parseQuantity, unitFactor, type Dimension } from "../../src/validate/units.ts";
import { suggestUnit } from "../../src/validate/unitSpelling.ts";

/** Each unit waferbook prints → [an SI unit of the same dimension, the factor to it]. By hand. */
const SI: Record<string, [string, number]> = {
  "cm^2/(V s)": ["m^2/(V s)", 1e-4],
  "cm^-2": ["m^-2", 1e4],
  "cm^-2/V": ["m^-2/V", 1e4],
  "cm^-3": ["m^-3", 1e6],
  "uF/cm^2": ["F/m^2", 1e-2],
  V: ["V", 1],
  T: ["T", 1],
  nm: ["m", 1e-9],
  ps: ["s", 1e-12],
  // Energies of the valley-splitting prediction, compared within the electronvolt (the settings convert eV to J
  // with their own factor, the exact SI 2019 e; test/validate/unitTable.test.ts checks eV → J).
  eV: ["eV", 1],
  meV: ["eV", 1e-3],
  ueV: ["eV", 1e-6],
  "MV/m": ["V/m", 1e6],
};
/** Dimensionless units: not quantities of the unit table ("%" and "1" have their own path). */
const DIMENSIONLESS = new Set(["%", "1"]);

const printed = [...new Set([...METRICS.map((m) => m.unit), ...Object.values(SETTING_SPECS).flatMap((s) => ("unit" in s ? [s.unit] : []))])];

const si = (text: string, unit: string) => {
  const r = parseQuantity(text, unit);
  if (!r.ok) throw new Error(`${text} → ${unit}: ${r.found}`);
  return r.value;
};
const near = (a: number, b: number) => expect(Math.abs(a / b - 1)).toBeLessThan(1e-12);

describe("every unit the site prints, fed back in", () => {
  it("the table above knows every unit of the metric registry and the settings", () => {
    expect(printed.filter((u) => !(u in SI) && !DIMENSIONLESS.has(u))).toEqual([]);
  });
  it.each(printed.filter((u) => !DIMENSIONLESS.has(u)))("%s: as stored, as shown on pages (prettyUnit, microSign) and as typed", (unit) => {
    const [siUnit, factor] = SI[unit];
    for (const spelling of [unit, prettyUnit(unit), microSign(unit)]) near(si(`2.5 ${spelling}`, siUnit), 2.5 * factor);
    // And converted to the metric's own unit: the value typed is the value meant.
    near(si(`2.5 ${prettyUnit(unit)}`, unit), 2.5);
  });
  it("percent metrics take the printed form back", () => {
    expect(si("5 %", "%")).toBe(5);
  });
});

describe("spellings a lab uses", () => {
  it.each([
    // Mobility, cm²/(V s) = 1e-4 m²/(V s)
    ["cm^2/Vs", "m^2/(V s)", 1e-4],
    ["cm2/Vs", "m^2/(V s)", 1e-4],
    ["cm²/(V·s)", "m^2/(V s)", 1e-4],
    ["cm^2/(V*s)", "m^2/(V s)", 1e-4],
    ["cm²/(V s)", "m^2/(V s)", 1e-4],
    ["cm²/V·s", "m^2/(V s)", 1e-4],
    ["cm2/V.s", "m^2/(V s)", 1e-4],
    ["cm^2 V^-1 s^-1", "m^2/(V s)", 1e-4],
    ["cm2V-1s-1", "m^2/(V s)", 1e-4],
    ["cm² V⁻¹ s⁻¹", "m^2/(V s)", 1e-4],
    ["m^2/Vs", "m^2/(V s)", 1],
    // Density, cm⁻² = 1e4 m⁻²
    ["1/cm^2", "m^-2", 1e4],
    ["cm-2", "m^-2", 1e4],
    ["cm⁻²", "m^-2", 1e4],
    ["/cm2", "m^-2", 1e4],
    ["cm\u22122", "m^-2", 1e4],
    ["cm−2/V", "m^-2/V", 1e4],
    // Resistance, Ω
    ["Ohm", "ohm", 1],
    ["ohm", "ohm", 1],
    ["Ω", "ohm", 1],
    ["\u2126", "ohm", 1],
    ["ohms", "ohm", 1],
    ["kOhm", "ohm", 1e3],
    ["kΩ", "ohm", 1e3],
    ["MΩ", "ohm", 1e6],
    ["mΩ", "ohm", 1e-3],
    ["Ω/sq", "ohm", 1],
    ["Ω/□", "ohm", 1],
    ["ohm/sq", "ohm", 1],
    ["Ohm/□", "ohm", 1],
    ["ohm per square", "ohm", 1],
    // Micro: u, µ (U+00B5), μ (U+03BC)
    ["uF/cm^2", "F/m^2", 1e-2],
    ["\u00b5F/cm²", "F/m^2", 1e-2],
    ["\u03bcF/cm²", "F/m^2", 1e-2],
    ["\u00b5m", "m", 1e-6],
    ["\u03bcm", "m", 1e-6],
    ["um", "m", 1e-6],
    // Ångström, 1e-10 m
    ["Å", "m", 1e-10],
  ] as const)("2 %s = 2 × %s × %d", (spelling, siUnit, factor) => {
    near(si(`2 ${spelling}`, siUnit), 2 * factor);
    // A no-break space between number and unit, as pasted from a document.
    near(si(`2\u00a0${spelling}`, siUnit), 2 * factor);
  });
  it("a wrong dimension is still refused, whatever the spelling", () => {
    const r = parseQuantity("1e5 cm2/V", "cm^2/(V s)");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.found).toMatch(/different dimension/);
    expect(parseQuantity("3 kg", "ohm").ok).toBe(false);
  });
  it("letter case is kept where it changes the unit", () => {
    // mΩ and MΩ: 1e-3 and 1e6 Ω.
    near(si("1 mohm", "ohm"), 1e-3);
    near(si("1 Mohm", "ohm"), 1e6);
  });
});

describe("column and metadata units (closed lists)", () => {
  it.each([
    ["resistance", "Ohm", 1],
    ["resistance", "OHM", 1],
    ["resistance", "kΩ", 1e3],
    ["resistance", "kohms", 1e3],
    ["resistance", "Ω/sq", 1],
    ["voltage", "\u00b5V", 1e-6],
    ["voltage", "\u03bcV", 1e-6],
    ["voltage", "uV", 1e-6],
    ["current", "\u03bcA", 1e-6],
    ["current", "nA", 1e-9],
    ["concentration", "cm⁻³", 1],
    ["concentration", "1/cm^3", 1],
    ["concentration", "cm-3", 1],
    ["length", "µm", 1e3],
    ["length", "μm", 1e3],
    ["length", "Å", 0.1],
  ] as const)("%s [%s] → factor %d to the base unit", (dim, unit, factor) => {
    expect(unitFactor(dim as Dimension, unit)).toBe(factor);
  });
  it("every listed unit is accepted as listed", () => {
    for (const [dim, units] of Object.entries(COLUMN_UNITS)) for (const [u, f] of Object.entries(units)) expect(unitFactor(dim as Dimension, u)).toBe(f);
  });
  it("a wrong case is refused and the right one suggested: [mt] → mT", () => {
    expect(unitFactor("field", "mt")).toBeUndefined();
    expect(unitFactor("field", "MT")).toBeUndefined();
    expect(suggestUnit("mt", Object.keys(COLUMN_UNITS.field))).toBe("mT");
    expect(suggestUnit("MV", Object.keys(COLUMN_UNITS.voltage))).toBe("mV");
    expect(suggestUnit("furlong", Object.keys(COLUMN_UNITS.field))).toBeUndefined();
    expect(suggestUnit("kOmh", Object.keys(COLUMN_UNITS.resistance))).toMatch(/^kohm$/i);
    expect(suggestUnit("mV", Object.keys(COLUMN_UNITS.resistance))).toBeUndefined();
  });
});

describe("values as the site prints them (formatValue), typed back in", () => {
  it.each(printed.filter((u) => !DIMENSIONLESS.has(u)))("%s", (unit) => {
    const spec = METRICS.find((m) => m.unit === unit) ?? { unit, digits: 3 };
    for (const v of [1.234e5, 4.56e-3, 0.5, 2.5e11, -3.2e-5]) {
      const text = formatValue(v, spec as MetricSpec);
      // Printed to spec.digits significant digits: back within half a unit of the last digit.
      expect(Math.abs(si(text, unit) / v - 1), text).toBeLessThan(5 * 10 ** -((spec.digits ?? 3) - 1));
    }
  });
  it("the ×10 forms by hand: 1.23×10⁵, 1.23 x 10^5, 4.5×10⁻³", () => {
    expect(si("1.23×10⁵ V", "V")).toBeCloseTo(1.23e5, 6);
    expect(si("1.23 x 10^5 V", "V")).toBeCloseTo(1.23e5, 6);
    expect(si("4.5×10⁻³ V", "V")).toBeCloseTo(4.5e-3, 12);
    expect(si("4.5×10^\u22123 V", "V")).toBeCloseTo(4.5e-3, 12);
  });
});
