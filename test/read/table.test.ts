import { describe, expect, it } from "vitest";
import { readTable } from "../../src/read/table.ts";
import { decodeText } from "../../src/read/dataFiles.ts";
import { validateSweep } from "../../src/validate/sweep.ts";
import { problemMessage } from "../helpers/problems.ts";

const message = problemMessage;

const good = "# gate: 350 mV\n# temperature: 1.6 K\nB [mT],Rxx [kohm],Rxy [ohm]\n-200,1.0,1200\n0,1.0,0\n200,1.0,-1200\n";

describe("sweep table reader", () => {
  it("reads metadata, units and SI prefixes (common practice: mT, kΩ, mV)", () => {
    const s = validateSweep(readTable(good, "a.csv"), "hall-bar");
    expect(s.kind).toBe("field");
    expect(s.gate_V).toBeCloseTo(0.35, 12);
    expect(s.temperature_K).toBe(1.6);
    expect(Array.from(s.x)).toEqual([-0.2, 0, 0.2]);
    expect(s.rxx![0]).toBe(1000);
    expect(s.direction).toBe("up");
  });
  it("accepts tabs and CRLF line ends", () => {
    const tsv = good.replace(/,/g, "\t").replace(/\n/g, "\r\n");
    const s = validateSweep(readTable(tsv, "a.tsv"), "hall-bar");
    expect(s.rows).toBe(3);
    expect(s.rxy![2]).toBe(-1200);
  });
  it("removes a UTF-8 byte-order mark before the metadata (decodeText)", () => {
    const bytes = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(good.replace(/\n/g, "\r\n"))]);
    const text = decodeText({ rel: "bom.csv", abs: "/nowhere/bom.csv", bytes });
    const s = validateSweep(readTable(text, "bom.csv"), "hall-bar");
    expect(s.gate_V).toBeCloseTo(0.35, 12);
    expect(s.rows).toBe(3);
  });
  it("turns voltages into resistances with the current", () => {
    const t = "# gate: 0.5 V\n# current: 10 nA\nB [T],Vxx [uV],Vxy [uV]\n-1,10,-60\n0,10,0\n1,10,60\n";
    const s = validateSweep(readTable(t, "v.csv"), "hall-bar");
    expect(s.rxx![0]).toBeCloseTo(1000, 9);
    expect(s.rxy![2]).toBeCloseTo(6000, 9);
  });
  it("reads a gate sweep with its field", () => {
    const s = validateSweep(readTable("# field: 0 T\nVg [V],Rxx [ohm],Rxy [ohm]\n1.2,100,0\n1.0,150,0\n0.8,300,1\n", "g.csv"), "hall-bar");
    expect(s.kind).toBe("gate");
    expect(s.field_T).toBe(0);
    expect(s.direction).toBe("down");
  });
});

