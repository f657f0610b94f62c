// One `git cat-file --batch` process for many reads (src/read/gitObjects.ts), against a temporary
// repository built here; expectations are the files and commits this test writes itself, and the
// answers of the one-process-per-object route (rev-parse + cat-file blob, `git show -s`).
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GIT_ENV, GIT_TMP, hasGit } from "../helpers/gitRepo.ts";
import { commitNames, fileAtCommit, findRepo, listCommits, makeGitRunner, withObjectReader, type GitRepo } from "../../src/read/gitHistory.ts";

const TMP = GIT_TMP;
const ENV = GIT_ENV;
const run = makeGitRunner({ env: ENV });

function git(cwd: string, args: string[], env: Record<string, string> = {}): string {
  return execFileSync("git", args, { cwd, env: { ...process.env, ...ENV, ...env }, encoding: "utf8" });
}

describe.skipIf(!hasGit)("git objects through one cat-file --batch process", () => {
  let root = "";
  let repo: GitRepo;
  let hashes: string[] = [];

  beforeAll(async () => {
    root = mkdtempSync(join(TMP, "wb-objects-"));
    const data = join(root, "data");
    mkdirSync(join(data, "wafers", "W 1"), { recursive: true });
    git(root, ["init", "-q"]);
    git(root, ["config", "commit.gpgsign", "false"]);
    const who = (name: string) => ({
      GIT_AUTHOR_NAME: name,
      GIT_AUTHOR_EMAIL: "a@example.invalid",
      GIT_COMMITTER_NAME: "Émile Committer",
      GIT_COMMITTER_EMAIL: "c@example.invalid",
    });
    writeFileSync(join(data, "targets.yaml"), "grades: {}\n");
    git(root, ["add", "-A"]);
    git(root, ["commit", "-q", "-m", "first"], who("Ada Author"));
    // Bytes that must come back exactly: a blank last line, a NUL-free UTF-8 text with a line of its own "missing".
    writeFileSync(join(data, "wafers", "W 1", "wafer.md"), "---\nid: W 1\n---\nmissing\n\n");
    git(root, ["add", "-A"]);
    git(root, ["commit", "-q", "-m", "second"], who("Bo Author"));
    repo = (await findRepo(data, run))!;
    hashes = (await listCommits(repo)).map((c) => c.hash);
  });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  it("reads the same contents as the one-process-per-object route, in any order, and null for an absent file", async () => {
    const plain = [
      await fileAtCommit(repo, hashes[0], "wafers/W 1/wafer.md"),
      await fileAtCommit(repo, hashes[1], "wafers/W 1/wafer.md"),
      await fileAtCommit(repo, hashes[1], "targets.yaml"),
    ];
    expect(plain).toEqual(["---\nid: W 1\n---\nmissing\n\n", null, "grades: {}\n"]);
    const batched = await withObjectReader(repo, async () => {
      expect(repo.objects).toBeDefined();
      // Asked all at once: the answers come back in the order asked.
      return Promise.all([
        fileAtCommit(repo, hashes[0], "wafers/W 1/wafer.md"),
        fileAtCommit(repo, hashes[1], "wafers/W 1/wafer.md"),
        fileAtCommit(repo, hashes[1], "targets.yaml"),
      ]);
    });
    expect(batched).toEqual(plain);
    expect(repo.objects).toBeUndefined();
  });

  it("reads the committer's and author's names as `git show -s --format=%cn%x00%an` prints them", async () => {
    const shown = git(root, ["show", "-s", "--format=%cn%x00%an", hashes[0]]).replace(/\n$/, "").split("\0");
    const names = await withObjectReader(repo, () => commitNames(repo, hashes[0]));
    expect(names).toEqual({ committer: shown[0], author: shown[1] });
    expect(names).toEqual({ committer: "Émile Committer", author: "Bo Author" });
    // No reader open: null, and the caller asks git show.
    expect(await commitNames(repo, hashes[0])).toBeNull();
  });

  it("refuses a name with a line break (the protocol cannot carry it); fileAtCommit then takes the one-process route", async () => {
    await withObjectReader(repo, async () => {
      await expect(repo.objects!.read(`${hashes[0]}:a\nb`)).rejects.toThrow(RangeError);
      expect(await fileAtCommit(repo, hashes[0], "no\nsuch.md")).toBeNull();
    });
  });

  it("rejects every read with the GitError when git cannot be started", async () => {
    const missing = makeGitRunner({ gitPath: join(TMP, "definitely-not-git-here") });
    const broken: GitRepo = { ...repo, run: missing };
    await expect(withObjectReader(broken, () => fileAtCommit(broken, hashes[0], "targets.yaml"))).rejects.toThrow(/git could not be run/);
  });
});
