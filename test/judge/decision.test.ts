// The lab's decision on a wafer (wafer.md `decision:`, issue 15 §4): located validation errors, the
// conflict with the computed verdict, and the commit that recorded it (temporary git repository).
// No published values: the expectations follow from the rules in docs/formats.md §1 and the limits below.
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { formatProblem, InputError } from "../../src/model/problem.ts";
import { decisionModel } from "../../src/publish/decisionSection.ts";
import { resultsCsv } from "../../src/publish/exports.ts";
import { makeGitRunner } from "../../src/read/gitHistory.ts";
import { loadDataHistory } from "../../src/validate/load/history.ts";
import { decisionCommits, type DecisionCommit } from "../../src/validate/load/decisionCommits.ts";
import { parse } from "csv-parse/sync";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";
import { GIT_ENV, hasGit, mobilityTargets, tempRepo } from "../helpers/targetsHistory.ts";

const FILE = "wafers/W1/wafer.md";
const record = (decision: string) => `---\nwafer: W1\nrun: R1\ngrown: 2025-01-10\n${decision}---\nNotes.\n`;
const DECISION = `decision:\n  state: released\n  by: "C. Quill"\n  date: 2025-02-01\n  reason: "meets the qubit targets"\n`;
const validate = (text: string) =>
  validateWafer(readFrontMatter(text, FILE), { folder: "W1", file: FILE, today: "2025-06-01", siteSettings: DEFAULT_SETTINGS });
function problem(text: string): string {
  try {
    validate(text);
  } catch (e) {
    if (e instanceof InputError) return formatProblem(e.problem);
    throw e;
  }
  return "no problem";
}

describe("decision: validation", () => {
  it("reads a valid decision", () => {
    expect(validate(record(DECISION)).decision).toEqual({ state: "released", by: "C. Quill", date: "2025-02-01", reason: "meets the qubit targets" });
    expect(validate(record("")).decision).toBeUndefined();
  });
  it("refuses a bad state, a future date, a date before growth and a missing reason, each located", () => {
    expect(problem(record(DECISION.replace("released", "accepted")))).toMatch(/^wafers\/W1\/wafer\.md:6: decision\.state: .*released \| held \| rejected/);
    expect(problem(record(DECISION.replace("2025-02-01", "2026-02-01")))).toMatch(/^wafers\/W1\/wafer\.md:8: decision\.date: decision date is in the future/);
    expect(problem(record(DECISION.replace("2025-02-01", "2025-01-02")))).toMatch(
      /^wafers\/W1\/wafer\.md:8: decision\.date: decision date is before the wafer was grown/,
    );
    expect(problem(record(DECISION.replace('  reason: "meets the qubit targets"\n', "")))).toMatch(/decision\.reason: required field is missing/);
    expect(problem(record(DECISION + "  sign: x\n"))).toMatch(/decision\.sign: unknown key/);
  });
});

describe("decision: conflict with the computed verdict", () => {
  const targets = targetsFrom(mobilityTargets("1.0e5"));
  const d = (state: "released" | "held" | "rejected") => ({ state, by: "C. Quill", date: "2025-02-01", reason: "r" });
  const failing = (state: "released" | "held" | "rejected") =>
    makeOutcome({ id: "F", devices: { HB1: { peak_mobility: 0.8e5 } }, decision: d(state) }, targets);
  const passing = (state: "released" | "held" | "rejected") =>
    makeOutcome({ id: "P", devices: { HB1: { peak_mobility: 1.2e5 } }, decision: d(state) }, targets);

  it("a released wafer that fails a target without a waiver is flagged, with the failing reason", () => {
    const m = decisionModel(failing("released"))!;
    expect(m.conflict).toMatch(/^released by C\. Quill on 2025-02-01, but the computed verdict is fail: Peak Hall mobility .* below the minimum/);
  });
  it("a rejected wafer that meets every target is flagged; held never is; agreeing decisions are not", () => {
    expect(decisionModel(passing("rejected"))!.conflict).toMatch(/every judged target is met/);
    expect(decisionModel(failing("held"))!.conflict).toBe("");
    expect(decisionModel(passing("released"))!.conflict).toBe("");
    expect(decisionModel(failing("rejected"))!.conflict).toBe("");
  });
  it("the decision and its conflict reach results.csv", () => {
    const rows: string[][] = parse(resultsCsv([failing("released"), passing("released")]));
    const at = (r: number, name: string) => rows[r][rows[0].indexOf(name)];
    expect([at(1, "decision"), at(1, "decision_by"), at(1, "decision_date"), at(1, "decision_reason")]).toEqual(["released", "C. Quill", "2025-02-01", "r"]);
    expect(at(1, "decision_conflict")).toMatch(/computed verdict is fail/);
    expect(at(2, "decision_conflict")).toBe("");
  });
});

describe.skipIf(!hasGit)("decision: the commit that recorded it", () => {
  let repo: ReturnType<typeof tempRepo> | undefined;
  let data = "";
  const find = async (decision: ReturnType<typeof validate>["decision"]): Promise<DecisionCommit | undefined> => {
    const history = await loadDataHistory(data, makeGitRunner({ env: GIT_ENV }));
    return (await decisionCommits(data, history, [{ id: "W1", file: FILE, decision }], makeGitRunner({ env: GIT_ENV }))).get("W1");
  };

  beforeAll(() => {
    repo = tempRepo("wb-dec-");
    const { commit } = repo;
    data = join(repo.root, "data");
    mkdirSync(join(data, "wafers", "W1"), { recursive: true });
    writeFileSync(join(data, FILE), record(""));
    commit("record W1", "2025-01-11T10:00:00+00:00", "Ada Fictional");
    writeFileSync(join(data, FILE), record(DECISION));
    commit("W1: released", "2025-02-01T10:00:00+00:00", "Bo Technician");
    writeFileSync(join(data, FILE), record(DECISION).replace("Notes.", "More notes."));
    commit("W1: notes", "2025-02-03T10:00:00+00:00", "Ada Fictional");
  });
  afterAll(() => repo?.remove());

  it("names the commit that recorded today's decision and its committer, and notes that it is not the decider", async () => {
    const c = await find(validate(record(DECISION)).decision);
    expect(c?.subject).toBe("W1: released"); // not the later notes commit, which left the decision as it was
    expect(c?.committer).toBe("Bo Technician");
    expect(c?.note).toBe("the decision names C. Quill, but the commit that recorded it was committed by Bo Technician");
  });

  it("says so when today's decision is not committed yet", async () => {
    const changed = record(DECISION.replace("released", "held"));
    writeFileSync(join(data, FILE), changed);
    const c = await find(validate(changed).decision);
    expect(c?.hash).toBeUndefined();
    expect(c?.note).toMatch(/not committed yet/);
  });
});
