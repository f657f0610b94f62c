/**
 * The malformed-input corpus (test/fixtures/bad/, one folder per case, each
 * with expected.txt): every case runs through the real build with a healthy
 * wafer (test/fixtures/healthy/wafers/OK-1) beside it, and must give exactly
 * the expected located message(s) — every problem of the file, not only the
 * first — naming the file relative to the data folder, without a stack trace;
 * the affected wafer gets verdict `error` with the message on its page and in
 * results.json; the healthy wafer is untouched. A site-wide error (targets.yaml)
 * stops the build: nothing is written (issue 15).
 * Cases a git checkout cannot carry (a symbolic link, a 64 MiB file) are
 * completed at run time by prepareCase.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, describe, expect, it } from "vitest";
import { formatProblem } from "../../src/model/problem.ts";
import { buildCase, caseNames, expectedLines, prepareCase, ROOT } from "./corpus.ts";

const names = await caseNames();
const tmps: string[] = [];
afterAll(async () => {
  for (const t of tmps) await fs.rm(t, { recursive: true, force: true });
});

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;").replace(/\\/g, "&#92;");
}

describe("malformed-input corpus", () => {
  it("has at least 40 cases, each with an expected.txt", async () => {
    expect(names.length).toBeGreaterThanOrEqual(40);
    for (const n of names) expect((await fs.readFile(path.join(ROOT, "test/fixtures/bad", n, "expected.txt"), "utf8")).trim()).not.toBe("");
  });

  it.each(names)("%s", async (name) => {
    const c = await prepareCase(name);
    tmps.push(c.tmp);
    const expected = await expectedLines(name, c.outside);
    const r = await buildCase(c.data, c.out);
    const got = r.problems.map(formatProblem);
    expect(got).toEqual(expected);
    const sitewide = r.problems.some((p) => p.severity === "error" && !p.file.startsWith("wafers/"));
    if (sitewide) {
      // A broken targets file makes every verdict unreliable: the build stops and writes nothing.
      expect(r.ok).toBe(false);
      expect(r.outcomes).toEqual([]);
      await expect(fs.stat(c.out)).rejects.toThrow();
      return;
    }
    expect(r.ok).toBe(true);
    for (const p of r.problems) {
      // Named relative to the data folder, and that path exists there (lstat: a refused link is still a file name).
      expect(path.isAbsolute(p.file)).toBe(false);
      await expect(fs.lstat(path.join(c.data, p.file))).resolves.toBeTruthy();
      expect(formatProblem(p)).not.toMatch(/\n|\bat .*\.ts:\d+|Error:/);
    }
    const affected = new Set(r.problems.filter((p) => p.wafer !== undefined).map((p) => p.wafer!));
    for (const o of r.outcomes) {
      const results = JSON.parse(await fs.readFile(path.join(c.out, "wafers", o.folder, "results.json"), "utf8"));
      const page = await fs.readFile(path.join(c.out, "wafers", o.folder, "index.html"), "utf8");
      expect(page).not.toMatch(/\bat [^ ]+\.ts:\d+/);
      const mine = r.problems.filter((p) => p.wafer === o.folder);
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
        expect(mine).toEqual([]);
      }
    }
    expect(r.outcomes.map((o) => o.folder)).toContain("OK-1");
  });
});

const run = promisify(execFile);
async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const r = await run(process.execPath, [path.join(ROOT, "bin", "waferbook.js"), ...args], { env: { ...process.env, CI: "true" } });
    return { code: 0, stdout: r.stdout, stderr: r.stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

describe("--strict on the command line", () => {
  it.each(["non-numeric-cell", "yaml-syntax-error", "symlink-outside-data"])("%s: exits 1 with the message and a summary, no stack trace", async (name) => {
    const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-strict-"));
    tmps.push(tmp);
    const c = await prepareCase(name, tmp);
    const expected = await expectedLines(name, c.outside);
    const loose = await cli(["build", "--data", c.data, "--out", c.out]);
    expect(loose.code).toBe(0);
    const strict = await cli(["build", "--data", c.data, "--out", c.out, "--strict"]);
    expect(strict.code).toBe(1);
    for (const line of expected) expect(strict.stderr).toContain(line);
    expect(strict.stdout).toMatch(/\d wafers \(.*\); 1 input error, 0 warnings; [\d.]+ s/);
    expect(strict.stderr).toMatch(/--strict: 1 input error \(listed above\)/);
    expect(strict.stderr).not.toMatch(/\n\s+at /);
  }, 60_000);
});
