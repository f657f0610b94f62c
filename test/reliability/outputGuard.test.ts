/**
 * Issue 13 §1: the output folder can never eat the input. Before anything is
 * written, a build refuses (OutputRefusedError; exit code 2 from the CLI, one
 * line naming both paths) an --out that is, lies inside or holds the data
 * folder — also through symbolic links and for paths that do not exist yet —,
 * one that is or holds the git work tree holding the data, or lies in its
 * .git folder; a --cache in the data folder; an existing folder waferbook did
 * not write; a file; and a parent that is not writable. Each case checks that
 * nothing at all changed on disk. The expectations are this program's own
 * rules (docs/publishing.md), not published values.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { build, OutputRefusedError } from "../../src/cli/build.ts";
import { io } from "./corpus.ts";
import { cli, healthyData, snapshot } from "./outputHelpers.ts";

const tempDir = useTempDir("guard");
let root = "";
let data = "";
beforeAll(async () => {
  root = tempDir();
  data = await healthyData(path.join(root, "data"));
  await fs.mkdir(path.join(root, "notes"));
  await fs.writeFile(path.join(root, "notes", "plan.txt"), "the lab's own notes\n");
  await fs.writeFile(path.join(root, "file.txt"), "a file\n");
  await fs.symlink(data, path.join(root, "to-data"));
  await fs.symlink(path.join(root, "notes"), path.join(root, "to-notes"));
});

const opts = (out: string, cache?: string | null) => ({ data, out, strict: false, basePath: "/", quiet: true, cache });

/** Builds, expects a refusal, and checks that not one entry under the test folder changed. */
async function refused(out: string, cache?: string | null): Promise<string> {
  const before = await snapshot(root);
  const err = await build(opts(out, cache), io).then(
    () => undefined,
    (e) => e,
  );
  expect(err, `--out ${out}`).toBeInstanceOf(OutputRefusedError);
  expect(await snapshot(root), `nothing written for --out ${out}`).toEqual(before);
  return (err as Error).message;
}

describe("an --out or --cache that reaches the data folder is refused before anything is written", () => {
  it("the data folder itself, a folder inside it, below a file in it, and a folder holding it", async () => {
    expect(await refused(data)).toBe(
      `refusing --out ${data}: it is the data folder ${data}; the data folder is only ever read; choose an output folder outside it`,
    );
    expect(await refused(path.join(data, "site"))).toContain(`it lies inside the data folder ${data}`);
    expect(await refused(path.join(data, "wafers", "OK-1", "wafer.md", "site"))).toContain(`it lies inside the data folder ${data}`);
    expect(await refused(root)).toBe(
      `refusing --out ${root}: it holds the data folder ${data}; the data folder is only ever read; choose an output folder outside it`,
    );
  }, 60_000);

  it("through a symbolic link, also for an output path that does not exist yet", async () => {
    expect(await refused(path.join(root, "to-data"))).toContain(`(resolved: ${data}): it is the data folder ${data}`);
    expect(await refused(path.join(root, "to-data", "new", "site"))).toContain(
      `(resolved: ${path.join(data, "new", "site")}): it lies inside the data folder ${data}`,
    );
  }, 60_000);

  it("a cache folder in the data folder, or the data folder as cache", async () => {
    const out = path.join(root, "site-ok");
    expect(await refused(out, path.join(data, ".cache"))).toContain(`refusing --cache ${path.join(data, ".cache")}: it lies inside the data folder ${data}`);
    expect(await refused(out, data)).toContain(`refusing --cache ${data}: it is the data folder ${data}`);
  }, 60_000);
});

describe("only a folder waferbook wrote is ever replaced", () => {
  it("refuses a non-empty folder without the marker, a link to one, a file, and a path below a file", async () => {
    expect(await refused(path.join(root, "notes"))).toBe(
      `refusing --out ${path.join(root, "notes")}: it is a folder that waferbook did not write (it holds "plan.txt" and no .waferbook-site marker); remove it or choose another --out`,
    );
    expect(await refused(path.join(root, "to-notes"))).toContain(
      `it is a symbolic link to ${JSON.stringify(path.join(root, "notes"))} that waferbook did not make`,
    );
    expect(await refused(path.join(root, "file.txt"))).toBe(
      `refusing --out ${path.join(root, "file.txt")}: it is a file, not a folder; remove it or choose another --out`,
    );
    expect(await refused(path.join(root, "file.txt", "site"))).toBe(
      `refusing --out ${path.join(root, "file.txt", "site")}: ${path.join(root, "file.txt")} is a file, not a folder; choose another --out`,
    );
  }, 60_000);
});

describe("the command line", () => {
  it("`--out .` at the top of the data's git work tree, --out in .git, and --out = data: exit 2, one line, nothing touched", async () => {
    const repo = path.join(root, "repo");
    await healthyData(path.join(repo, "data"));
    await promisify(execFile)("git", ["init", "-q", "-b", "main"], { cwd: repo });
    const before = await snapshot(root);
    const runs = await Promise.all([
      cli(["build", "--data", "data", "--out", "."], { cwd: repo }),
      cli(["build", "--data", "data", "--out", ".git/site"], { cwd: repo }),
      cli(["build", "--data", "data", "--out", "data"], { cwd: repo }),
    ]);
    const expected = [
      `waferbook: refusing --out ${repo}: it is the git work tree ${repo} that holds the data folder ${path.join(repo, "data")}; the data folder is only ever read; choose an output folder outside it`,
      `waferbook: refusing --out ${path.join(repo, ".git", "site")}: it lies inside ${path.join(repo, ".git")}, the git folder of the data folder ${path.join(repo, "data")}; the data folder is only ever read; choose an output folder outside it`,
      `waferbook: refusing --out ${path.join(repo, "data")}: it is the data folder ${path.join(repo, "data")}; the data folder is only ever read; choose an output folder outside it`,
    ];
    for (const [i, r] of runs.entries()) {
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toBe(`${expected[i]}\n`);
      expect(r.stdout).toBe("");
    }
    expect(await snapshot(root)).toEqual(before);
  }, 120_000);

  it("a parent folder the user may not write in: exit 2, one line, no stack trace, nothing written", async () => {
    const locked = path.join(root, "locked");
    await fs.mkdir(locked, { mode: 0o755 });
    await fs.chmod(locked, 0o555);
    // As root, permissions do not bind: run the command as the unprivileged user "nobody" instead.
    const asRoot = process.getuid?.() === 0;
    if (asRoot) await fs.chmod(root, 0o755);
    const before = await snapshot(root);
    const r = await cli(["build", "--data", data, "--out", path.join(locked, "site"), "--no-cache"], {
      prefix: asRoot ? ["setpriv", "--reuid=65534", "--regid=65534", "--clear-groups"] : [],
    });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toBe(
      `waferbook: refusing --out ${path.join(locked, "site")}: ${locked} is not writable, so the site (and its lock and temporary folder beside it) cannot be written there; choose another --out or fix the folder's permissions\n`,
    );
    expect(await snapshot(root)).toEqual(before);
    await fs.chmod(locked, 0o755);
  }, 120_000);
});
