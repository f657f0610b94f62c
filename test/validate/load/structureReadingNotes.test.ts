/**
 * Reading notes of X-ray and depth-profile files read by wafer.md's reading
 * instructions: reported as the wafer's warnings, as a device's sweeps report
 * theirs (src/validate/load/wafer.ts), and listed in the structure section of
 * the page (src/publish/structureSection.ts structureReadingNotes). The file
 * and rules are written here by hand; the expected notes follow from them.
 */
import { describe, expect, it } from "vitest";
import { loadStructureInputs } from "../../../src/validate/load/structureFiles.ts";
import type { WaferFileReader } from "../../../src/read/waferFiles.ts";
import { InputError, type Problem } from "../../../src/model/problem.ts";
import type { ReadingRules } from "../../../src/read/instrumentTable.ts";
import type { WaferRecord } from "../../../src/validate/wafer.ts";
import { structureReadingNotes } from "../../../src/publish/structureSection.ts";

function fakeReader(files: Record<string, string>) {
  const problems: Omit<Problem, "wafer">[] = [];
  const reader: WaferFileReader = {
    wafer: "W1",
    recordFile: "wafers/W1/wafer.md",
    glob: (pattern) => Object.keys(files).filter((f) => f.startsWith(pattern.replace("*.csv", ""))),
    async readText(rel) {
      return { rel: `wafers/W1/${rel}`, text: files[rel] };
    },
    readBytes: async () => {
      throw new Error("not used");
    },
    report: (p) => problems.push(p),
    async guard(fn) {
      try {
        return await fn();
      } catch (e) {
        if (e instanceof InputError) {
          problems.push(...e.problems);
          return undefined;
        }
        throw e;
      }
    },
    lineOf: (field) => (field.startsWith("profiles") ? 30 : undefined),
  };
  return { reader, problems };
}

const at = (field: string) => ({ file: "wafers/W1/wafer.md", field, line: 31 });
const rules: ReadingRules = {
  columns: [
    { header: "Depth (nm)", name: "depth", unit: "nm", at: at("profiles.columns") },
    { header: "Ge (at%)", name: "Ge", unit: "at.%", at: at("profiles.columns") },
  ],
  separator: "semicolon",
  conditions: [{ key: "method", source: "value", value: "SIMS", at: at("profiles.conditions.method.value") }],
};
// A Ge well profile: 30 % barriers, a Si well from 40 to 50 nm, with a third column the mapping leaves out.
const rows = Array.from({ length: 40 }, (_, i) => `${2 * i};${2 * i >= 40 && 2 * i <= 50 ? 0 : 30};${i}`);
const profile = ["# method: atom probe", "Depth (nm);Ge (at%);Time (s)", ...rows, ""].join("\n");

describe("reading notes of structure files", () => {
  it("reports a rule the file's own line overrode and the unmapped columns, and the structure section lists them", async () => {
    const { reader, problems } = fakeReader({ "profiles/apt.csv": profile });
    const record = { stack: [], profiles: { files: "profiles/*.csv", reading: rules } } as unknown as WaferRecord;
    const inputs = await loadStructureInputs(record, reader);
    expect(inputs.profiles!.map((p) => p.method)).toEqual(["atom probe"]); // the file's own line wins
    expect(problems.map((p) => [p.severity, p.file, p.line, p.field, p.message])).toEqual([
      [
        "warning",
        "wafers/W1/profiles/apt.csv",
        1,
        "# method",
        "the file's own \"# method:\" line and the rule `method.value` (wafers/W1/wafer.md:31) disagree; the file's line is used",
      ],
      ["warning", "wafers/W1/wafer.md", 30, "profiles.columns", 'columns not named in the mapping are ignored: "Time (s)"'],
    ]);
    const notes = structureReadingNotes({
      problems: problems.map((p) => ({ ...p, wafer: "W1" })),
      provenance: { files: [{ path: "wafers/W1/profiles/apt.csv", bytes: 1, sha256: "", role: "depth profile" }], settings: [], waferbookVersion: "" },
    });
    expect(notes).toHaveLength(2);
    expect(notes[0]).toMatch(/^wafers\/W1\/profiles\/apt\.csv:1: warning: # method: the file's own/);
    expect(notes[1]).toMatch(/^wafers\/W1\/wafer\.md:30: warning: profiles\.columns: columns not named/);
  });

  it("a file in waferbook's own format, read without instructions, has no reading notes", async () => {
    const own = ["# method: SIMS", "depth [nm],Ge [at.%]", ...rows.map((r) => r.split(";").slice(0, 2).join(",")), ""].join("\n");
    const { reader, problems } = fakeReader({ "profiles/own.csv": own });
    await loadStructureInputs({ stack: [], profiles: { files: "profiles/*.csv" } } as unknown as WaferRecord, reader);
    expect(problems).toEqual([]);
  });
});
