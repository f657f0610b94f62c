/**
 * Reading instructions that are wrong get located messages: the data file and
 * its line where there is one, and the wafer.md line of the rule (issue: raw
 * files as instruments leave them). Uses two of the demo's logger files.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { loadSiteInputs } from "../../src/validate/load/site.ts";
import { loadWafer } from "../../src/validate/load/wafer.ts";
import type { Problem } from "../../src/model/problem.ts";
import { useTempDir } from "../helpers/tempDir.ts";

const ROOT = path.resolve(import.meta.dirname, "../..");
const SRC = path.join(ROOT, "data", "wafers", "TQ-2507", "transport", "HB1");
const tmp = useTempDir("instrument-errors");

const RULES = {
  columns: ['"Field (mT)": B [mT]', '"Gate (V)": Vg [V]', '"R_xx (kOhm)": Rxx [kohm]', '"R_xy (kOhm)": Rxy [kohm]'],
  layout: "{ separator: tab, decimal: comma, header_row: 9 }",
  gate: '{ file_name: "Vg=(?<value>[-0-9,]+)V", unit: V }',
  temperature: '{ line: "^Temperature \\\\(K\\\\)\\\\t(?<value>[0-9,]+)", unit: K }',
};
type Rules = typeof RULES;

/** wafer.md of a one-device wafer with the given rules; returns the text and the line of each rule. */
function record(r: Rules): string {
  return [
    "---",
    "wafer: TW-1",
    "run: R1",
    "grown: 2025-05-01",
    "devices:",
    "  - id: HB1",
    "    geometry: hall-bar",
    "    length_um: 100",
    "    width_um: 20",
    '    files: "HB1/*.dat"',
    "    columns:",
    ...r.columns.map((c) => `      ${c}`),
    `    layout: ${r.layout}`,
    "    conditions:",
    `      gate: ${r.gate}`,
    `      temperature: ${r.temperature}`,
    "      current: { value: 10 nA }",
    "---",
    "",
  ].join("\n");
}
const lineOf = (md: string, text: string) => md.split("\n").findIndex((l) => l.includes(text)) + 1;

async function load(name: string, r: Partial<Rules>): Promise<{ problems: Problem[]; md: string }> {
  const data = path.join(tmp(), name);
  const w = path.join(data, "wafers", "TW-1");
  await fs.mkdir(path.join(w, "HB1"), { recursive: true });
  await fs.mkdir(path.join(data, "runs"), { recursive: true });
  await fs.writeFile(path.join(data, "runs", "R1.md"), "---\nreactor: Kite\n---\n");
  await fs.writeFile(path.join(data, "targets.yaml"), 'default_grade: g\ngrades:\n  g:\n    peak_mobility: { min: "1e4 cm^2/(V s)" }\n');
  for (const f of (await fs.readdir(SRC)).filter((f) => /Vg=0,(80|95)V/.test(f))) await fs.copyFile(path.join(SRC, f), path.join(w, "HB1", f));
  const md = record({ ...RULES, ...r });
  await fs.writeFile(path.join(w, "wafer.md"), md);
  const site = await loadSiteInputs(data);
  const loaded = await loadWafer("TW-1", { dataDir: data, today: "2026-12-02", siteSettings: site.settings, waferListing: ["TW-1"] });
  return { problems: loaded.problems.filter((p) => p.severity === "error"), md };
}

beforeAll(async () => {
  await fs.access(SRC); // the demo's logger files
});

describe("reading instructions: located errors", () => {
  it("the correct instructions load both files without an error (control)", async () => {
    const { problems } = await load("ok", {});
    expect(problems).toEqual([]);
  });
  it("a mapping to an unknown quantity names the mapping's wafer.md line and suggests the name", async () => {
    const { problems, md } = await load("quantity", { columns: ['"Field (mT)": B [mT]', '"R_xx (kOhm)": Rxx [kohm]', '"R_xy (kOhm)": Rxyy [kohm]'] });
    const p = problems.find((q) => /unknown quantity/.test(q.message))!;
    expect(p).toMatchObject({ file: "wafers/TW-1/wafer.md", found: '"Rxyy"' });
    expect(p.line).toBeGreaterThanOrEqual(lineOf(md, "    columns:"));
    expect(p.line).toBeLessThanOrEqual(lineOf(md, "Rxyy"));
    expect(p.fix).toMatch(/did you mean "Rxy"/);
  });
  it("an unknown unit is refused at its mapping, with the likely unit", async () => {
    const { problems } = await load("unit", { columns: ['"Field (mT)": B [mt]', '"R_xx (kOhm)": Rxx [kohm]', '"R_xy (kOhm)": Rxy [kohm]'] });
    const p = problems.find((q) => /unit of B is not accepted/.test(q.message))!;
    expect(p.file).toBe("wafers/TW-1/wafer.md");
    expect(p.fix).toMatch(/mT/);
  });
  it("a header row past the end of the file names the data file and layout.header_row's line", async () => {
    const { problems, md } = await load("header", { layout: "{ separator: tab, decimal: comma, header_row: 5000 }" });
    const p = problems.find((q) => /past the end of the file/.test(q.message))!;
    expect(p.file).toMatch(/^wafers\/TW-1\/HB1\/HB1_Vg=0,(80|95)V_\d{4}\.dat$/);
    expect(p.message).toContain(`wafers/TW-1/wafer.md:${lineOf(md, "    layout:")}`);
  });
  it("a file-name pattern that matches nothing names the file, the rule and its line", async () => {
    const { problems, md } = await load("nomatch", { gate: '{ file_name: "Vgate=(?<value>[-0-9,]+)V", unit: V }' });
    const p = problems.find((q) => /does not match/.test(q.message))!;
    expect(p.message).toMatch(
      new RegExp(`file name \`HB1_Vg=0,(80|95)V_\\d{4}\\.dat\` does not match \`gate\\.file_name\` \\(wafers/TW-1/wafer\\.md:${lineOf(md, "      gate:")}\\)`),
    );
  });
  it("a malformed pattern is a located error when the record is read, before any file", async () => {
    const { problems, md } = await load("malformed", { gate: '{ file_name: "Vg=(?<value>[-0-9,]+V", unit: V }' });
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ file: "wafers/TW-1/wafer.md", line: lineOf(md, "      gate:"), message: "regular expression is malformed" });
  });
  it("a pathological pattern (nested repeats) is refused, and one needing backtracking (a backreference) too", async () => {
    const a = await load("nested", { gate: '{ file_name: "Vg=(?<value>([-0-9,]+)+)V", unit: V }' });
    expect(a.problems[0].message).toMatch(/exponential time/);
    expect(a.problems[0].line).toBe(lineOf(a.md, "      gate:"));
    const b = await load("backref", { gate: '{ file_name: "(V)g=(?<value>[-0-9,]+)\\\\1", unit: V }' });
    expect(b.problems[0].message).toMatch(/linear time|exponential/);
  });
  it("a condition with a unit it cannot be in, and a fixed value without a number, are located", async () => {
    const { problems } = await load("condunit", { gate: "{ value: ten volts }" });
    expect(problems[0].message).toMatch(/cannot read the gate condition's value/);
  });
});
