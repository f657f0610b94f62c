/**
 * The malformed-input corpus (test/fixtures/bad/, one folder per case, each
 * with expected.txt): every case runs through the real build with a healthy
 * wafer (test/fixtures/healthy/wafers/OK-1) beside it, and must give exactly
 * the expected located message(s) — every problem of the file, not only the
 * first — naming the file relative to the data folder, without a stack trace;
 * the affected wafer gets verdict `error` with the message on its page and in
 * results.json; the healthy wafer is untouched. A site-wide error (targets.yaml)
 * stops the build: nothing is written (issue 15).
 *
 * The cases that only bring wafer folders (their targets.yaml is the healthy
 * one) share ONE real build: all their wafers side by side with OK-1, each
 * case's messages being those that name its own wafer folders. That is the
 * same check as a build per case — a wafer's problems are its own, which the
 * shared build proves as well: the messages of all the cases together are
 * exactly the concatenation of their expected.txt, and OK-1 stays `pass` —
 * at the cost of one build instead of seventy. A case with a targets.yaml of
 * its own builds alone.
 * Cases a git checkout cannot carry (a symbolic link, a 64 MiB file) are
 * completed at run time (corpus.ts completeCase).
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatProblem, type Problem } from "../../src/model/problem.ts";
import type { BuildResult } from "../../src/cli/build.ts";
import { BAD_DIR, buildCase, caseNames, completeCase, expectedLines, HEALTHY_DIR, prepareCase, ROOT, runCli as cli } from "./corpus.ts";

const names = await caseNames();
const tmps: string[] = [];
afterAll(async () => {
  for (const t of tmps) await fs.rm(t, { recursive: true, force: true });
});

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;").replace(/\\/g, "&#92;");
}

/** The wafer folders of each case that can share the build: nothing but wafers/ and the healthy targets.yaml. */
async function sharedCases(): Promise<Map<string, string[]>> {
  const healthyTargets = await fs.readFile(path.join(HEALTHY_DIR, "targets.yaml"), "utf8");
  const out = new Map<string, string[]>();
  for (const name of names) {
    const dir = path.join(BAD_DIR, name);
    const top = (await fs.readdir(dir)).sort();
    if (top.join(",") !== "expected.txt,targets.yaml,wafers") continue;
    if ((await fs.readFile(path.join(dir, "targets.yaml"), "utf8")) !== healthyTargets) continue;
    out.set(name, (await fs.readdir(path.join(dir, "wafers"))).sort());
  }
  return out;
}

const shared = await sharedCases();
/** Whether a problem names one of `folders` (by its wafer, or by its file under wafers/). */
const inFolders = (p: Problem, folders: string[]) => folders.some((f) => p.wafer === f || p.file === `wafers/${f}` || p.file.startsWith(`wafers/${f}/`));

interface Built {
  data: string;
  out: string;
  outside: string;
  r: BuildResult;
}
let together: Built;

beforeAll(async () => {
  const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-bad-shared-"));
  tmps.push(tmp);
  const data = path.join(tmp, "data");
  const outside = path.join(tmp, "outside.csv");
  await fs.mkdir(path.join(data, "wafers"), { recursive: true });
  await fs.copyFile(path.join(HEALTHY_DIR, "targets.yaml"), path.join(data, "targets.yaml"));
  await fs.cp(path.join(HEALTHY_DIR, "wafers", "OK-1"), path.join(data, "wafers", "OK-1"), { recursive: true });
  const seen = new Map<string, string>([["ok-1", "the healthy wafer"]]);
  for (const [name, folders] of shared) {
    for (const f of folders) {
      // Folder names that differ only in case would collide on a case-blind file system, and mix two cases' messages.
      const other = [...seen].find(([k, v]) => k === f.toLowerCase() && v !== name);
      if (other) throw new Error(`bad case ${name}: wafer folder ${f} is also used by ${other[1]}; give it a name of its own`);
      seen.set(f.toLowerCase(), name);
      await fs.cp(path.join(BAD_DIR, name, "wafers", f), path.join(data, "wafers", f), { recursive: true });
    }
    await completeCase(name, data, outside);
  }
  const out = path.join(tmp, "site");
  together = { data, out, outside, r: await buildCase(data, out) };
}, 600_000);

/** The build a case's checks read: the shared one, or one of its own. */
async function caseBuild(name: string): Promise<{ built: Built; folders: string[] | null }> {
  const folders = shared.get(name);
  if (folders) return { built: together, folders };
  const c = await prepareCase(name);
  tmps.push(c.tmp);
  return { built: { ...c, r: await buildCase(c.data, c.out) }, folders: null };
}

