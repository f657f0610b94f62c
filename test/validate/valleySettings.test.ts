// The valley-splitting settings and targets read unit strings: ueV, µeV (U+00B5) and μeV (U+03BC) are the
// same unit. Expected values by hand from 1 eV = 1.602176634e-19 J (SI 2019, exact).
import { describe, expect, it } from "vitest";
import { applySettings, DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { readYaml } from "../../src/read/frontMatter.ts";
import { InputError } from "../../src/model/problem.ts";

const EV = 1.602176634e-19;
const where = { file: "analysis.yaml", field: "" };
const near = (a: number, b: number) => expect(Math.abs(a / b - 1)).toBeLessThan(1e-12);

describe("valley-splitting settings", () => {
  it("defaults: field from the data (null), 2 meV, 0.5 eV per unit Ge, 100 µeV (issue 19)", () => {
    expect(DEFAULT_SETTINGS.valley_field).toBeNull();
    near(DEFAULT_SETTINGS.valley_dot_orbital_energy, 2e-3 * EV);
    near(DEFAULT_SETTINGS.valley_band_offset_per_ge, 0.5 * EV);
    near(DEFAULT_SETTINGS.valley_splitting_threshold, 100e-6 * EV);
  });
  it.each(["80 ueV", "80 µeV", "80 μeV", "0.08 meV", "80\u00a0µeV"])("threshold %s = 80 µeV", (text) => {
    near(applySettings(DEFAULT_SETTINGS, { valley_splitting_threshold: text }, where).valley_splitting_threshold, 80e-6 * EV);
  });
  it("field, orbital energy and band offset take their units", () => {
    const s = applySettings(DEFAULT_SETTINGS, { valley_field: "7 MV/m", valley_dot_orbital_energy: "1500 µeV", valley_band_offset_per_ge: "480 meV" }, where);
    near(s.valley_field!, 7e6);
    near(s.valley_dot_orbital_energy, 1.5e-3 * EV);
    near(s.valley_band_offset_per_ge, 0.48 * EV);
    near(applySettings(DEFAULT_SETTINGS, { valley_field: "5e6 V/m" }, where).valley_field!, 5e6);
  });
  it("a wrong dimension or a bare number is a located error naming the setting", () => {
    try {
      applySettings(DEFAULT_SETTINGS, { valley_splitting_threshold: "100 nm", valley_field: 5 }, { file: "wafers/X/wafer.md", field: "analysis" });
      throw new Error("accepted");
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      const text = JSON.stringify(e);
      expect(text).toContain("analysis.valley_splitting_threshold");
      expect(text).toContain("analysis.valley_field");
    }
  });
});

describe("valley-splitting targets", () => {
  it.each(["20 ueV", "20 µeV", "20 μeV", "0.02 meV"])("valley_splitting_p10 min %s is 20 in the metric unit ueV", (text) => {
    const yaml = `default_grade: q\ngrades:\n  q:\n    valley_splitting_p10: { min: "${text}" }\n    valley_splitting_yield: { min: "50 %" }\n`;
    const t = validateTargets(readYaml(yaml, "targets.yaml"), "targets.yaml", yaml);
    const g = t.grades.q as unknown as Record<string, { min?: number }>;
    near(g.valley_splitting_p10.min!, 20);
    near(g.valley_splitting_yield.min!, 50);
  });
});
