/**
 * Site-wide input errors (issue 15): a broken targets.yaml, analysis.yaml or
 * run note makes every verdict unreliable, so the build fails — exit 1 without
 * --strict — and the previous site stays exactly as it was. Every problem of
 * the broken file is listed, not only the first. Wafer-level errors keep
 * exit 0 (test/reliability/badInputs.test.ts, "--strict on the command line").
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildCase, HEALTHY_DIR, runCli as cli } from "./corpus.ts";

let tmp: string;
let data: string;
let out: string;
let before: { index: string; wafer: string };

beforeAll(async () => {
  tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-sitewide-"));
  data = path.join(tmp, "data");
  out = path.join(tmp, "site");
  await fs.cp(HEALTHY_DIR, data, { recursive: true });
  const first = await buildCase(data, out);
  expect(first.ok).toBe(true);
  before = { index: await fs.readFile(path.join(out, "index.html"), "utf8"), wafer: await fs.readFile(path.join(out, "wafers", "OK-1", "index.html"), "utf8") };
}, 120_000);
afterAll(async () => {
  await fs.rm(tmp, { recursive: true, force: true });
});

async function expectSiteKept(): Promise<void> {
  expect(await fs.readFile(path.join(out, "index.html"), "utf8")).toBe(before.index);
  expect(await fs.readFile(path.join(out, "wafers", "OK-1", "index.html"), "utf8")).toBe(before.wafer);
}

describe("site-wide input errors fail the build and keep the previous site", () => {
  it("targets.yaml with a misspelt metric and a bad aggregate: exit 1 without --strict, both problems listed, site kept", async () => {
    const targets = path.join(data, "targets.yaml");
    const good = await fs.readFile(targets, "utf8");
    await fs.writeFile(
      targets,
      'default_grade: test\ngrades:\n  test:\n    peak_mobilty: { min: "1e4 cm^2/(V s)" }\n    turn_on_voltage: { max: "1 V", aggregate: maximum }\n',
    );
    try {
      const r = await cli(["build", "--data", data, "--out", out]);
      expect(r.code).toBe(1);
      expect(r.stderr).toContain(
        'targets.yaml:4: grades.test.peak_mobilty: unknown metric (expected a metric key listed in docs/formats.md, found "peak_mobilty") — did you mean "peak_mobility"?',
      );
      expect(r.stderr).toContain(
        'targets.yaml:5: grades.test.turn_on_voltage.aggregate: unknown aggregate (expected mean | min | max | every-device, found "maximum")',
      );
      expect(r.stderr).toMatch(/2 site-wide input errors \(listed above\): nothing could be built; the previous site was left as it was/);
      expect(r.stderr).not.toMatch(/\n\s+at /);
      await expectSiteKept();
    } finally {
      await fs.writeFile(targets, good);
    }
  }, 60_000);

  it("analysis.yaml with two bad settings: not built, both listed, site kept", async () => {
    const file = path.join(data, "analysis.yaml");
    await fs.writeFile(file, 'hall_max_feld: "0.2 T"\nhall_min_r2: 2\n');
    try {
      const r = await buildCase(data, out);
      expect(r.ok).toBe(false);
      expect(r.problems.map((p) => `${p.file}:${p.line}: ${p.field}`)).toEqual(["analysis.yaml:1: hall_max_feld", "analysis.yaml:2: hall_min_r2"]);
      expect(r.reason).toMatch(/^2 site-wide input errors/);
      await expectSiteKept();
    } finally {
      await fs.rm(file);
    }
  }, 60_000);

  it("a run note whose front matter does not parse: not built, site kept", async () => {
    await fs.mkdir(path.join(data, "runs"), { recursive: true });
    const file = path.join(data, "runs", "R1.md");
    await fs.writeFile(file, "---\nreactor: [Heron\n---\nNotes.\n");
    try {
      const r = await buildCase(data, out);
      expect(r.ok).toBe(false);
      expect(r.problems.some((p) => p.file === "runs/R1.md" && p.severity === "error")).toBe(true);
      await expectSiteKept();
    } finally {
      await fs.rm(path.join(data, "runs"), { recursive: true });
    }
  }, 60_000);

  it("once the file is fixed, the build succeeds again (wafer-level problems alone never stop it)", async () => {
    const r = await buildCase(data, out);
    expect(r.ok).toBe(true);
  }, 60_000);
});
