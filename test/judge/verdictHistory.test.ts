// Verdicts over time against a temporary git repository built here. No published values: the expectations
// follow from the targets this test commits (limits derived by hand from the values below).
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeGitRunner } from "../../src/read/gitHistory.ts";
import { loadDataHistory, type DataHistory } from "../../src/validate/load/history.ts";
import { firstRecorded, verdictsOverTime } from "../../src/judge/verdictHistory.ts";
import { changesModel, waferHistoryModel } from "../../src/publish/history.ts";
import { GIT_ENV, GIT_TMP, hasGit, historyWafer, mobilityTargets as targets, tempRepo } from "../helpers/targetsHistory.ts";

describe.skipIf(!hasGit)("verdicts over time (temporary repository)", () => {
  let repo: ReturnType<typeof tempRepo> | undefined;
  let history: DataHistory | null = null;

  beforeAll(async () => {
    repo = tempRepo("wb-vot-");
    const { commit } = repo;
    const data = join(repo.root, "data");
    mkdirSync(join(data, "wafers", "W1"), { recursive: true });
    writeFileSync(join(data, "targets.yaml"), targets("0.5e5"));
    commit("first targets", "2024-01-01T10:00:00+00:00");
    writeFileSync(join(data, "targets.yaml"), targets("1.0e5"));
    commit("targets: 1e5", "2024-02-01T10:00:00+00:00");
    writeFileSync(join(data, "wafers", "W1", "wafer.md"), "---\nwafer: W1\n---\n");
    commit("record W1", "2024-03-01T10:00:00+00:00");
    writeFileSync(join(data, "targets.yaml"), targets("2.0e5"));
    commit("targets: 2e5", "2024-04-01T10:00:00+00:00");
    writeFileSync(join(data, "targets.yaml"), 'default_grade: qubit\ngrades:\n  qubit:\n    peak_mobilty: { min: "1 cm^2/(V s)" }\n');
    commit("targets: typo", "2024-05-01T10:00:00+00:00");
    history = await loadDataHistory(data, makeGitRunner({ env: GIT_ENV }));
  });
  afterAll(() => repo?.remove());

  it("reads HEAD, the data commits and every targets version", () => {
    expect(history).not.toBeNull();
    expect(history!.head).toMatch(/^[0-9a-f]{40}$/);
    expect(history!.commits.map((c) => c.subject)).toEqual(["targets: typo", "targets: 2e5", "record W1", "targets: 1e5", "first targets"]);
    expect(history!.targetsVersions.length).toBe(4);
    expect(firstRecorded(history!.commits, "W1")).toBe("2024-03-01T10:00:00Z".replace("Z", "+00:00"));
  });

  it("passes under the targets in force when recorded, fails under a later one, and shows a version that no longer parses", () => {
    // Peak mobility 1.5e5 cm²/(V s): ≥ 1e5 passes, ≥ 2e5 fails.
    const w = historyWafer({ peak_mobility: 1.5e5 });
    const rows = verdictsOverTime(w, history!.targetsVersions, firstRecorded(history!.commits, "W1"));
    expect(rows.map((r) => r.subject)).toEqual(["targets: 1e5", "targets: 2e5", "targets: typo"]);
    expect(rows.map((r) => r.verdict)).toEqual(["pass", "fail", null]);
    expect(rows[1].reasons[0]).toContain("below the minimum");
    expect(rows[2].note).toContain("no longer parses");
    expect(rows[2].note).toContain("peak_mobilty");
  });

  it("an uncommitted wafer is judged under the newest version only; an unknown grade is said plainly", () => {
    const w = historyWafer({ peak_mobility: 1.5e5 });
    expect(verdictsOverTime(w, history!.targetsVersions, undefined).map((r) => r.subject)).toEqual(["targets: typo"]);
    const rows = verdictsOverTime({ ...w, grade: "test" }, history!.targetsVersions, "2024-03-01T10:00:00+00:00");
    expect(rows[0].note).toContain("grade test was not defined");
  });

  it("page models: changes list affected wafers with base-path links; per-wafer history", () => {
    const ch = changesModel(history, ["W1"], "/qual/");
    const rec = ch.commits.find((c) => c.subject === "record W1")!;
    expect(rec.wafers).toEqual([{ id: "W1", href: "/qual/wafers/W1/" }]);
    expect(ch.commits[0].targetsChanged).toBe(true);
    const h = waferHistoryModel(history, "W1", { values: {}, waivers: [], hasErrors: false });
    expect(h.commits.map((c) => c.subject)).toEqual(["record W1"]);
    expect(h.commits[0].files).toEqual(["wafer.md"]);
  });

  it("outside a repository there is no history, and no throw", async () => {
    const outside = mkdtempSync(join(GIT_TMP, "wb-vot-none-"));
    expect(await loadDataHistory(outside, makeGitRunner({ env: GIT_ENV }))).toBeNull();
    rmSync(outside, { recursive: true, force: true });
    expect(changesModel(null, [], "/").available).toBe(false);
  });
});
