/**
 * Echoed input is capped: a 20 MB header cell used to be copied in full into
 * stderr, the index, the search index, the wafer page and results.json (60 MB
 * each). Every problem's message, found value and field now show at most 200
 * characters (expected and fix, the program's own words: 400), ending in "…"
 * (src/model/problem.ts, capProblem), wherever the problem was made.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { reportProblems } from "../../src/cli/report.ts";
import { judgeOutcome } from "../../src/judge/outcome.ts";
import { capProblem, capText, ECHO_LIMIT, formatProblem, InputError } from "../../src/model/problem.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { buildCase, HEALTHY_DIR } from "./corpus.ts";

const tmps: string[] = [];
afterAll(async () => {
  for (const t of tmps) await fs.rm(t, { recursive: true, force: true });
});

describe("capText and capProblem", () => {
  it("leave short text alone and cut long text to the limit, ending in an ellipsis", () => {
    expect(capText("x".repeat(200))).toBe("x".repeat(200));
    expect(capText("x".repeat(201))).toBe("x".repeat(199) + "…");
    expect(capText("y".repeat(20_000_000))).toHaveLength(200);
  });
  it("never split a surrogate pair (U+1F600 is two UTF-16 units)", () => {
    const cut = capText("a".repeat(198) + "😀".repeat(10));
    expect(cut).toBe("a".repeat(198) + "…");
    expect(/[\ud800-\udbff](?![\udc00-\udfff])/.test(cut)).toBe(false); // no lone high surrogate
  });
  it("apply to every InputError and to problems made as plain objects", () => {
    const long = "z".repeat(5_000_000);
    const e = new InputError({ file: "a.csv", field: long, message: `cannot read ${long}`, expected: long, found: long, fix: long });
    expect(e.problem.message.length).toBeLessThanOrEqual(ECHO_LIMIT);
    expect(e.problem.found!.length).toBeLessThanOrEqual(ECHO_LIMIT);
    expect(e.problem.field!.length).toBeLessThanOrEqual(ECHO_LIMIT);
    expect(e.problem.expected!.length).toBeLessThanOrEqual(400);
    expect(e.problem.fix!.length).toBeLessThanOrEqual(400);
    expect(e.message.length).toBeLessThan(2000);
    const plain = capProblem({ severity: "warning" as const, file: "a.csv", message: long });
    expect(plain.message.endsWith("…")).toBe(true);
    expect(plain.severity).toBe("warning");
  });
  it("judgeOutcome caps what it adds itself (an unknown 1 MB grade)", () => {
    const grade = "g".repeat(1_000_000);
    const record = { file: "wafers/W/wafer.md", grade, waivers: [], settings: DEFAULT_SETTINGS, settingOverrides: {} } as never;
    const o = judgeOutcome({ folder: "W", record, problems: [], files: [] }, undefined, {
      targets: { defaultGrade: "a", grades: { a: {} }, file: "targets.yaml" },
      sitewideErrors: [],
      siteOverrides: {},
      version: "0",
      dataDir: "",
      today: "2025-06-01",
      siteSettings: {},
    } as never);
    expect(o.problems).toHaveLength(1);
    expect(formatProblem(o.problems[0]).length).toBeLessThan(1000);
    expect(o.judgement.reasons.join("").length).toBeLessThan(1000);
  });
});

describe("a 20 MB header cell in a build", () => {
  it("gives small messages on stderr, in results.json, the pages and the search index", async () => {
    const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-echo-"));
    tmps.push(tmp);
    const data = path.join(tmp, "data");
    const out = path.join(tmp, "site");
    await fs.cp(HEALTHY_DIR, data, { recursive: true });
    await fs.cp(path.join(data, "wafers", "OK-1"), path.join(data, "wafers", "BIG"), { recursive: true });
    const record = path.join(data, "wafers", "BIG", "wafer.md");
    await fs.writeFile(record, (await fs.readFile(record, "utf8")).replace("wafer: OK-1", "wafer: BIG"));
    const sweep = path.join(data, "wafers", "BIG", "transport", "vg_0p50V.csv");
    const cell = "?" + "x".repeat(20_000_000);
    await fs.writeFile(sweep, (await fs.readFile(sweep, "utf8")).replace("B [T],", `B [T],${cell},`));

    const r = await buildCase(data, out);
    expect(r.ok).toBe(true);
    const stderr: string[] = [];
    reportProblems(r.problems, (s) => stderr.push(s));
    expect(stderr).toHaveLength(1);
    expect(stderr[0]).toMatch(/^wafers\/BIG\/transport\/vg_0p50V\.csv:3: cannot read column header "\?x+… \(expected a name with its unit in brackets/);
    expect(stderr[0].length).toBeLessThan(1000);
    const long = "x".repeat(1000);
    for (const f of ["wafers/BIG/results.json", "wafers/BIG/index.html", "results.json", "results.csv", "index.html", "assets/search-index.js"]) {
      const text = await fs.readFile(path.join(out, f), "utf8");
      expect(text.length, f).toBeLessThan(1_000_000);
      expect(text.includes(long), f).toBe(false);
    }
    expect(r.outcomes.find((o) => o.folder === "OK-1")!.judgement.verdict).toBe("pass");
  }, 60_000);
});
