/**
 * The plain numeric fast path of readTable (src/read/plainTable.ts) against
 * the csv-parse path it replaces for ordinary files: same rows, same line
 * numbers, bit-identical numbers, identical error messages; and its number
 * reader against Number() (property tests). No published values are involved:
 * the reference is the JavaScript Number() conversion itself (ECMA-262,
 * StringToNumber) and csv-parse's splitting.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parsePlainNumber, scanPlainBody } from "../../src/read/plainTable.ts";
import { numericColumn, readTable } from "../../src/read/table.ts";
import { formatProblem, InputError } from "../../src/model/problem.ts";

type Outcome = { error: string } | { rows: string[][]; rowLines: number[]; values: Float64Array[] };

/** readTable + numericColumn on every column, as data or as the formatted error. */
function outcome(text: string): Outcome {
  try {
    const t = readTable(text, "t.csv");
    const values = t.columns.map((c) => numericColumn(t, c));
    return { rows: t.rows, rowLines: [...t.rowLines], values };
  } catch (e) {
    if (e instanceof InputError) return { error: formatProblem(e.problem) };
    throw e;
  }
}

/**
 * The same file with a trailing comment line: csv-parse skips it (rows, lines
 * and messages unchanged) but the fast path does not accept comments, so this
 * is the file read by the csv-parse path.
 */
function viaCsvParse(text: string): string {
  const eol = text.includes("\r\n") ? "\r\n" : "\n";
  return text + (text.endsWith("\n") ? "" : eol) + "# end" + eol;
}

/** Bit-identical comparison of two outcomes (Object.is per value: tells -0 from 0). */
function expectSame(a: Outcome, b: Outcome): void {
  if ("error" in a || "error" in b) {
    expect(a).toEqual(b);
    return;
  }
  expect(a.rows).toEqual(b.rows);
  expect(a.rowLines).toEqual(b.rowLines);
  expect(a.values.length).toBe(b.values.length);
  a.values.forEach((col, j) => {
    expect(col.length).toBe(b.values[j].length);
    col.forEach((v, i) => expect(Object.is(v, b.values[j][i]), `column ${j} row ${i}: ${v} vs ${b.values[j][i]}`).toBe(true));
  });
}

const H = "# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n";

/** Bodies the fast path must accept. */
const PLAIN: [string, string][] = [
  ["LF with trailing newline", H + "-1,612.3,-6241.5\n0,610,0\n1,612.25,6241.5\n"],
  ["no trailing newline", H + "-1,612.3,-6241.5\n0,610,0\n1,612.25,6241.5"],
  ["CRLF", (H + "-1,612.3,-6241.5\n0,610,0\n1,612.25,6241.5\n").replace(/\n/g, "\r\n")],
  ["CRLF body without final line end", "# gate: 0.5 V\r\nB [T],Rxx [ohm],Rxy [ohm]\r\n-1,1,2\r\n1,1,2"],
  ["empty lines between, before and after rows", H + "\n-1,1,2\n\n\n0,1,2\n1,1,2\n\n\n"],
  ["empty CRLF lines", "# gate: 0.5 V\r\nB [T],Rxx [ohm],Rxy [ohm]\r\n\r\n-1,1,2\r\n\r\n1,1,2\r\n\r\n"],
  ["tab delimiter", "# gate: 0.5 V\nB [T]\tRxx [ohm]\tRxy [ohm]\n-1\t1\t2\n0\t1.5\t0\n1\t1\t-2\n"],
  ["signs, bare points, exponents, zeros", H + "-.5,+1.,1E5\n-0,0.000,-0e9\n+.25e-3,007.50,1e+2\n5.e1,-5E-1,0.1e1\n"],
  [
    "long and extreme numbers (Number() fallback)",
    H +
      "0.30000000000000004,12345678901234567890,1e23\n4.9e-324,2.2250738585072014e-308,1.7976931348623157e308\n9007199254740993,-1e-30,123456789012345.6789\n",
  ],
  ["many fraction digits", H + "0.000000000000000000000000000001,1.00000000000000000000001,100000000000000000000000e-2\n"],
  ["one column", "# gate: 0.5 V\nB [T]\n1\n2\n"],
];

