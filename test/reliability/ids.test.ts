/**
 * Ids become path segments only after validation against the documented
 * pattern (docs/formats.md: letters, digits, ".", "-", "_", starting with a
 * letter or digit, at most 64, never ".."): wafer folders, run ids (record and
 * runs/<id>.md), device ids. A folder or run file whose name fails gets a
 * located problem and no page.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { WAFER_ID as ID } from "../../src/validate/waferSchema.ts";
import { build } from "../../src/cli/build.ts";
import { formatProblem } from "../../src/model/problem.ts";
import { HEALTHY_DIR, io } from "./corpus.ts";

describe("the id pattern", () => {
  it.each(["TQ-2401", "a", "A.b_c-1", "x".repeat(64)])("accepts %s", (id) => expect(ID.test(id)).toBe(true));
  it.each(["", "..", "a..b", "../x", "a/b", "a\\b", ".hidden", "-x", "_x", "a b", "a<b", 'a"b', "a%2e", "x".repeat(65), "é"])("refuses %j", (id) =>
    expect(ID.test(id)).toBe(false),
  );
});

describe("invalid names in the data folder", () => {
  it("wafer folders with bad names get problems and no pages; the other wafers build", async () => {
    const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-ids-"));
    try {
      const data = path.join(tmp, "data");
      await fs.cp(HEALTHY_DIR, data, { recursive: true });
      await fs.cp(path.join(data, "wafers/OK-1"), path.join(data, "wafers/bad name"), { recursive: true });
      await fs.cp(path.join(data, "wafers/OK-1"), path.join(data, "wafers/.hidden"), { recursive: true });
      const out = path.join(tmp, "site");
      const r = await build({ data, out, strict: false, basePath: "/", quiet: true }, io);
      expect(r.outcomes.map((o) => o.folder)).toEqual(["OK-1"]);
      expect(r.problems.map(formatProblem)).toEqual([
        'wafers/.hidden: wafer folder name is not a valid id (expected letters, digits, ".", "-", "_" (no ".."), found ".hidden") — rename the folder',
        'wafers/bad name: wafer folder name is not a valid id (expected letters, digits, ".", "-", "_" (no ".."), found "bad name") — rename the folder',
      ]);
      expect((await fs.readdir(path.join(out, "wafers"))).sort()).toEqual(["OK-1"]);
    } finally {
      await fs.rm(tmp, { recursive: true, force: true });
    }
  }, 60_000);

  it("a run file with a bad name is a site-wide error: the build stops and writes nothing (issue 15)", async () => {
    const tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-ids-"));
    try {
      const data = path.join(tmp, "data");
      await fs.cp(HEALTHY_DIR, data, { recursive: true });
      await fs.mkdir(path.join(data, "runs"));
      await fs.writeFile(path.join(data, "runs", "a..b.md"), "---\nreactor: x\n---\n");
      const out = path.join(tmp, "site");
      const r = await build({ data, out, strict: false, basePath: "/", quiet: true }, io);
      expect(r.ok).toBe(false);
      expect(r.problems.map(formatProblem)).toEqual([
        'runs/a..b.md: run file name is not a valid id (expected letters, digits, ".", "-", "_", found "a..b") — rename the file',
      ]);
      await expect(fs.stat(out)).rejects.toThrow();
    } finally {
      await fs.rm(tmp, { recursive: true, force: true });
    }
  }, 60_000);
});
