// `waferbook check` (src/cli/check.ts): every problem in every file, listed without analysing or writing;
// exit 1 on input errors, 0 otherwise (warnings listed), 2 on bad usage. The expected problems are the
// ones planted in each fixture (this program's own messages); the demo's are its documented broken
// file (TQ-2404) and one-sign sweeps (TQ-2501, DEVELOPERS.md "Demo data").
import { execFile } from "node:child_process";
import { cpSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkCommand, checkData } from "../../src/cli/check.ts";
import type { CommandIO } from "../../src/cli/commands.ts";
import { starterFiles } from "../../src/cli/init.ts";
import { PACKAGE_ROOT } from "../../src/cli/paths.ts";

function capture(): CommandIO & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (s) => stdout.push(s), err: (s) => stderr.push(s), today: () => "2026-01-01", version: async () => "9.9.9" };
}

/** Every file and folder under dir with its size and modification time: any write shows. */
function snapshot(dir: string): string[] {
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .map((e) => {
      const p = path.join(e.parentPath, e.name);
      const st = statSync(p);
      return `${path.relative(dir, p)} ${st.size} ${st.mtimeMs}`;
    })
    .sort();
}

let root = "";
let n = 0;

/** A data folder made from the init starter (data/ part), with `edit` applied to its files. */
async function fixture(edit: (files: Map<string, string>) => void): Promise<string> {
  const files = new Map([...(await starterFiles())].filter(([k]) => k.startsWith("data/")).map(([k, v]) => [k.slice(5), v]));
  edit(files);
  const dir = path.join(root, `data-${++n}`);
  for (const [rel, text] of files) {
    mkdirSync(path.dirname(path.join(dir, rel)), { recursive: true });
    writeFileSync(path.join(dir, rel), text);
  }
  return dir;
}

/** A second wafer: the example's files under another id. */
function copyWafer(files: Map<string, string>, id: string, change: (md: string) => string = (s) => s): void {
  for (const [k, v] of [...files]) {
    if (!k.startsWith("wafers/example-01/")) continue;
    const rel = k.replace("wafers/example-01/", `wafers/${id}/`);
    files.set(rel, k.endsWith("wafer.md") ? change(v.replace("wafer: example-01", `wafer: ${id}`)) : v);
  }
}

