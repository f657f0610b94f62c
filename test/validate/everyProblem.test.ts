/**
 * Every problem in a file is reported, not only the first (issue 15 §1), up to
 * MAX_PROBLEMS_PER_FILE with a closing line saying how many were left out.
 * Checks on different columns or fields do not stop at the first bad one.
 * Limits and values are invented test inputs.
 */
import { describe, expect, it } from "vitest";
import { readFrontMatter, readYaml } from "../../src/read/frontMatter.ts";
import { readTable } from "../../src/read/table.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { validateSweep } from "../../src/validate/sweep.ts";
import { applySettings, DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { formatProblem, InputError, MAX_PROBLEMS_PER_FILE } from "../../src/model/problem.ts";

function problems(fn: () => unknown): string[] {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e.problems.map(formatProblem);
    throw e;
  }
  throw new Error("expected an InputError");
}
const targets = (text: string) => problems(() => validateTargets(readYaml(text, "targets.yaml"), "targets.yaml", text));
const ctx = { folder: "W-1", file: "wafers/W-1/wafer.md", today: "2026-12-01", siteSettings: DEFAULT_SETTINGS };
const wafer = (text: string) => problems(() => validateWafer(readFrontMatter(text, ctx.file), ctx));

describe("every problem of a file", () => {
  it("targets.yaml: a misspelt metric and a bad aggregate are both reported, each at its line", () => {
    const got = targets('grades:\n  q:\n    peak_mobilty: { min: "1e5 cm^2/(V s)" }\n    turn_on_voltage: { max: "1 V", aggregate: maximum }\n');
    expect(got).toEqual([
      'targets.yaml:3: grades.q.peak_mobilty: unknown metric (expected a metric key listed in docs/formats.md, found "peak_mobilty") — did you mean "peak_mobility"?',
      'targets.yaml:4: grades.q.turn_on_voltage.aggregate: unknown aggregate (expected mean | min | max | every-device, found "maximum") — use one of mean, min, max, every-device',
    ]);
  });

  it("targets.yaml: several problems inside one limit are all reported", () => {
    const got = targets('grades:\n  q:\n    peak_mobility: { min: "1e5 V", required: "yes", agregate: max }\n');
    expect(got.map((l) => l.split(": ")[1])).toEqual(["grades.q.peak_mobility.agregate", "grades.q.peak_mobility.min", "grades.q.peak_mobility.required"]);
  });

  it("targets.yaml findings block: unknown finding and unknown consequence are located errors; a valid block is read", () => {
    expect(targets("grades:\n  q:\n    findings:\n      coarse_profle: note\n      one_sign_field: ignore\n")).toEqual([
      'targets.yaml:4: grades.q.findings.coarse_profle: unknown finding (expected incoherent_well, beyond_critical_thickness, parallel_conduction, one_sign_field, fit_undetermined, coarse_profile, found "coarse_profle") — did you mean "coarse_profile"?',
      'targets.yaml:5: grades.q.findings.one_sign_field: unknown consequence (expected fail | marginal | note, found "ignore") — write one_sign_field: fail, one_sign_field: marginal or one_sign_field: note',
    ]);
    expect(targets("grades:\n  q:\n    findings: note\n")).toEqual([
      'targets.yaml:3: grades.q.findings: findings must map finding names to consequences (expected finding: fail | marginal | note, found "note") — write one finding per line under findings:, such as incoherent_well: note',
    ]);
    const t = "grades:\n  q:\n    findings: { one_sign_field: note, fit_undetermined: fail }\n";
    expect(validateTargets(readYaml(t, "targets.yaml"), "targets.yaml", t).findings).toEqual({ q: { one_sign_field: "note", fit_undetermined: "fail" } });
  });

  it("wafer.md: a misspelt waiver metric and width_um: 5O are both reported", () => {
    const text = [
      "---",
      "wafer: W-1",
      "run: R1",
      "grown: 2024-05-02",
      "devices:",
      '  - { id: HB1, geometry: hall-bar, length_um: 100, width_um: 5O, files: "t/*.csv" }',
      "waivers:",
      '  - { metric: peak_mobilty, reason: "ok", approved_by: "A. B.", date: 2024-06-01 }',
      "---",
      "",
    ].join("\n");
    expect(wafer(text)).toEqual([
      'wafers/W-1/wafer.md:6: devices[0].width_um: wrong type (expected a number, found "5O") — see docs/formats.md for this field',
      'wafers/W-1/wafer.md:8: waivers[0].metric: waiver names an unknown metric (expected a metric key from docs/formats.md, found "peak_mobilty") — did you mean "peak_mobility"?',
    ]);
  });

  it("wafer.md: a waiver names a finding, or exactly one of metric and finding", () => {
    const base = "---\nwafer: W-1\nrun: R1\ngrown: 2024-05-02\nwaivers:\n";
    const w = (body: string) => `${base}  - { ${body}, reason: "ok", approved_by: "A. B.", date: 2024-06-01 }\n---\n`;
    expect(validateWafer(readFrontMatter(w("finding: incoherent_well"), ctx.file), ctx).waivers[0].finding).toBe("incoherent_well");
    expect(wafer(w("finding: incoherent_wel"))[0]).toMatch(/waivers\[0\]\.finding: waiver names an unknown finding .* did you mean "incoherent_well"\?/);
    expect(wafer(w("metric: peak_mobility, finding: incoherent_well"))[0]).toMatch(
      /waivers\[0\]: a waiver names exactly one metric or one finding .*found both/,
    );
  });

  it("analysis settings: every bad setting is reported", () => {
    const got = problems(() =>
      applySettings(DEFAULT_SETTINGS, { hall_max_feld: "0.2 T", hall_min_r2: 2, degeneracy: "four" }, { file: "analysis.yaml", field: "" }),
    );
    expect(got.map((l) => l.split(": ")[1])).toEqual(["hall_max_feld", "hall_min_r2", "degeneracy"]);
  });

  it("a sweep: a bad unit in one column and bad cells in another are all reported", () => {
    const t = readTable("# gate: 0.5 V\nB [T],Rxx [kg],Rxy [ohm]\n-0.5,1,OVL\n0,1,0\n0.5,1,n/a\n", "s.csv");
    expect(problems(() => validateSweep(t, "hall-bar")).map((l) => l.replace(/ \(expected.*/, ""))).toEqual([
      "s.csv:2: column Rxx: unit of the longitudinal resistance is not accepted",
      "s.csv:3: column 3 (Rxy): cell is not a finite number",
      "s.csv:5: column 3 (Rxy): cell is not a finite number",
    ]);
  });

  it(`caps at ${MAX_PROBLEMS_PER_FILE} problems and says how many more there were`, () => {
    expect(MAX_PROBLEMS_PER_FILE).toBeGreaterThanOrEqual(50);
    const rows = Array.from({ length: 80 }, (_, i) => `${i / 100 - 0.4},1,bad`).join("\n");
    const got = problems(() => validateSweep(readTable(`# gate: 0.5 V\nB [T],Rxx [ohm],Rxy [ohm]\n${rows}\n`, "s.csv"), "hall-bar"));
    expect(got).toHaveLength(MAX_PROBLEMS_PER_FILE + 1);
    expect(got[MAX_PROBLEMS_PER_FILE]).toBe(
      `s.csv: ${80 - MAX_PROBLEMS_PER_FILE} more problems in this file not listed (only the first ${MAX_PROBLEMS_PER_FILE} are shown) — correct the problems above and build again to see the rest`,
    );
  });
});