/** Files the fast path must leave to csv-parse (or that are errors). */
const TRICKY: [string, string][] = [
  ["quoted cells", H + '"-1",1,2\n"0",1,2\n'],
  ["spaces around cells", H + " -1 , 1 ,2\n0,1,2\n"],
  ["comment line in the body", H + "-1,1,2\n# note\n0,1,2\n"],
  ["empty cell", H + "-1,,2\n0,1,2\n"],
  ["OVLD text", H + "-1,OVLD,2\n0,1,2\n"],
  ["NaN", H + "-1,NaN,2\n"],
  ["Infinity", H + "-1,Infinity,2\n"],
  ["overflowing exponent", H + "-1,1e999,2\n"],
  ["half numbers", H + "1e,.,-\n"],
  ["double sign and double point", H + "+-1,1..2,1e+-2\n"],
  ["hex", H + "0x10,1,2\n"],
  ["lone CR between rows", H + "-1,1,2\r0,1,2\n"],
  ["lone CR at the end", H + "-1,1,2\n0,1,2\r"],
  ["LF file with a CRLF row", H + "-1,1,2\n0,1,2\r\n1,1,2\n"],
  ["CRLF file with an LF row", "# gate: 0.5 V\r\nB [T],Rxx [ohm],Rxy [ohm]\r\n-1,1,2\r\n0,1,2\n1,1,2\r\n"],
  ["too few cells", H + "-1,1,2\n0,1\n"],
  ["too many cells", H + "-1,1,2\n0,1,2,3\n"],
  ["trailing delimiter", H + "-1,1,2,\n"],
];

describe("plain numeric fast path of readTable", () => {
  for (const [name, text] of PLAIN) {
    it(`${name}: taken, and equal to the csv-parse path`, () => {
      const t = readTable(text, "t.csv");
      expect(t.numeric).toBeDefined();
      expect(readTable(viaCsvParse(text), "t.csv").numeric).toBeUndefined();
      expectSame(outcome(text), outcome(viaCsvParse(text)));
    });
  }
  for (const [name, text] of TRICKY) {
    it(`${name}: refused by the scanner, so read by csv-parse`, () => {
      const header = text.split(/\r?\n/).find((l) => !l.startsWith("#"))!;
      const body = text.slice(text.indexOf(header) + header.length).replace(/^\r?\n/, "");
      const delimiter = header.includes("\t") ? "\t" : ",";
      expect(scanPlainBody(body, 0, delimiter, header.split(delimiter).length)).toBeUndefined();
      const o = outcome(text);
      if (!("error" in o)) expect(readTable(text, "t.csv").numeric).toBeUndefined();
    });
  }
  it("no rows (header only, or empty lines only): the same message on both paths", () => {
    for (const text of [H, H + "\n\n", (H + "\n\n").replace(/\n/g, "\r\n")]) expectSame(outcome(text), outcome(viaCsvParse(text)));
  });
  it("keeps the exact messages of the csv-parse path", () => {
    expect(outcome(H + "-1,1,2\n0,1\n")).toEqual({
      error: "t.csv:4: row has the wrong number of cells (expected 3 cells as in the header, found 2) — fill or remove the incomplete row",
    });
    expect(outcome(H + "-1,1,2\n0,OVLD,2\n")).toEqual({
      error: 't.csv:4: column 2 (Rxx): cell is not a finite number (expected a number such as 1.25e-3, found "OVLD") — correct the cell',
    });
    expect(outcome(H + "-1,1,2\n0,1e999,2\n")).toEqual({
      error: 't.csv:4: column 2 (Rxx): cell is not a finite number (expected a number such as 1.25e-3, found "1e999") — correct the cell',
    });
    expect(outcome(H + "\n")).toEqual({
      error: "t.csv:2: no data rows after the header (expected at least one row of numbers, found the header only) — add the measured rows or remove the file",
    });
  });
  it("numbers rows by file line across empty lines (LF and CRLF)", () => {
    expect(readTable(H + "\n-1,1,2\n\n0,1,2\n", "t.csv").rowLines).toEqual([4, 6]);
    expect(readTable((H + "\n-1,1,2\n\n0,1,2\n").replace(/\n/g, "\r\n"), "t.csv").rowLines).toEqual([4, 6]);
  });
  it("gives cell text on demand and a fresh array per numericColumn call", () => {
    const t = readTable(H + "-1.50,1e3,2\n0,1,2\n", "t.csv");
    expect(t.rows).toEqual([
      ["-1.50", "1e3", "2"],
      ["0", "1", "2"],
    ]);
    const a = numericColumn(t, t.columns[1], 1e-3);
    a[0] = 99;
    expect(Array.from(numericColumn(t, t.columns[1], 1e-3))).toEqual([1, 0.001]);
    // v·factor + offset exactly as on the csv-parse path, including −0 · 1 + 0 = +0.
    expect(Object.is(numericColumn(readTable(H + "-0,1,2\n", "t.csv"), t.columns[0])[0], 0)).toBe(true);
  });
});