beforeAll(() => {
  root = mkdtempSync(path.join(tmpdir(), "wb-check-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("waferbook check", () => {
  it("lists a problem in every broken file — targets, settings, run notes, a record, a raw file — and exits 1", async () => {
    const dir = await fixture((f) => {
      f.set("targets.yaml", f.get("targets.yaml")!.replace('min: "1.0e5 cm^2/(V s)"', 'min: "1.0e5 kg"'));
      f.set("analysis.yaml", f.get("analysis.yaml")! + 'hall_max_feild: "0.2 T"\n');
      f.set("runs/bad..name.md", "---\nreactor: x\n---\n");
      const sweep = "wafers/example-01/transport/HB1/vg_0p90V.csv";
      const lines = f.get(sweep)!.split("\n");
      lines[20] = lines[20].replace(/,[^,]*$/, ",OVLD");
      f.set(sweep, lines.join("\n"));
      copyWafer(f, "example-02", (md) => md.replace("grown: 2025-01-15", "grown: 2099-01-15"));
    });
    const io = capture();
    expect(await checkCommand(["--data", dir], io)).toBe(1);
    const lines = io.stdout.slice(0, -1);
    const fileOf = (l: string) => l.slice(0, l.search(/[:]/));
    expect(new Set(lines.map(fileOf))).toEqual(
      new Set(["targets.yaml", "analysis.yaml", "runs/bad..name.md", "wafers/example-01/transport/HB1/vg_0p90V.csv", "wafers/example-02/wafer.md"]),
    );
    expect(lines.find((l) => l.startsWith("targets.yaml"))).toMatch(/kg/);
    expect(lines.find((l) => l.startsWith("analysis.yaml"))).toMatch(/hall_max_feild.*hall_max_field/);
    expect(lines.find((l) => l.startsWith("wafers/example-01/"))).toMatch(/^wafers\/example-01\/transport\/HB1\/vg_0p90V\.csv:21:.*OVLD/); // lines[20] is line 21
    expect(lines.find((l) => l.startsWith("wafers/example-02/"))).toMatch(/future|2099/);
    expect(io.stdout.at(-1)).toMatch(/^checked 2 wafers \(\d+ files read\): 5 input errors, 0 warnings; /);
  });

  it("makes the checks that need targets but no analysis: unknown grade, waiver of an unknown metric", async () => {
    // A record whose own fields are wrong (the waiver) is reported field by field; the grade, which
    // needs targets.yaml, is checked once the record reads (so each is shown here on its own).
    const grade = await fixture((f) => {
      f.set("wafers/example-01/wafer.md", f.get("wafers/example-01/wafer.md")!.replace("# grade: test ", "grade: qbit   "));
    });
    const waiver = await fixture((f) => {
      f.set(
        "wafers/example-01/wafer.md",
        f
          .get("wafers/example-01/wafer.md")!
          .replace("\n---\n\nAn example", '\nwaivers:\n  - { metric: peak_mobilty, reason: "r", approved_by: "A. B.", date: 2025-01-20 }\n---\n\nAn example'),
      );
    });
    const at = async (dir: string) => (await checkData(dir, "2026-01-01")).problems.map((p) => `${p.file} ${p.field} ${p.severity}`);
    expect(await at(grade)).toEqual(["wafers/example-01/wafer.md grade error"]);
    expect(await at(waiver)).toEqual(["wafers/example-01/wafer.md waivers[0].metric error"]);
  });

  it("lists warnings but exits 0 when there is no error", async () => {
    const dir = await fixture((f) => {
      const sweep = "wafers/example-01/transport/HB1/vg_0p50V.csv";
      // Keep the header lines and the rows with B ≥ 0 only: one field sign.
      f.set(
        sweep,
        f
          .get(sweep)!
          .split("\n")
          .filter((l) => !l.startsWith("-"))
          .join("\n"),
      );
    });
    const io = capture();
    expect(await checkCommand(["--data", dir], io)).toBe(0);
    expect(io.stdout).toHaveLength(2);
    expect(io.stdout[0]).toMatch(/^wafers\/example-01\/transport\/HB1\/vg_0p50V\.csv: warning: .*one sign/);
    expect(io.stdout[1]).toMatch(/: 0 input errors, 1 warning; /);
  });

  it("says so when the data folder is missing (exit 1)", async () => {
    const io = capture();
    expect(await checkCommand(["--data", path.join(root, "nowhere")], io)).toBe(1);
    expect(io.stdout[0]).toMatch(/data folder not found/);
  });

  it("has --help and --version, and refuses unknown options and arguments (exit 2)", async () => {
    const help = capture();
    expect(await checkCommand(["--help"], help)).toBe(0);
    expect(help.stdout.join("\n")).toMatch(/^waferbook check — reads and validates a data folder/);
    const version = capture();
    expect(await checkCommand(["--version"], version)).toBe(0);
    expect(version.stdout).toEqual(["9.9.9"]);
    for (const bad of [["--strict"], ["data"], ["--data"]]) {
      const io = capture();
      expect(await checkCommand(bad, io), bad.join(" ")).toBe(2);
      expect(io.stderr[0]).toMatch(/^waferbook check: /);
    }
  });

  it("on the demo, through the command line: the broken file and the one-sign sweeps, nothing written anywhere", async () => {
    const cwd = path.join(root, "cwd");
    mkdirSync(cwd);
    // A copy of the demo data, so that its snapshot is ours alone.
    const data = path.join(root, "demo");
    cpSync(path.join(PACKAGE_ROOT, "data"), data, { recursive: true });
    const before = snapshot(data);
    const started = performance.now();
    const r = await promisify(execFile)(process.execPath, [path.join(PACKAGE_ROOT, "bin", "waferbook.js"), "check", "--data", data], {
      cwd,
      timeout: 120_000,
    }).then(
      (x) => ({ code: 0, ...x }),
      (e: { code: number; stdout: string; stderr: string }) => e,
    );
    console.log(
      `check on the demo: ${((performance.now() - started) / 1000).toFixed(1)} s wall (process start included); ${r.stdout.trim().split("\n").at(-1)}`,
    );
    expect(r.code).toBe(1);
    expect(r.stderr).toBe("");
    const lines = r.stdout.trim().split("\n");
    const errors = lines.filter((l) => !l.includes(": warning: ") && !l.startsWith("checked "));
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatch(/^wafers\/TQ-2404\/transport\/HB1\/vg_0p80V\.csv:\d+: .*OVLD/);
    const warnings = lines.filter((l) => l.includes(": warning: "));
    expect(warnings.length).toBe(14);
    // The one-sign sweeps of TQ-2501, and the logger column TQ-2507's mapping leaves out (one note per device).
    expect(warnings.filter((l) => l.startsWith("wafers/TQ-2501/"))).toHaveLength(12);
    expect(warnings.filter((l) => l.startsWith("wafers/TQ-2507/wafer.md:") && l.includes('ignored: "Temp (K)"'))).toHaveLength(2);
    expect(lines.at(-1)).toMatch(/^checked 15 wafers \(\d+ files read\): 1 input error, 14 warnings; /);
    expect(snapshot(data)).toEqual(before);
    expect(readdirSync(cwd)).toEqual([]);
    expect(readFileSync(path.join(data, "targets.yaml"), "utf8")).toBe(readFileSync(path.join(PACKAGE_ROOT, "data", "targets.yaml"), "utf8"));
  });
});
