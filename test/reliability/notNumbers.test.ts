/**
 * Numbers that are not numbers. YAML reads `.inf` as Infinity; a Hall bar of
 * length 1e-300 µm and width 1e300 µm has W/L = Infinity (an "Infinity Ω"
 * sheet resistance); Number() reads the cells 0x7D0, 0b11111010000 and
 * 0o3720 as 2000; "1e309 %" and "-1e309" overflow to ±Infinity; a file whose
 * lines end in a lone CR used to be one line with "no header row".
 * Each is now refused with a located error, warned about, or read correctly.
 * Values are invented test inputs; the plausible device range (1 µm to
 * 10 mm) is common practice.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readFrontMatter, readYaml } from "../../src/read/frontMatter.ts";
import { scanPlainBody } from "../../src/read/plainTable.ts";
import { numericColumn, readTable } from "../../src/read/table.ts";
import { loadWafer } from "../../src/validate/load/wafer.ts";
import { formatProblem } from "../../src/model/problem.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { parseQuantity } from "../../src/validate/units.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { problemMessage } from "../helpers/problems.ts";
import { HEALTHY_DIR } from "./corpus.ts";

const FILE = "wafers/W-1/wafer.md";
const record = (device: string, extra = "") => `---\nwafer: W-1\nrun: R1\ngrown: 2024-05-02\ndevices:\n  - ${device}\n${extra}---\n`;
const validate = (text: string) =>
  validateWafer(readFrontMatter(text, FILE), { folder: "W-1", file: FILE, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS });

describe("device geometry", () => {
  it("refuses .inf and .nan as not finite, located at the field", () => {
    expect(problemMessage(() => validate(record('id: HB1\n    geometry: hall-bar\n    length_um: .inf\n    width_um: 20\n    files: "*.csv"')))).toBe(
      "wafers/W-1/wafer.md:8: devices[0].length_um: not a finite number (expected a finite number, found Infinity) — write the measured value; .inf, .nan and numbers beyond about 1.8e308 are not values",
    );
    expect(problemMessage(() => validate(record('{ id: HB1, geometry: van-der-pauw, at_mm: [.nan, 0], files: "*.csv" }')))).toMatch(
      /^wafers\/W-1\/wafer\.md:6: devices\[0\]\.at_mm\[0\]: not a finite number \(expected a finite number, found NaN\)/,
    );
    expect(
      problemMessage(() =>
        validate(record('{ id: HB1, geometry: van-der-pauw, files: "*.csv" }', "stack:\n  - { name: w, role: well, thickness_nm: .inf }\n")),
      ),
    ).toMatch(/stack\[0\]\.thickness_nm: not a finite number/);
  });

  it("refuses 1e-300 µm and 1e300 µm (W/L would be infinite), outside 1 nm … 1 m", () => {
    expect(problemMessage(() => validate(record('{ id: HB1, geometry: hall-bar, length_um: 1e-300, width_um: 1e300, files: "*.csv" }')))).toBe(
      "wafers/W-1/wafer.md:6: devices[0].length_um: device dimension out of range (expected micrometres between 0.001 (1 nm) and 1e+6 (1 m), found 1e-300) — give the dimension in micrometres, e.g. length_um: 100",
    );
    expect(problemMessage(() => validate(record('{ id: HB1, geometry: hall-bar, length_um: 100, width_um: 1e300, files: "*.csv" }')))).toMatch(
      /devices\[0\]\.width_um: device dimension out of range .* found 1e\+300\)/,
    );
    expect(() => validate(record('{ id: HB1, geometry: hall-bar, length_um: 0.001, width_um: 1000000, files: "*.csv" }'))).not.toThrow();
  });

  it("warns outside 1 µm … 10 mm, and reads the wafer", async () => {
    const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-not-numbers-"));
    tmps.push(tmp);
    const data = path.join(tmp, "data");
    await fs.cp(HEALTHY_DIR, data, { recursive: true });
    const md = path.join(data, "wafers", "OK-1", "wafer.md");
    await fs.writeFile(md, (await fs.readFile(md, "utf8")).replace("length_um: 100, width_um: 20", "length_um: 25000, width_um: 0.2"));
    const w = await loadWafer("OK-1", { dataDir: data, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS });
    expect(w.problems.map(formatProblem)).toEqual([
      "wafers/OK-1/wafer.md:6: warning: devices[0].length_um: unusual device dimension (expected micrometres between 1 and 10000 (1 µm to 10 mm, the usual range of Hall bars), found 25000 (in nanometres that would be 25 µm)) — if it was typed in nanometres, write length_um: 25; as written, the length enters the sheet resistance as 1/L (R·W/L), so the mobility comes out 1000× too large",
      "wafers/OK-1/wafer.md:6: warning: devices[0].width_um: unusual device dimension (expected micrometres between 1 and 10000 (1 µm to 10 mm, the usual range of Hall bars), found 0.2 (in millimetres that would be 200 µm)) — if it was typed in millimetres, write width_um: 200; as written, the width enters the sheet resistance as W (R·W/L), so the mobility comes out 1000× too large",
    ]);
    expect(w.record?.devices[0].length_um).toBe(25000);
  });
});

const tmps: string[] = [];
afterAll(async () => {
  for (const t of tmps) await fs.rm(t, { recursive: true, force: true });
});

const H = "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n";
function tableOutcome(text: string): string | number[][] {
  try {
    const t = readTable(text, "t.csv");
    return t.columns.map((c) => Array.from(numericColumn(t, c)));
  } catch (e) {
    return problemMessage(() => {
      throw e;
    });
  }
}

describe("table cells in hexadecimal, binary or octal", () => {
  const fix = "write the value in decimal; hexadecimal (0x), binary (0b) and octal (0o) numbers are not read";
  it.each([
    ["0x7D0", 1],
    ["0b11111010000", 2],
    ["0o3720", 3],
    ["-0X7d0", 1],
  ])("%s is refused with its row and column, on both table paths", (cell, column) => {
    const row = ["-1", "610", "-6241"];
    row[column - 1] = cell;
    const text = `${H}-1,612,-6241\n${row.join(",")}\n`;
    const name = ["B", "Rxx", "Rxy"][column - 1];
    const expected = `t.csv:4: column ${column} (${name}): cell is not a decimal number (expected decimal digits such as 2000 or 2.0e3, found "${cell}") — ${fix}`;
    expect(tableOutcome(text)).toBe(expected);
    // The fast path leaves the file to csv-parse; a trailing comment forces csv-parse outright: the same message.
    expect(scanPlainBody(text, H.length, ",", 3)).toBeUndefined();
    expect(tableOutcome(text + "# end\n")).toBe(expected);
  });
  it("decimal cells are still read (2000 written four ways)", () => {
    expect(tableOutcome(`${H}2000,2e3,2000.0\n.2e4,+2000,02000\n`)).toEqual([
      [2000, 2000],
      [2000, 2000],
      [2000, 2000],
    ]);
  });
});

describe("lone carriage returns as line ends", () => {
  it("a CR-only file reads like its LF twin: same numbers, same row lines", () => {
    const lf = `${H}-1,612.3,-6241.5\n\n0,610,0\n1,612.25,6241.5\n`;
    const cr = lf.replace(/\n/g, "\r");
    const a = readTable(lf, "t.csv");
    const b = readTable(cr, "t.csv");
    expect(b.meta.get("gate")).toEqual(a.meta.get("gate"));
    expect(b.rowLines).toEqual([3, 5, 6]);
    expect(tableOutcome(cr)).toEqual(tableOutcome(lf));
    expect(tableOutcome(cr)).toEqual([
      [-1, 0, 1],
      [612.3, 610, 612.25],
      [-6241.5, 0, 6241.5],
    ]);
  });
  it("errors in a CR-only file are located on the right line", () => {
    expect(tableOutcome(`${H}-1,1,2\n0,OVLD,2\n`.replace(/\n/g, "\r"))).toBe(
      't.csv:4: column 2 (Rxx): cell is not a finite number (expected a number such as 1.25e-3, found "OVLD") — correct the cell',
    );
  });
});

describe("target limits beyond the range of numbers", () => {
  const targets = (limit: string) => `default_grade: test\ngrades:\n  test:\n${limit}\n`;
  const message = (text: string) => problemMessage(() => validateTargets(readYaml(text, "targets.yaml"), "targets.yaml", text));
  it("1e309 % is refused like an overflowing value with a unit", () => {
    expect(message(targets('    hall_sdh_mismatch: { max: "1e309 %" }'))).toBe(
      'targets.yaml:4: grades.test.hall_sdh_mismatch.max: cannot read the limit for Hall–SdH density mismatch (expected a value with a unit convertible to %, such as "1 %", found "1e309 %", beyond the largest number (about 1.8e308)) — write the value with a unit convertible to %',
    );
  });
  it("-1e309 for a plain-number metric, and -1e309 with a unit, are refused", () => {
    expect(message(targets('    mobility_exponent: { min: "-1e309" }'))).toMatch(
      /mobility_exponent\.min: cannot read the limit .* found "-1e309", beyond the largest number \(about 1\.8e308\)\)/,
    );
    expect(message(targets('    peak_mobility: { min: "-1e309 cm^2/(V s)" }'))).toMatch(
      /peak_mobility\.min: cannot read the limit .* found "-1e309 cm\^2\/\(V s\)", beyond the largest number/,
    );
  });
  it("parseQuantity never returns an infinite value", () => {
    for (const [text, unit] of [
      ["1e309 %", "%"],
      ["-1e309", "%"],
      ["1e309", "1"],
      ["-1e309 %", "1"],
      ["1e309 T", "T"],
    ]) {
      const r = parseQuantity(text, unit);
      expect(r.ok, `${text} → ${unit}`).toBe(false);
    }
    expect(parseQuantity("1.7e308", "1")).toEqual({ ok: true, value: 1.7e308 });
  });
});
