/**
 * Issue 13 §1, second round (found by a hostile review): the names a build
 * works under beside --out — its lock `<out>.lock`, its generations
 * `.<out>-gen-N`, its building folders `.<out>-building-<pid>` — are removed
 * or renamed by the build. A data folder or cache under one of those names is
 * refused before anything is written; a folder of the user's that merely
 * looks like a generation (no marker) and a lock file the build did not write
 * are never removed. The expectations are this program's own rules
 * (docs/publishing.md), not published values.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { build, OutputRefusedError } from "../../src/cli/build.ts";
import { io } from "./corpus.ts";
import { healthyData, snapshot } from "./outputHelpers.ts";

const tempDir = useTempDir("working-names");
const opts = (data: string, out: string) => ({ data, out, strict: false, basePath: "", quiet: true, cache: null });

async function refusedUnchanged(root: string, data: string, out: string): Promise<string> {
  const before = await snapshot(root);
  const err = await build(opts(data, out), io).then(
    () => undefined,
    (e) => e,
  );
  expect(err, `--data ${data} --out ${out}`).toBeInstanceOf(OutputRefusedError);
  expect(await snapshot(root)).toEqual(before);
  return (err as Error).message;
}

describe("the build's working names beside --out", () => {
  it("a data folder named like a generation, a building folder or the lock is refused, and nothing is touched", async () => {
    const root = tempDir();
    const gen = await healthyData(path.join(root, ".emp-gen-1"));
    expect(await refusedUnchanged(root, gen, path.join(root, "emp"))).toMatch(
      /the data folder .*\.emp-gen-1 is \.?.*\.emp-gen-1, a name the build uses for its own working files/,
    );
    const building = await healthyData(path.join(root, ".site-building-1"));
    await refusedUnchanged(root, building, path.join(root, "site"));
    const lock = await healthyData(path.join(root, "site.lock"));
    await refusedUnchanged(root, lock, path.join(root, "site"));
  }, 60_000);

  it("a look-alike generation folder of the user's and a lock file the build did not write are never removed", async () => {
    const root = tempDir();
    const data = await healthyData(path.join(root, "data"));
    const out = path.join(root, "emp");
    expect((await build(opts(data, out), io)).ok).toBe(true);
    await fs.mkdir(path.join(root, ".emp-gen-9"));
    await fs.writeFile(path.join(root, ".emp-gen-9", "notes.txt"), "mine\n");
    expect((await build(opts(data, out), io)).ok).toBe(true);
    expect((await build(opts(data, out), io)).ok).toBe(true);
    expect(await fs.readFile(path.join(root, ".emp-gen-9", "notes.txt"), "utf8")).toBe("mine\n");

    await fs.writeFile(`${out}.lock`, "my lock notes\n");
    expect(await refusedUnchanged(root, data, out)).toContain("is not a lock a build wrote");
    expect(await fs.readFile(`${out}.lock`, "utf8")).toBe("my lock notes\n");
  }, 90_000);
});
