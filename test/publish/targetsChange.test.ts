// A commit to targets.yaml on the changes page (issue 15 §4): limit by limit (grade, metric, before →
// after) and the wafers whose verdict that commit changed. Against a temporary git repository built
// here; the expected verdicts follow by hand from the values and limits below (no published values).
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeGitRunner } from "../../src/read/gitHistory.ts";
import { loadDataHistory, type DataHistory } from "../../src/validate/load/history.ts";
import { changesModel } from "../../src/publish/history.ts";
import { GIT_ENV, hasGit, historyWafer, mobilityTargets, tempRepo } from "../helpers/targetsHistory.ts";

const v1 = mobilityTargets("1.0e5", {
  qubit: ['turn_on_voltage: { between: ["0.1 V", "0.6 V"] }'],
  grades: '  test:\n    peak_mobility: { min: "3e4 cm^2/(V s)" }\n',
});
// Raises the mobility minimum to 1.3e5 and adds a guard band; the test grade is untouched.
const v2 = v1.replace('peak_mobility: { min: "1.0e5 cm^2/(V s)" }', 'peak_mobility: { min: "1.3e5 cm^2/(V s)", guard: "5 %" }');

const wafer = (id: string, mobility: number, grade?: string) => ({ id, ...historyWafer({ peak_mobility: mobility, turn_on_voltage: 0.3 }, { grade }) });
// Under v1 (min 1.0e5) all pass. Under v2 (min 1.3e5, guard 5 % of 1.3e5 = 6500 → marginal below 1.365e5):
// A 1.10e5 → fail, B 1.20e5 → fail, C 1.36e5 → marginal, D 1.50e5 → pass (unchanged), E (grade test, 1.1e5) unchanged.
const WAFERS = [wafer("A", 1.1e5), wafer("B", 1.2e5), wafer("C", 1.36e5), wafer("D", 1.5e5), wafer("E", 1.1e5, "test")];

describe.skipIf(!hasGit)("a targets commit on the changes page", () => {
  let repo: ReturnType<typeof tempRepo> | undefined;
  let history: DataHistory | null = null;

  beforeAll(async () => {
    repo = tempRepo("wb-tch-");
    const { commit } = repo;
    const data = join(repo.root, "data");
    mkdirSync(join(data, "wafers", "A"), { recursive: true });
    writeFileSync(join(data, "targets.yaml"), v1);
    writeFileSync(join(data, "wafers", "A", "wafer.md"), "---\nwafer: A\n---\n");
    commit("first targets", "2024-01-01T10:00:00+00:00");
    writeFileSync(join(data, "targets.yaml"), v2);
    commit("raise the mobility minimum", "2024-02-01T10:00:00+00:00");
    history = await loadDataHistory(data, makeGitRunner({ env: GIT_ENV }));
  });
  afterAll(() => repo?.remove());

  it("lists the changed limit and the wafers whose verdict the commit changed, old → new, with links", () => {
    const m = changesModel(
      history,
      WAFERS.map((w) => w.id),
      "/",
      WAFERS,
    );
    const row = m.commits.find((c) => c.subject === "raise the mobility minimum")!;
    expect(row.targetsChanged).toBe(true);
    expect(row.targets).not.toBeNull();
    expect(row.targets!.limits).toEqual([
      { grade: "qubit", metric: "peak_mobility", before: "≥ 1.00×10⁵ cm²/(V s)", after: "≥ 1.30×10⁵ cm²/(V s), guard 5 %" },
    ]);
    expect(row.targets!.flips.map((f) => [f.id, f.before, f.after, f.href])).toEqual([
      ["A", "pass", "fail", "/wafers/A/"],
      ["B", "pass", "fail", "/wafers/B/"],
      ["C", "pass", "marginal", "/wafers/C/"],
    ]);
    expect(row.targets!.note).toBe("");
  });

  it("the first version is listed as limits set, from none", () => {
    const m = changesModel(history, [], "/", WAFERS);
    const row = m.commits.find((c) => c.subject === "first targets")!;
    expect(row.targets!.first).toBe(true);
    expect(row.targets!.limits.map((l) => [l.grade, l.metric, l.before])).toEqual([
      ["qubit", "peak_mobility", "none"],
      ["qubit", "turn_on_voltage", "none"],
      ["test", "peak_mobility", "none"],
    ]);
    expect(row.targets!.flips).toEqual([]);
  });
});
