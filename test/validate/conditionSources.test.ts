/**
 * Where each measurement condition of a sweep came from (src/validate/sweep.ts
 * conditionSources, shown per device by src/publish/conditionSources.ts): the
 * file's own "# key:" line, a reading rule matching the file name or a
 * preamble line, a fixed value in wafer.md, or the file's I column. The files
 * are written here by hand; the expected sources follow from how each file
 * and rule is written (docs/formats.md, "Files as the instruments write them").
 */
import { describe, expect, it } from "vitest";
import { readInstrumentTable, type ReadingRules } from "../../src/read/instrumentTable.ts";
import { readTable } from "../../src/read/table.ts";
import { validateSweep } from "../../src/validate/sweep.ts";
import { deviceConditions } from "../../src/publish/conditionSources.ts";

const at = (field: string, line: number) => ({ file: "wafers/W-1/wafer.md", field, line });
const rules: ReadingRules = {
  columns: [
    { header: "Field (mT)", name: "B", unit: "mT", at: at("devices[0].columns", 20) },
    { header: "R_xx (kOhm)", name: "Rxx", unit: "kohm", at: at("devices[0].columns", 21) },
    { header: "R_xy (kOhm)", name: "Rxy", unit: "kohm", at: at("devices[0].columns", 22) },
  ],
  separator: "tab",
  conditions: [
    { key: "gate", source: "file_name", pattern: /Vg=(?<value>[-0-9.]+)V/, unit: "V", at: at("devices[0].conditions.gate.file_name", 25) },
    { key: "temperature", source: "line", pattern: /^T \(K\)\t(?<value>[0-9.]+)/, unit: "K", at: at("devices[0].conditions.temperature.line", 26) },
    { key: "current", source: "value", value: "10", unit: "nA", at: at("devices[0].conditions.current.value", 27) },
  ],
};
const body = ["Field (mT)\tR_xx (kOhm)\tR_xy (kOhm)", "-100\t0.61\t-0.62", "-50\t0.60\t-0.31", "50\t0.60\t0.31", "100\t0.61\t0.62", ""].join("\n");

describe("condition sources of a sweep", () => {
  it("names the rule and its wafer.md line for a file-name, a preamble-line and a fixed-value condition", () => {
    const text = `logger v2\nT (K)\t1.6\n${body}`;
    const s = validateSweep(readInstrumentTable(text, "wafers/W-1/t/Vg=0.35V.dat", rules), "hall-bar");
    expect(s.conditions).toEqual([
      { key: "gate", origin: "rule-file-name", value: 0.35, rule: "gate.file_name", ruleAt: "wafers/W-1/wafer.md:25" },
      { key: "temperature", origin: "rule-line", value: 1.6, line: 2, rule: "temperature.line", ruleAt: "wafers/W-1/wafer.md:26" },
      { key: "current", origin: "record-value", value: expect.closeTo(1e-8, 20), rule: "current.value", ruleAt: "wafers/W-1/wafer.md:27" },
      { key: "field_range", origin: "file-column", span: [expect.closeTo(-0.1, 12), expect.closeTo(0.1, 12)], column: "B" }, // ±100 mT
    ]);
  });

  it("credits the file's own '# key:' line where the file carries one, and a current column as the column", () => {
    const own = "# gate: 0.4 V\n# temperature: 0.3 K\nB [T],Vxx [V],Vxy [V],I [A]\n-1,6e-6,-6e-5,1e-8\n1,6e-6,6e-5,1e-8\n";
    const s = validateSweep(readTable(own, "wafers/W-1/t/own.csv"), "hall-bar");
    expect(s.conditions).toEqual([
      { key: "gate", origin: "file-line", value: 0.4, line: 1 },
      { key: "temperature", origin: "file-line", value: 0.3, line: 2 },
      { key: "current", origin: "file-column", value: 1e-8, column: "I" },
      { key: "field_range", origin: "file-column", span: [-1, 1], column: "B" },
    ]);
  });

  it("the file's own line wins over a rule, and the page says so per sweep", () => {
    const a = validateSweep(readInstrumentTable(`# temperature: 4.2 K\nT (K)\t1.6\n${body}`, "wafers/W-1/t/Vg=0.1V.dat", rules), "hall-bar");
    const b = validateSweep(readInstrumentTable(`logger\nT (K)\t1.6\n${body}`, "wafers/W-1/t/Vg=0.2V.dat", rules), "hall-bar");
    const c = validateSweep(readInstrumentTable(`logger\nno temperature here\n${body}`, "wafers/W-1/t/Vg=0.3V.dat", rules), "hall-bar");
    expect(a.warnings.map((w) => w.message)).toEqual([
      "the file's own \"# temperature:\" line and the rule `temperature.line` (wafers/W-1/wafer.md:26) disagree; the file's line is used",
    ]);
    const lines = deviceConditions({ conditions: [a, b, c].map((s) => ({ file: s.file, kind: s.kind, sources: s.conditions ?? [] })) });
    expect(lines.map((l) => l.label)).toEqual(["field range (field sweeps)", "gate voltage (field sweeps)", "temperature", "source current"]);
    expect(lines.shift()).toMatchObject({ values: "−0.1 … 0.1 T", sources: [{ text: "the file's B column", sweeps: "all 3 sweeps" }] });
    expect(lines[0]).toMatchObject({
      values: "0.1 … 0.3 V",
      sources: [{ text: "the file name, by reading rule", rule: "gate.file_name", ruleAt: "wafers/W-1/wafer.md:25", sweeps: "all 3 sweeps" }],
      missing: "",
    });
    expect(lines[1]).toMatchObject({
      values: "1.6 … 4.2 K",
      sources: [
        { text: "the file's own “# temperature:” line (line 1)", sweeps: "1 sweep: Vg=0.1V.dat" },
        { text: "a line above the column names (line 2), by reading rule", rule: "temperature.line", sweeps: "1 sweep: Vg=0.2V.dat" },
      ],
      missing: "1 sweep: Vg=0.3V.dat",
    });
    expect(lines[2]).toMatchObject({
      values: "10 nA",
      sources: [{ text: "a fixed value in the wafer record", rule: "current.value", sweeps: "all 3 sweeps" }],
    });
  });
});
