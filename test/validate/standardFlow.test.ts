/**
 * Gas flows are standard flows (sccm, slm: an amount of gas per time, referenced to 0 °C and 101.325 kPa),
 * their own kind of quantity: an actual volume flow (L/min, cm³/min) is refused where a standard flow is
 * expected, with a located message that says why and how to convert. Expected values by hand from the
 * definitions: R = N_A·k = 6.02214076e23 × 1.380649e-23 = 8.31446261815324 J/(mol K) (exact, SI 2019);
 * the molar volume at 0 °C, 101.325 kPa is R·273.15/101325 = 0.022413969545 m³/mol = 22413.969545 cm³/mol,
 * so 1 mol/min = 22413.969545 sccm; 1 slm = 1000 sccm.
 */
import { describe, expect, it } from "vitest";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { InputError } from "../../src/model/problem.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { parseQuantity } from "../../src/validate/units.ts";

const ctx = { folder: "W-1", file: "wafers/W-1/wafer.md", today: "2026-12-01", siteSettings: DEFAULT_SETTINGS };
const record = (flows: string) =>
  `---\nwafer: W-1\nrun: R-1\ngrown: 2025-03-14\nstack:\n  - { name: well, role: well }\ngrowth:\n  layers:\n    - { layer: well, temperature: "625 °C", flows: ${flows} }\n---\n`;

describe("standard gas flows", () => {
  it.each([
    ["20 sccm", 20],
    ["0.5 slm", 500],
    ["0.5 slpm", 500],
    ["1 mol/min", 22413.969545],
    ["1 mmol/min", 22.413969545],
  ])("%s = %d sccm", (text, sccm) => {
    const r = parseQuantity(text, "sccm");
    expect(r.ok).toBe(true);
    if (r.ok) expect(Math.abs(r.value / sccm - 1)).toBeLessThan(1e-9);
  });

  it.each(["2 L/min", "2 cm^3/min", "2 cm³/min", "2 mL/min", "2 m^3/s"])(
    "%s (an actual volume flow) is refused as a standard flow, saying why and how to convert",
    (text) => {
      const r = parseQuantity(text, "sccm");
      expect(r.ok).toBe(false);
      if (r.ok) return;
      expect(r.found).toMatch(/different dimension \(an actual volume flow, not a standard gas flow;/);
      expect(r.found).toMatch(/depends on the gas's pressure and temperature/);
      expect(r.found).toContain("sccm = cm³/min × (p / 101.325 kPa) × (273.15 K / T)");
      expect(r.found).toMatch(/a standard gas flow is written in sccm, slm\)$/);
    },
  );

  it("a standard flow given for a volume flow is refused the other way round", () => {
    const r = parseQuantity("20 sccm", "L/min");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.found).toMatch(/a standard gas flow, not an actual volume flow; a standard flow \(sccm, slm\) is an amount of gas/);
  });

  it("in a wafer record, L/min for a gas flow is a located error with the reference conditions in its fix", () => {
    let problems: InputError["problems"] = [];
    try {
      validateWafer(readFrontMatter(record('{ SiH4: "20 sccm", H2: "20 L/min" }'), ctx.file), ctx);
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      problems = e.problems;
    }
    expect(problems).toHaveLength(1);
    const [p] = problems;
    expect(p.file).toBe("wafers/W-1/wafer.md");
    expect(p.line).toBe(9);
    expect(p.field).toBe("growth.layers[0].flows.H2");
    expect(p.message).toBe("cannot read the gas flow");
    expect(p.found).toMatch(/^"20 L\/min", which has a different dimension \(an actual volume flow, not a standard gas flow;/);
    expect(p.fix).toContain("sccm or slm, standard flows referenced to 0 °C and 101.325 kPa");
  });

  it("sccm and slm in a record are read as before", () => {
    const w = validateWafer(readFrontMatter(record('{ SiH4: "20 sccm", H2: "20 slm" }'), ctx.file), ctx);
    expect(w.growth?.layers[0].flows_sccm).toEqual([
      ["SiH4", 20],
      ["H2", 20000],
    ]);
  });
});
