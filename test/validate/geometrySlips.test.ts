// Device geometry typed in the wrong unit (src/validate/recordNumbers.ts deviceDimensionWarnings):
// a Hall bar's length and width are expected between 1 µm and 10 mm (common practice: e-beam defined
// bars of a few µm to mm-scale chip structures); outside, a located warning gives the value had it been
// typed in millimetres or nanometres, and what the slip does to the mobility. The direction follows from
// ρ = R·W/L and μ = 1/(e·n·ρ) (Hall-bar geometry, common practice): W too small → ρ too small → μ too large.
import { describe, expect, it } from "vitest";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { deviceDimensionWarnings } from "../../src/validate/recordNumbers.ts";
import { formatProblem } from "../../src/model/problem.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { problemMessage } from "../helpers/problems.ts";

const FILE = "wafers/W-1/wafer.md";
const lines = (length: number | string, width: number | string) =>
  `---\nwafer: W-1\nrun: R1\ngrown: 2024-05-02\ndevices:\n  - id: HB1\n    geometry: hall-bar\n    length_um: ${length}\n    width_um: ${width}\n    files: "*.csv"\n---\n`;
const warnings = (length: number, width: number) =>
  deviceDimensionWarnings([{ length_um: length, width_um: width }], FILE, (f) => (f.endsWith("length_um") ? 8 : 9)).map(formatProblem);

describe("implausible Hall-bar geometry", () => {
  it("width_um: 0.05 (millimetres typed): warns at its line, says 50 µm and that the mobility would be 1000× too large", () => {
    const [w, ...rest] = warnings(100, 0.05);
    expect(rest).toEqual([]);
    expect(w).toMatch(/^wafers\/W-1\/wafer\.md:9: warning: devices\[0\]\.width_um: unusual device dimension/);
    expect(w).toContain("found 0.05 (in millimetres that would be 50 µm)");
    expect(w).toContain("write width_um: 50;");
    expect(w).toContain("mobility comes out 1000× too large");
  });

  it("length_um: 0.1: 100 µm, and the mobility 1000× too small", () => {
    const [w] = warnings(0.1, 20);
    expect(w).toMatch(/:8: warning: devices\[0\]\.length_um: .*in millimetres that would be 100 µm.*write length_um: 100;.*1000× too small$/);
  });

  it("width_um: 20000 (nanometres typed): 20 µm, the mobility 1000× too small", () => {
    const [w] = warnings(100, 20000);
    expect(w).toMatch(/width_um: .*in nanometres that would be 20 µm.*write width_um: 20;.*1000× too small$/);
  });

  it("says nothing from 1 µm to 10 mm, bounds included", () => {
    expect(warnings(1, 10_000)).toEqual([]);
    expect(warnings(100, 20)).toEqual([]);
    expect(warnings(0.999, 20)).toHaveLength(1);
    expect(warnings(100, 10_001)).toHaveLength(1);
  });

  it("the record is still read, and width_um: 50 um says the unit goes in the key", () => {
    expect(
      validateWafer(readFrontMatter(lines(100, 0.05), FILE), { folder: "W-1", file: FILE, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS }).devices[0]
        .width_um,
    ).toBe(0.05);
    expect(
      problemMessage(() =>
        validateWafer(readFrontMatter(lines(100, "50 um"), FILE), { folder: "W-1", file: FILE, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS }),
      ),
    ).toMatch(/:9: devices\[0\]\.width_um: the unit goes in the key, not the value/);
  });
});
