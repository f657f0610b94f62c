// Instrument exports: semicolon separators and decimal commas, declared by metadata lines or read
// from an unambiguous file; otherwise a message naming the separator or decimal problem. The fast
// path (src/read/plainTable.ts) is checked against the csv-parse path as in tableFastPath.test.ts.
// Expected numbers are the written digits with a point (by hand); no published values involved.
import { describe, expect, it } from "vitest";
import { numericColumn, readTable } from "../../src/read/table.ts";
import { formatProblem, InputError } from "../../src/model/problem.ts";

type Outcome = { error: string } | { rows: string[][]; rowLines: number[]; values: number[][] };

function outcome(text: string): Outcome {
  try {
    const t = readTable(text, "t.csv");
    return { rows: t.rows, rowLines: [...t.rowLines], values: t.columns.map((c) => Array.from(numericColumn(t, c))) };
  } catch (e) {
    if (e instanceof InputError) return { error: formatProblem(e.problem) };
    throw e;
  }
}
/** The same file with a trailing comment line, which the fast path does not take: read by csv-parse. */
const viaCsvParse = (text: string) => text + (text.endsWith("\n") ? "" : "\n") + "# end\n";
const values = (text: string) => {
  const o = outcome(text);
  if ("error" in o) throw new Error(o.error);
  return o.values;
};

describe("accepted exports", () => {
  const cases: [string, string, number[][]][] = [
    [
      "semicolons, decimal points (from the header)",
      "# gate: 0.5 V\nB [T];Rxx [ohm];Rxy [ohm]\n-1.5;612.3;-6241.5\n1.5;612.25;6241.5\n",
      [
        [-1.5, 1.5],
        [612.3, 612.25],
        [-6241.5, 6241.5],
      ],
    ],
    [
      "semicolons, decimal commas (detected)",
      "B [T];Rxx [ohm]\n-1,5;612,3\n1,5;6,1225E2\n",
      [
        [-1.5, 1.5],
        [612.3, 612.25],
      ],
    ],
    [
      "tabs, decimal commas (detected)",
      "B [T]\tRxx [ohm]\n-1,5\t612,3\n,5\t612,\n",
      [
        [-1.5, 0.5],
        [612.3, 612],
      ],
    ],
    [
      "declared: # separator: ; and # decimal: ,",
      "# separator: ;\n# decimal: ,\nB [T];Rxx [ohm]\n-1;612\n1;613\n",
      [
        [-1, 1],
        [612, 613],
      ],
    ],
    [
      "declared in words",
      "# Separator: semicolon\n# Decimal: comma\nB [T];Rxx [ohm]\n-1,25;612\n1;613\n",
      [
        [-1.25, 1],
        [612, 613],
      ],
    ],
    ["declared tab with decimal points", "# separator: tab\n# decimal: point\nB [T]\tRxx [ohm]\n-1.25\t612\n", [[-1.25], [612]]],
    ["quoted semicolon cells (csv-parse path)", 'B [T];Rxx [ohm]\n"-1,5";"612,3"\n', [[-1.5], [612.3]]],
  ];
  it.each(cases)("%s", (_, text, expected) => {
    expect(values(text)).toEqual(expected);
  });
  it.each(cases.filter(([name]) => !name.includes("quoted")))("%s: fast path taken, and equal to the csv-parse path", (_, text) => {
    expect(readTable(text, "t.csv").numeric).toBeDefined();
    expect(readTable(viaCsvParse(text), "t.csv").numeric).toBeUndefined();
    const a = outcome(text);
    const b = outcome(viaCsvParse(text));
    expect(a).toEqual(b);
  });
  it("cell text keeps the decimal comma as written (messages quote the file)", () => {
    expect(readTable("B [T];Rxx [ohm]\n-1,5;612,3\n", "t.csv").rows).toEqual([["-1,5", "612,3"]]);
  });
  it("a comma-separated file is read as before", () => {
    expect(values("B [T],Rxx [ohm]\n-1.5,612.3\n")).toEqual([[-1.5], [612.3]]);
  });
});

