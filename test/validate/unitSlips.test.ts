// Unit slips: a unit typed in the value of a key that already names it, and a column unit in the
// wrong case. Expectations are this program's own messages (docs/formats.md); conversions by hand.
import { describe, expect, it } from "vitest";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { readTable } from "../../src/read/table.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateSweep } from "../../src/validate/sweep.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { problemMessage } from "../helpers/problems.ts";

const ctx = { folder: "W-1", file: "wafers/W-1/wafer.md", today: "2026-12-01", siteSettings: DEFAULT_SETTINGS };
const record = (device: string, stack = "") =>
  `---\nwafer: W-1\nrun: R-1\ngrown: 2025-03-14\ndevices:\n  - id: HB1\n    geometry: hall-bar\n${device}    files: "t/*.csv"\n${stack}---\n`;
const message = (text: string) => problemMessage(() => validateWafer(readFrontMatter(text, ctx.file), ctx));

describe("a unit in the value of a key that names it", () => {
  it("width_um: 50 um says the unit goes in the key", () => {
    expect(message(record("    length_um: 100\n    width_um: 50 um\n"))).toBe(
      'wafers/W-1/wafer.md:9: devices[0].width_um: the unit goes in the key, not the value: width_um is in micrometres (expected a plain number of micrometres, such as width_um: 50, found "50 um") — write width_um: 50',
    );
  });
  it("another length unit is converted for the fix: 0.05 mm = 50 µm, 1 µm = 1000 nm (by hand)", () => {
    expect(message(record("    length_um: 0.1 mm\n    width_um: 20\n"))).toMatch(
      /:8: devices\[0\]\.length_um: the unit goes in the key.*— write length_um: 100$/,
    );
    expect(
      message(record("    length_um: 100\n    width_um: 20\n", "stack:\n  - { name: well, role: well, material: Si, ge: 0, thickness_nm: 10 µm }\n")),
    ).toMatch(/stack\[0\]\.thickness_nm: the unit goes in the key.*— write thickness_nm: 10000$/);
  });
  it("a unit that is not a length still names the slip, without a number to write", () => {
    expect(message(record("    length_um: 100\n    width_um: 20 V\n"))).toMatch(
      /the unit goes in the key.*— write the length in micrometres as a plain number \("V" is not a length\)$/,
    );
  });
  it("a value with no number keeps the plain type message", () => {
    expect(message(record("    length_um: 100\n    width_um: wide\n"))).toMatch(/wrong type/);
  });
});

describe("a column unit in the wrong case", () => {
  it("[mt] suggests mT", () => {
    const t = readTable("# gate: 0.5 V\nB [mt],Rxx [ohm],Rxy [ohm]\n-1,2,3\n1,2,3\n", "s.csv");
    expect(problemMessage(() => validateSweep(t, "hall-bar"))).toBe(
      's.csv:2: column B: unit of the magnetic field is not accepted (expected T, mT, found "mt") — write the header as "B [mT]"',
    );
  });
  it("[OHM] and [kOhm] are read as ohms", () => {
    const s = validateSweep(readTable("# gate: 0.5 V\nB [T],Rxx [OHM],Rxy [kOhm]\n-1,2,3\n1,2,3\n", "s.csv"), "hall-bar");
    expect(s.rxx![0]).toBe(2);
    expect(s.rxy![0]).toBe(3000);
  });
});
