// The closed unit table: its own consistency, and the defined factors written out by hand
// (SI brochure 9th ed.: confirmed; torr = 101325/760 Pa, atm = 101325 Pa: from memory).
import { describe, expect, it } from "vitest";
import { PREFIXES, UNITS } from "../../src/physics/unitTable.ts";

describe("unit table", () => {
  it("every prefix a unit takes is a known SI prefix, and none is listed twice", () => {
    for (const [name, def] of Object.entries(UNITS)) {
      for (const p of def.prefixes) expect(PREFIXES, `${name}: ${p}`).toHaveProperty(p);
      expect(new Set(def.prefixes).size, name).toBe(def.prefixes.length);
    }
  });
  it("no prefixed spelling is also a unit of its own (a name reads one way only)", () => {
    for (const [name, def] of Object.entries(UNITS)) for (const p of def.prefixes) expect(UNITS, `${p}${name}`).not.toHaveProperty(p + name);
  });
  it("defined factors: torr 133.322368… Pa, atm 101325 Pa, bar 1e5 Pa, min 60 s, eV 1.602176634e-19 J", () => {
    const si = (n: string) => UNITS[n].mantissa * 10 ** UNITS[n].decade;
    expect(si("torr")).toBeCloseTo(133.32236842105263, 10);
    expect(si("atm")).toBe(101325);
    expect(si("bar")).toBe(1e5);
    expect(si("min")).toBe(60);
    expect(UNITS.eV.mantissa).toBe(1.602176634e-19);
    expect(UNITS.degC.offset).toBe(273.15);
  });
});