describe("parsePlainNumber is bit-identical to Number()", () => {
  /** Equal to Number(s) bit for bit; refused only when Number(s) is not finite (the csv-parse path then reports the cell). */
  const same = (s: string) => {
    const v = parsePlainNumber(s);
    if (!Number.isFinite(Number(s))) {
      expect(v, s).toBeUndefined();
      return;
    }
    expect(v, s).not.toBeUndefined();
    expect(Object.is(v, Number(s)), `${s}: ${v} vs ${Number(s)}`).toBe(true);
  };
  it("on hand-picked hard cases (halfway points, subnormals, the 2^53 edge, 17+ digits)", () => {
    for (const s of [
      "9007199254740992",
      "9007199254740993",
      "9007199254740991.5",
      "2.2250738585072011e-308",
      "2.2250738585072012e-308",
      "5e-324",
      "2.4703282292062327e-324",
      "1.7976931348623157e308",
      "0.1",
      "0.2",
      "0.3",
      "123456789012345678e-30",
      "1e22",
      "1e23",
      "1e-22",
      "1e-23",
      "8.98846567431158e307",
      "-0",
      "-0.0e-400",
      "0e400",
      ".5",
      "5.",
      "+1",
    ])
      same(s);
  });
  it("on random doubles printed by toString, toExponential and toFixed", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 20 }), (x, d) => {
        same(x.toString());
        same(x.toExponential(d));
        same(x.toFixed(d));
      }),
      { numRuns: 20000 },
    );
  });
  it("on random digit strings", () => {
    const digits = (n: number) => fc.string({ unit: fc.constantFrom(..."0123456789"), maxLength: n });
    const text = fc.tuple(
      fc.constantFrom("", "+", "-"),
      digits(24),
      fc.option(digits(24)),
      fc.option(fc.tuple(fc.constantFrom("e", "E"), fc.constantFrom("", "+", "-"), digits(4))),
    );
    fc.assert(
      fc.property(text, ([sign, int, frac, exp]) => {
        const s = sign + int + (frac === null ? "" : "." + frac) + (exp === null ? "" : exp.join(""));
        const v = parsePlainNumber(s);
        const n = Number(s);
        if (v === undefined) expect(s === "" || !Number.isFinite(n), `${s} refused but Number gives ${n}`).toBe(true);
        else expect(Object.is(v, n), `${s}: ${v} vs ${n}`).toBe(true);
      }),
      { numRuns: 20000 },
    );
  });
  it("refuses what is not one plain number", () => {
    for (const s of ["", " 1", "1 ", "NaN", "Infinity", "0x10", "1e", ".", "-", "1..2", "1,2", "1\n", "1e999", "1_000"])
      expect(parsePlainNumber(s), s).toBeUndefined();
  });
});
