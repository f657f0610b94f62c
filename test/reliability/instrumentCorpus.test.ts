/**
 * The malformed-input corpus through the instrument path (issue: raw files as
 * instruments leave them). Every corpus case whose problems lie inside one
 * sweep file is rewritten as an instrument export — two preamble lines, the
 * gate and field in the file name, `name (unit)` column names, tabs — with
 * wafer.md's `columns`, `layout` and `conditions` describing it. The rewritten
 * case must give the same problems: the same count, each in the renamed file
 * at the same row (shifted by the preamble), with the same message (a missing
 * gate or field also says which file-name rule missed) and the same found value.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { loadSiteInputs } from "../../src/validate/load/site.ts";
import { loadWafer } from "../../src/validate/load/wafer.ts";
import type { Problem } from "../../src/model/problem.ts";
import { useTempDir } from "../helpers/tempDir.ts";
import { BAD_DIR, caseNames, TODAY } from "./corpus.ts";

const tmp = useTempDir("instrument-corpus");
const HEADER = /^([A-Za-z_]\w*) \[([^\]]+)\]$/;

interface Converted {
  name: string;
  text: string;
  headerShift: number;
  origHeader: number;
  mapping: string[];
}

/** One waferbook-format sweep as an instrument export; undefined when the case is about what an export cannot carry (header syntax, quoting). */
function convert(file: string, text: string): Converted | undefined {
  const lines = text.split("\n");
  const meta: Record<string, string> = {};
  const all: [string, string][] = [];
  let h = 0;
  for (; h < lines.length && (lines[h].startsWith("#") || lines[h].trim() === ""); h++) {
    const m = /^#\s*(\w+):\s*(.*)$/.exec(lines[h]);
    if (m) {
      meta[m[1]] = m[2].trim();
      all.push([m[1], m[2].trim()]);
    }
  }
  // Invalid UTF-8 or quoted cells: what this plain rewrite cannot carry.
  if (h >= lines.length || lines[h].includes('"') || text.includes("\uFFFD")) return undefined;
  const cells = lines[h].split(",").map((c) => c.trim());
  if (!cells.every((c) => HEADER.test(c)) || new Set(cells.map((c) => c.split(" ")[0])).size !== cells.length) return undefined;
  const gate = meta.gate && /^[-0-9.]+ V$/.test(meta.gate) ? meta.gate.replace(" V", "") : undefined;
  const field = meta.field && /^[-0-9.]+ T$/.test(meta.field) ? meta.field.replace(" T", "") : undefined;
  if ((meta.gate && !gate) || (meta.field && !field)) return undefined;
  const name = `${path.basename(file, ".csv")}${gate ? `_Vg=${gate}V` : ""}${field ? `_B=${field}T` : ""}.dat`;
  if (all.filter(([k]) => k === "gate" || k === "field").length > 1) return undefined; // a name carries one gate and one field
  const kept = all.filter(([k]) => k !== "gate" && k !== "field").map(([k, v]) => `# ${k}: ${v}`);
  const preamble = ["Logger export", "Operator\tnobody", ...kept];
  const header = cells.map((c) => c.replace(HEADER, "$1 ($2)")).join("\t");
  const body = lines.slice(h + 1).map((l) => l.split(",").join("\t"));
  return {
    name,
    text: [...preamble, header, ...body].join("\n"),
    headerShift: preamble.length - h,
    origHeader: h + 1,
    mapping: cells.map((c) => `"${c.replace(HEADER, "$1 ($2)")}": "${c}"`),
  };
}

async function problemsOf(data: string, folder: string): Promise<Problem[]> {
  const site = await loadSiteInputs(data);
  const w = await loadWafer(folder, { dataDir: data, today: TODAY, siteSettings: site.settings, waferListing: [folder] });
  return w.problems;
}

const names = await caseNames();

