// Issue 13 §8: exports that are safe to open. A text cell a spreadsheet would run as a formula
// (leading =, +, -, @, tab or carriage return) is prefixed with a single quote and quoted
// (OWASP, "CSV Injection"; REFERENCES §17 [M]); numbers stay numbers.
import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { csvField, resultsCsv, toCsv } from "../../src/publish/exports.ts";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";

describe("CSV injection", () => {
  it("neutralises each formula lead character, keeps plain text and numbers as they are", () => {
    expect(csvField('=HYPERLINK("http://x","y")')).toBe(`"'=HYPERLINK(""http://x"",""y"")"`);
    expect(csvField("@SUM(A1:A9)")).toBe(`"'@SUM(A1:A9)"`);
    expect(csvField("+1+cmd|' /C calc'!A0")).toBe(`"'+1+cmd|' /C calc'!A0"`);
    expect(csvField("-2+3")).toBe(`"'-2+3"`);
    expect(csvField("\t=1")).toBe(`"'\t=1"`);
    expect(csvField("\r=1")).toBe(`"'\r=1"`);
    // Numbers: typed numbers, and text that is exactly a decimal number, are left alone.
    expect(csvField(-1.5)).toBe("-1.5");
    expect(csvField(-2.5e-7)).toBe("-2.5e-7");
    expect(csvField("-1.5")).toBe("-1.5");
    expect(csvField("+3")).toBe("+3");
    // Ordinary text is untouched; a lead character later in the text is harmless.
    expect(csvField("Heron")).toBe("Heron");
    expect(csvField("a=b")).toBe("a=b");
    expect(csvField("x, y")).toBe(`"x, y"`);
  });

  it("a hostile reactor and grade reach results.csv only as inert text, and a negative figure stays a number", () => {
    const targets = targetsFrom(`default_grade: qubit
grades:
  qubit:
    turn_on_voltage: { between: ["-2 V", "0.6 V"] }
  "@SUM(1+1)":
    turn_on_voltage: { max: "1 V" }
`);
    const w = makeOutcome({ id: "W1", grade: "@SUM(1+1)", reactor: '=HYPERLINK("http://evil","x")', devices: { HB1: { turn_on_voltage: -1.5 } } }, targets);
    const text = resultsCsv([w]);
    const rows: string[][] = parse(text);
    const col = (name: string) => rows[1][rows[0].indexOf(name)];
    expect(col("reactor")).toBe(`'=HYPERLINK("http://evil","x")`);
    expect(col("grade")).toBe("'@SUM(1+1)");
    expect(col("turn_on_voltage [V]")).toBe("-1.5");
    // No cell of the file, as a spreadsheet reads it (after unquoting), starts with a formula character unless it is a number.
    for (const row of rows) for (const cell of row) if (/^[=+\-@\t\r]/.test(cell)) expect(cell).toMatch(/^[+-]?\d/);
  });

  it("every exported table goes through the same cell writer", () => {
    expect(toCsv([["=1", -1, "ok"]])).toBe(`"'=1",-1,ok\r\n`);
  });
});