describe("messages that name the separator or decimal problem", () => {
  const error = (text: string) => {
    const o = outcome(text);
    if (!("error" in o)) throw new Error("expected an error");
    return o.error;
  };
  it("decimal commas in a comma-separated file", () => {
    expect(error("B [T],Rxx [ohm]\n-1,5,612,3\n")).toBe(
      't.csv:2: row has more cells than the header: numbers with a decimal comma in a comma-separated file cannot be told from separators (expected 2 cells as in the header, found 4) — export with semicolons (then "# separator: ;") or tabs between cells, or with decimal points',
    );
  });
  it("rows separated by semicolons under a comma header", () => {
    expect(error("B [T],Rxx [ohm],Rxy [ohm]\n-1;2;3\n")).toBe(
      't.csv:2: row is separated by semicolons but the header by commas (expected 3 cells as in the header, found 1) — use one separator throughout (declare it with "# separator: ;" before the header)',
    );
  });
  it("a decimal comma among decimal points", () => {
    expect(error("B [T];Rxx [ohm]\n-1.5;612.3\n1,5;612.3\n")).toBe(
      't.csv:3: column 1 (B): cell is not a finite number (expected a number such as 1.25e-3, found "1,5") — the cell has a decimal comma but the file uses decimal points elsewhere: write every number the same way, or declare "# decimal: ," (with semicolons or tabs between cells)',
    );
  });
  it("a decimal point in a file declared with decimal commas", () => {
    expect(error("# decimal: ,\nB [T];Rxx [ohm]\n-1,5;612,3\n1.5;612,3\n")).toMatch(
      /t\.csv:4: column 1 \(B\): cell is not a finite number .*found "1\.5"\) — the cell has a decimal point but the file uses decimal commas/,
    );
  });
  it("a decimal comma declared with comma separators", () => {
    expect(error("# decimal: ,\nB [T],Rxx [ohm]\n1,2\n")).toBe(
      't.csv:1: # decimal: a decimal comma with commas between cells cannot be read (expected semicolons or tabs between cells when numbers use a decimal comma, found comma separator and decimal comma) — export with semicolons (then "# separator: ;") or tabs between cells, or with decimal points',
    );
  });
  it("an unknown declaration", () => {
    expect(error("# separator: pipe\nB [T]|Rxx [ohm]\n1|2\n")).toMatch(
      /^t\.csv:1: # separator: cannot read the separator declaration \(expected ",", "comma", ";", "semicolon", "tab", "\\\\t", found "pipe"\)/,
    );
    expect(error("# decimal: ;\nB [T];Rxx [ohm]\n1;2\n")).toMatch(/^t\.csv:1: # decimal: cannot read the decimal declaration/);
  });
  it("a header with both semicolons and commas", () => {
    expect(error("B [T];Rxx [ohm],Rxy [ohm]\n1;2;3\n")).toMatch(
      /^t\.csv:1: the header holds both semicolons and commas, so the separator is unclear .* — use one separator throughout, or declare it before the header, e\.g\. "# separator: ;"$/,
    );
  });
});

describe("a whole sweep as a decimal-comma instrument writes it", () => {
  it("metadata values with decimal commas too", async () => {
    const { validateSweep } = await import("../../src/validate/sweep.ts");
    const s = validateSweep(readTable("# gate: 0,35 V\n# current: 10 nA\nB [T];Vxx [µV];Vxy [µV]\n-1;6,5;-60\n0;6,25;0\n1;6,5;60\n", "s.csv"), "hall-bar");
    expect(s.gate_V).toBeCloseTo(0.35, 12);
    // 6.25 µV / 10 nA = 625 Ω (by hand)
    expect(s.rxx![1]).toBeCloseTo(625, 9);
  });
});