describe("the bad-input corpus read through wafer.md's reading instructions", async () => {
  const cases: { name: string; folder: string; sweep: string }[] = [];
  for (const n of names) {
    const wafers = await fs.readdir(path.join(BAD_DIR, n, "wafers")).catch(() => []);
    if (wafers.length !== 1) continue;
    const dir = path.join(BAD_DIR, n, "wafers", wafers[0], "transport");
    const files = await fs.readdir(dir).catch(() => []);
    const expected = await fs.readFile(path.join(BAD_DIR, n, "expected.txt"), "utf8");
    // Cases whose every problem is inside the one sweep file (not wafer.md, not a unit: an export's units are wafer.md's).
    const inSweep = expected
      .trim()
      .split("\n")
      .every((l) => l.startsWith(`wafers/${wafers[0]}/transport/${files[0]}:`) && !/unit/.test(l));
    if (files.length === 1 && files[0].endsWith(".csv") && inSweep) cases.push({ name: n, folder: wafers[0], sweep: files[0] });
  }

  it("covers the sweep-content cases of the corpus", () => {
    expect(cases.length).toBeGreaterThanOrEqual(10);
  });

  it.each(cases.map((c) => [c.name, c] as const))("%s", async (_, c) => {
    const src = path.join(BAD_DIR, c.name);
    const orig = await problemsOf(src, c.folder);
    const text = await fs.readFile(path.join(src, "wafers", c.folder, "transport", c.sweep), "utf8");
    const conv = convert(c.sweep, text);
    if (!conv) return; // a header an export cannot carry: covered by the corpus itself
    const data = path.join(tmp(), c.name);
    await fs.cp(src, data, { recursive: true });
    const wdir = path.join(data, "wafers", c.folder);
    await fs.rm(path.join(wdir, "transport", c.sweep));
    await fs.writeFile(path.join(wdir, "transport", conv.name), conv.text);
    const md = await fs.readFile(path.join(wdir, "wafer.md"), "utf8");
    const rules = [
      '    files: "transport/*.dat"',
      "    columns:",
      ...conv.mapping.map((m) => `      ${m}`),
      `    layout: { separator: tab, header_row: ${conv.origHeader + conv.headerShift} }`,
      "    conditions:",
      '      gate: { file_name: "Vg=(?<value>[-0-9.]+)V", unit: V }',
      '      field: { file_name: "B=(?<value>[-0-9.]+)T", unit: T }',
    ].join("\n");
    const flow = `files: "transport/*.dat", columns: { ${conv.mapping.join(", ")} }, layout: { separator: tab, header_row: ${conv.origHeader + conv.headerShift} }, conditions: { gate: { file_name: "Vg=(?<value>[-0-9.]+)V", unit: V }, field: { file_name: "B=(?<value>[-0-9.]+)T", unit: T } } }`;
    // Block or flow style, as the case's wafer.md has it.
    const newMd = /^ {4}files: /m.test(md) ? md.replace(/^ {4}files: .*$/m, rules) : md.replace(/files: "transport\/\*\.csv" \}/, flow);
    expect(newMd).not.toBe(md);
    await fs.writeFile(path.join(wdir, "wafer.md"), newMd);
    const got = await problemsOf(data, c.folder);
    const errs = (ps: Problem[]) => ps.filter((p) => p.severity === "error");
    expect(errs(got).length).toBe(errs(orig).length);
    errs(orig).forEach((o, k) => {
      const g = errs(got)[k];
      if (o.message === "unknown column") {
        // Mapped to a quantity the analysis does not know: refused at the mapping, in wafer.md.
        expect(g).toMatchObject({ file: `wafers/${c.folder}/wafer.md` });
        expect(g.message).toMatch(/mapped to an unknown quantity/);
        return;
      }
      expect(g.file).toBe(`wafers/${c.folder}/transport/${conv.name}`);
      expect(g.line).toBe(o.line === undefined ? undefined : o.line + conv.headerShift);
      expect(g.message.startsWith(o.message)).toBe(true);
      if (g.message !== o.message) expect(g.message).toMatch(/does not match `(gate|field)\.file_name` \(wafers\/.*\/wafer\.md:\d+\)/);
      expect(g.found).toBe(o.found);
    });
  });
});