describe("malformed sweep files give located messages", () => {
  const cases: [string, string, string][] = [
    [
      "header only",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n",
      "h.csv:2: no data rows after the header (expected at least one row of numbers, found the header only) — add the measured rows or remove the file",
    ],
    [
      "non-numeric cell",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n-1,1,2\n0,abc,0\n1,1,2\n",
      'h.csv:4: column 2 (Rxx): cell is not a finite number (expected a number such as 1.25e-3, found "abc") — correct the cell',
    ],
    [
      "NaN cell",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n-1,1,2\n0,NaN,0\n1,1,2\n",
      'h.csv:4: column 2 (Rxx): cell is not a finite number (expected a number such as 1.25e-3, found "NaN") — remove the row, or leave out points the instrument could not measure',
    ],
    [
      "ragged row",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n-1,1,2\n0,1\n",
      "h.csv:4: row has the wrong number of cells (expected 3 cells as in the header, found 2) — fill or remove the incomplete row",
    ],
    [
      "duplicate column",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxx [ohm]\n-1,1,2\n",
      'h.csv:2: column "Rxx" appears twice (expected each column once, found columns 2 and 3) — rename or remove one of them',
    ],
    [
      "unknown column",
      "# gate: 0.5 V\nB [T],Rxz [ohm],Rxy [ohm]\n-1,1,2\n0,1,2\n",
      'h.csv:2: column 2: unknown column (expected B, Vg, Rxx, Rxy, Vxx, Vxy, I, Ra, Rb, found "Rxz") — did you mean "Rxx"?',
    ],
    [
      "wrong-dimension unit",
      "# gate: 0.5 V\nB [V],Rxx [ohm],Rxy [ohm]\n-1,1,2\n0,1,2\n",
      'h.csv:2: column B: unit of the magnetic field is not accepted (expected T, mT, found "V") — write the header as "B [T]"',
    ],
    [
      "unsorted field",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n-1,1,2\n0,1,2\n-0.5,1,2\n",
      "h.csv:5: column B: B is not sorted (expected B increasing throughout, as in the first rows, found 0 then -0.5) — split up and down sweeps into separate files",
    ],
    [
      "repeated field",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n-1,1,2\n0,1,2\n0,1,2\n",
      "h.csv:5: column B: B value repeats (expected B changing from row to row, found 0 twice in a row) — average or remove the repeated reading",
    ],
    [
      "missing gate metadata",
      "B [T],Rxx [ohm],Rxy [ohm]\n-1,1,2\n1,1,2\n",
      'h.csv:1: # gate: field sweep without its gate voltage (expected a line "# gate: <value> V" before the header, found none) — add the gate voltage the sweep was taken at',
    ],
    [
      "missing field metadata of a gate sweep",
      "Vg [V],Rxx [ohm],Rxy [ohm]\n0.1,1,2\n0.2,1,2\n",
      'h.csv:1: # field: gate sweep without its field (expected a line "# field: <value> T" before the header, found none) — add the field the sweep was taken at (0 T for zero field)',
    ],
    [
      "both sweep axes",
      "# gate: 0.5 V\nB [T],Vg [V],Rxx [ohm],Rxy [ohm]\n-1,0.5,1,2\n1,0.5,1,2\n",
      "h.csv:2: both B and Vg columns (expected one sweep axis: B (field sweep) or Vg (gate sweep), found both) — keep the swept quantity as a column and give the fixed one as # metadata",
    ],
    [
      "no sweep axis",
      "# gate: 0.5 V\nRxx [ohm],Rxy [ohm]\n1,2\n",
      "h.csv:2: no sweep axis (expected a B column (field sweep) or a Vg column (gate sweep), found Rxx, Rxy) — add the swept quantity as the first column",
    ],
    [
      "too few field values: located at the last data row",
      "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n0,1,2\n0.5,1,2\n\n",
      "h.csv:4: column B: too few field values (expected at least two non-zero fields, found 2 rows) — check that the export is complete, or sweep the field through at least two non-zero values",
    ],
    [
      "metadata only: located at the last metadata line",
      "# gate: 0.5 V\n# temperature: 1.6 K\n\n\n",
      'h.csv:2: no header row (expected a header such as "B [T],Rxx [ohm],Rxy [ohm]" after the # metadata lines, found only metadata or blank lines) — add the column header and the data rows',
    ],
    [
      "zero current",
      "# gate: 0.5 V\n# current: 0 nA\nB [T],Vxx [V],Vxy [V]\n-1,1,2\n1,1,2\n",
      "h.csv:2: # current: current is zero (expected a non-zero source current, found 0) — give the current the sample was driven with",
    ],
    [
      "missing column for geometry",
      "# gate: 0.5 V\nB [T],Rxy [ohm]\n-1,2\n1,2\n",
      "h.csv:2: missing a column a hall-bar needs (expected Rxx and Rxy (or Vxx and Vxy with a current), found B, Rxy) — add the missing column, or check the device geometry in wafer.md",
    ],
  ];
  for (const [name, text, expected] of cases) {
    it(name, () => {
      expect(message(() => validateSweep(readTable(text, "h.csv"), "hall-bar"))).toBe(expected);
    });
  }
  it("warns on a one-sign field sweep", () => {
    const s = validateSweep(readTable("# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n0.1,1,2\n0.2,1,2\n", "h.csv"), "hall-bar");
    expect(s.warnings[0].message).toMatch(/one sign only/);
  });
});
