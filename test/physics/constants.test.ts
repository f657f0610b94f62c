import { describe, expect, it } from "vitest";
import { BOLTZMANN, ELECTRON_MASS, ELEMENTARY_CHARGE, HBAR, PLANCK, VACUUM_PERMITTIVITY, VON_KLITZING } from "../../src/physics/constants.ts";

describe("physical constants", () => {
  it("uses the exact SI 2019 defining values (REFERENCES §1, NIST CODATA 2018 [C])", () => {
    expect(ELEMENTARY_CHARGE).toBe(1.602176634e-19);
    expect(PLANCK).toBe(6.62607015e-34);
    expect(BOLTZMANN).toBe(1.380649e-23);
  });
  it("pins CODATA 2018 for measured constants (REFERENCES §1 [C])", () => {
    expect(ELECTRON_MASS).toBe(9.1093837015e-31);
    expect(VACUUM_PERMITTIVITY).toBe(8.8541878128e-12);
  });
  it("derives ħ and h/e² from the exact values (REFERENCES §1, derived)", () => {
    expect(Math.abs(HBAR - 1.054571817e-34) / 1.054571817e-34).toBeLessThan(1e-9);
    expect(VON_KLITZING).toBeCloseTo(25812.807459, 5);
  });
});