describe("malformed-input corpus", () => {
  it("has at least 40 cases, each with an expected.txt", async () => {
    expect(names.length).toBeGreaterThanOrEqual(40);
    for (const n of names) expect((await fs.readFile(path.join(ROOT, "test/fixtures/bad", n, "expected.txt"), "utf8")).trim()).not.toBe("");
  });

  it("the shared build: its messages are exactly those of every shared case's expected.txt, and OK-1 passes", async () => {
    expect(shared.size).toBeGreaterThanOrEqual(40);
    expect(together.r.ok).toBe(true);
    const expected: string[] = [];
    for (const name of shared.keys()) expected.push(...(await expectedLines(name, together.outside)));
    // Nothing more, nothing less: no message of one case's wafer leaks into another's, none is lost.
    expect(together.r.problems.map(formatProblem).sort()).toEqual(expected.sort());
    const ok = JSON.parse(await fs.readFile(path.join(together.out, "wafers", "OK-1", "results.json"), "utf8"));
    expect(ok.verdict).toBe("pass");
    expect(ok.errors).toEqual([]);
    expect(together.r.outcomes.length).toBe([...shared.values()].flat().length + 1);
  });

  it.each(names)("%s", async (name) => {
    const { built: c, folders } = await caseBuild(name);
    const r = c.r;
    const expected = await expectedLines(name, c.outside);
    const problems = folders ? r.problems.filter((p) => inFolders(p, folders)) : r.problems;
    const outcomes = folders ? r.outcomes.filter((o) => o.folder === "OK-1" || folders.includes(o.folder)) : r.outcomes;
    const got = problems.map(formatProblem);
    expect(got).toEqual(expected);
    const sitewide = problems.some((p) => p.severity === "error" && !p.file.startsWith("wafers/"));
    if (sitewide) {
      // A broken targets file makes every verdict unreliable: the build stops and writes nothing.
      expect(r.ok).toBe(false);
      expect(r.outcomes).toEqual([]);
      await expect(fs.stat(c.out)).rejects.toThrow();
      return;
    }
    expect(r.ok).toBe(true);
    for (const p of problems) {
      // Named relative to the data folder, and that path exists there (lstat: a refused link is still a file name).
      expect(path.isAbsolute(p.file)).toBe(false);
      await expect(fs.lstat(path.join(c.data, p.file))).resolves.toBeTruthy();
      expect(formatProblem(p)).not.toMatch(/\n|\bat .*\.ts:\d+|Error:/);
    }
    const affected = new Set(problems.filter((p) => p.wafer !== undefined).map((p) => p.wafer!));
    for (const o of outcomes) {
      const results = JSON.parse(await fs.readFile(path.join(c.out, "wafers", o.folder, "results.json"), "utf8"));
      const page = await fs.readFile(path.join(c.out, "wafers", o.folder, "index.html"), "utf8");
      expect(page).not.toMatch(/\bat [^ ]+\.ts:\d+/);
      const mine = problems.filter((p) => p.wafer === o.folder);
      if (affected.has(o.folder)) {
        const hasError = mine.some((p) => p.severity === "error");
        expect(results.verdict === "error").toBe(hasError);
        for (const p of mine) {
          expect(page).toContain(escapeHtml(formatProblem(p)));
          const list = p.severity === "error" ? results.errors : results.warnings;
          expect(list.map((e: { text: string }) => e.text)).toContain(formatProblem(p));
        }
      } else {
        expect(o.folder).toBe("OK-1");
        expect(results.verdict).toBe("pass");
        expect(results.errors).toEqual([]);
        expect(r.problems.filter((p) => p.wafer === o.folder)).toEqual([]);
      }
    }
    expect(outcomes.map((o) => o.folder)).toContain("OK-1");
    // Every wafer folder of the case was built (none lost beside the others).
    if (folders) expect(outcomes.length).toBe(folders.length + 1);
  });
});

describe("--strict on the command line", () => {
  it.each(["non-numeric-cell", "yaml-syntax-error", "symlink-outside-data"])(
    "%s: exits 1 with the message and a summary, no stack trace",
    async (name) => {
      const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-strict-"));
      tmps.push(tmp);
      const c = await prepareCase(name, tmp);
      const expected = await expectedLines(name, c.outside);
      // Without --strict the same input error exits 0 (checked for one case: the exit code does not depend on which error it is; build.test.ts checks it on the demo too).
      if (name === "non-numeric-cell") {
        const loose = await cli(["build", "--data", c.data, "--out", c.out]);
        expect(loose.code).toBe(0);
      }
      const strict = await cli(["build", "--data", c.data, "--out", c.out, "--strict"]);
      expect(strict.code).toBe(1);
      for (const line of expected) expect(strict.stderr).toContain(line);
      expect(strict.stdout).toMatch(/\d wafers \(.*\); 1 input error, 0 warnings; [\d.]+ s/);
      expect(strict.stderr).toMatch(/--strict: 1 input error \(listed above\)/);
      expect(strict.stderr).not.toMatch(/\n\s+at /);
    },
    600_000,
  );
});
