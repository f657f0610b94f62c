// The site prints the micro prefix as µ (U+00B5), never as the ASCII "u" it is stored as ("ueV",
// "uF/cm^2"): the settings table of a wafer page, the targets page's unit column, and every page unit
// (prettyUnit). What is printed still reads back in as input (also test/validate/unitSpellings.test.ts).
import { describe, expect, it } from "vitest";
import { microSign, prettyUnit } from "../../src/model/format.ts";
import { METRICS } from "../../src/model/metrics.ts";
import { targetsPageModel } from "../../src/publish/targetsPage.ts";
import { DEFAULT_SETTINGS, SETTING_SPECS } from "../../src/validate/settings.ts";
import { settingsProvenance } from "../../src/validate/settingsProvenance.ts";
import { parseQuantity } from "../../src/validate/units.ts";
import type { WaferRecord } from "../../src/validate/wafer.ts";

/** A unit written with the ASCII micro prefix: u before a unit letter, at the start of a word. */
const ASCII_MICRO = /(^|[^A-Za-z])u(eV|F|V|A|m)\b/;
const E = 1.602176634e-19; // J per eV, exact (SI 2019)

const record = (settings: Record<string, unknown>) => ({ settings: { ...DEFAULT_SETTINGS, ...settings }, settingOverrides: {} }) as unknown as WaferRecord;

describe("the µ sign on the site", () => {
  it("the provenance (exported in results.json) keeps the ASCII 8 ueV; the page's table prints 8 µeV", () => {
    const rows = settingsProvenance(record({ valley_splitting_threshold: 8e-6 * E }), { valley_splitting_threshold: "8 ueV" });
    const row = rows.find((r) => r.key === "valley_splitting_threshold")!;
    expect(row.value).toBe("8 ueV");
    expect(row.source).toBe("site");
    for (const r of rows) expect(r.value).not.toContain("µ");
    for (const r of rows) expect(microSign(r.value)).not.toMatch(ASCII_MICRO);
    expect(microSign(row.value)).toBe("8 µeV");
  });

  it("every setting printed in the table reads back in as the same value", () => {
    const rows = settingsProvenance(record({}), {});
    for (const r of rows) {
      const spec = SETTING_SPECS[r.key as keyof typeof SETTING_SPECS];
      if (spec.kind !== "quantity" || r.value === "derived from the data") continue;
      const back = parseQuantity(r.value, spec.unit);
      expect(back.ok, `${r.key}: ${r.value}`).toBe(true);
      if (back.ok)
        expect(Math.abs(back.value * spec.si - (DEFAULT_SETTINGS[r.key as keyof typeof DEFAULT_SETTINGS] as number))).toBeLessThanOrEqual(
          Math.abs(back.value * spec.si) * 1e-5,
        );
    }
  });

  it("the targets page's unit column prints µeV and µF/cm^2, not ueV and uF/cm^2", () => {
    const t = targetsPageModel(undefined);
    const unitOf = (key: string) => t.metrics.find((m) => m.key === key)!;
    expect(unitOf("valley_splitting_mean").rawUnit).toBe("µeV");
    expect(unitOf("valley_splitting_mean").unit).toBe("µeV");
    const cap = METRICS.find((m) => m.unit === "uF/cm^2")!;
    expect(unitOf(cap.key).rawUnit).toBe("µF/cm^2");
    expect(unitOf(cap.key).unit).toBe("µF/cm²");
    for (const m of t.metrics) {
      expect(m.unit).not.toMatch(ASCII_MICRO);
      expect(m.rawUnit).not.toMatch(ASCII_MICRO);
    }
  });

  it("microSign and prettyUnit change only the micro prefix", () => {
    expect(microSign("ueV")).toBe("µeV");
    expect(microSign("uF/cm^2")).toBe("µF/cm^2");
    expect(microSign("cm^2/(V s)")).toBe("cm^2/(V s)");
    expect(microSign("MV/m")).toBe("MV/m");
    expect(microSign("meV")).toBe("meV");
    expect(prettyUnit("uF/cm^2")).toBe("µF/cm²");
  });
});
