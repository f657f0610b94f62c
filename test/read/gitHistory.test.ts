// Git history reader against a temporary repository built here (git init in os.tmpdir()).
// No published reference values: expectations are the commits and contents this test writes itself.
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GIT_ENV, GIT_TMP, hasGit } from "../helpers/gitRepo.ts";
import {
  commitsChangingFile,
  fileAtCommit,
  findRepo,
  headCommit,
  listCommits,
  makeGitRunner,
  parseGitLog,
  GitLogError,
  toDataPath,
  toRepoPath,
  type GitRepo,
} from "../../src/read/gitHistory.ts";

// Isolated from the machine's git configuration, discovery stopped at the temp folder (test/helpers/gitRepo.ts).
const TMP = GIT_TMP;
const ENV = GIT_ENV;
const run = makeGitRunner({ env: ENV });

function git(cwd: string, args: string[], date?: string): string {
  const env = { ...process.env, ...ENV, ...(date ? { GIT_AUTHOR_DATE: date, GIT_COMMITTER_DATE: date } : {}) };
  return execFileSync("git", args, { cwd, env, encoding: "utf8" });
}

describe.skipIf(!hasGit)("gitHistory with a temporary repository", () => {
  let root = "";
  let data = "";
  let outside = "";
  let repo: GitRepo;
  const hashes: string[] = [];

  beforeAll(async () => {
    root = mkdtempSync(join(TMP, "wb-git-"));
    outside = mkdtempSync(join(TMP, "wb-nogit-"));
    data = join(root, "lab data");
    mkdirSync(join(data, "wafers"), { recursive: true });
    git(root, ["init", "-q"]);
    git(root, ["config", "user.name", "Imaginary Grower"]);
    git(root, ["config", "user.email", "grower@example.invalid"]);
    git(root, ["config", "commit.gpgsign", "false"]);
    writeFileSync(join(data, "targets.yaml"), "grades:\n  A:\n    mobility: { min: 1e5 }\n");
    writeFileSync(join(data, "wafers", "W-1.md"), "---\nid: W-1\n---\n");
    git(root, ["add", "-A"]);
    git(root, ["commit", "-q", "-m", "Targets for grade A; first wafer"], "2024-03-01T10:00:00+00:00");
    writeFileSync(join(data, "targets.yaml"), "grades:\n  A:\n    mobility: { min: 2e5 }\n");
    git(root, ["commit", "-q", "-am", "Tighten mobility to 2e5"], "2024-06-15T09:30:00+00:00");
    writeFileSync(join(root, "README.md"), "not data\n");
    git(root, ["add", "README.md"]);
    git(root, ["commit", "-q", "-m", "Readme outside the data folder"], "2024-07-01T08:00:00+00:00");
    hashes.push(...git(root, ["log", "--format=%H"]).trim().split("\n").reverse());
    const found = await findRepo(data, run);
    if (!found) throw new Error("repository not found");
    repo = found;
  });

  afterAll(() => {
    if (root) rmSync(root, { recursive: true, force: true });
    if (outside) rmSync(outside, { recursive: true, force: true });
  });

  it("finds the repository, the data folder's prefix and HEAD", async () => {
    expect(realpathSync(repo.root)).toBe(root);
    expect(repo.prefix).toBe("lab data/");
    expect(repo.head).toBe(hashes[2]);
    expect(await headCommit(repo)).toBe(hashes[2]);
  });

  it("lists commits touching the data folder, newest first, with data-relative files", async () => {
    const commits = await listCommits(repo);
    expect(commits.map((c) => c.subject)).toEqual(["Tighten mobility to 2e5", "Targets for grade A; first wafer"]);
    const [second, first] = commits;
    expect(second).toMatchObject({
      hash: hashes[1],
      author: "Imaginary Grower",
      date: "2024-06-15T09:30:00+00:00",
      files: ["lab data/targets.yaml"],
      dataFiles: ["targets.yaml"],
    });
    expect(second.shortHash).toBe(hashes[1].slice(0, second.shortHash.length));
    expect(second.shortHash.length).toBeGreaterThanOrEqual(7);
    expect([...first.dataFiles].sort()).toEqual(["targets.yaml", "wafers/W-1.md"]);
  });

  it("lists the commits that changed targets.yaml and reads it at the first one", async () => {
    const history = await commitsChangingFile(repo, "targets.yaml");
    expect(history.map((c) => c.hash)).toEqual([hashes[1], hashes[0]]);
    const oldest = history[history.length - 1];
    expect(await fileAtCommit(repo, oldest.hash, "targets.yaml")).toBe("grades:\n  A:\n    mobility: { min: 1e5 }\n");
    expect(await fileAtCommit(repo, history[0].hash, "targets.yaml")).toContain("min: 2e5");
  });

  it("returns null for a file absent at a commit, and refuses a malformed hash", async () => {
    expect(await fileAtCommit(repo, hashes[0], "no-such.yaml")).toBeNull();
    await expect(fileAtCommit(repo, "--output=/tmp/x", "targets.yaml")).rejects.toThrow(RangeError);
  });

  it("honours maxCount", async () => {
    expect(await listCommits(repo, { maxCount: 1 })).toHaveLength(1);
  });

  it("returns null outside a work tree", async () => {
    expect(await findRepo(outside, run)).toBeNull();
  });

  it("handles a repository without commits", async () => {
    const empty = mkdtempSync(join(TMP, "wb-empty-"));
    try {
      git(empty, ["init", "-q"]);
      const r = await findRepo(empty, run);
      expect(r).not.toBeNull();
      expect(r?.head).toBeNull();
      if (r) expect(await listCommits(r)).toEqual([]);
    } finally {
      rmSync(empty, { recursive: true, force: true });
    }
  });
});

describe("gitHistory without git", () => {
  // Issue 13 §3: a missing git is a failure to read history, never "not a repository".
  it("rejects with a GitError when the git executable is missing", async () => {
    const missing = makeGitRunner({ gitPath: join(TMP, "definitely-not-git-here") });
    await expect(findRepo(TMP, missing)).rejects.toThrow(/git could not be run/);
  });

  it("passes on what the runner rejects with", async () => {
    await expect(findRepo("/anywhere", async () => Promise.reject(new Error("spawn git ENOENT")))).rejects.toThrow("spawn git ENOENT");
  });
});

describe("parseGitLog and path helpers", () => {
  it("parses NUL-separated records with odd subjects and file names (spaces, non-ASCII, newline)", () => {
    const rec = (h: string, subject: string, files: string[]) =>
      `${h}\0${h.slice(0, 7)}\0${"2024-01-02T03:04:05+01:00"}\0${"2024-01-02T03:04:05+01:00"}\0Zoë Example\0${subject}\0` +
      (files.length ? "\n" + files.map((f) => "M\0" + f + "\0").join("") : "");
    const out = rec("a".repeat(40), "Merge: nothing", []) + rec("b".repeat(40), "Add wafer <W-2> & data", ["d/wafers/W 2.md", "d/ü\nodd.csv", "\nother/x"]);
    const commits = parseGitLog(out, "d/");
    expect(commits).toHaveLength(2);
    expect(commits[0]).toMatchObject({ subject: "Merge: nothing", files: [], dataFiles: [] });
    expect(commits[1]).toMatchObject({
      author: "Zoë Example",
      subject: "Add wafer <W-2> & data",
      files: ["d/wafers/W 2.md", "d/ü\nodd.csv", "\nother/x"],
      dataFiles: ["wafers/W 2.md", "ü\nodd.csv"],
    });
  });

  it("reads empty output as no commits and refuses malformed output", () => {
    expect(parseGitLog("")).toEqual([]);
    expect(() => parseGitLog("\x1egarbage\0")).toThrow(GitLogError);
  });

  it("converts between data-folder and repository paths", () => {
    expect(toRepoPath({ prefix: "lab data/" }, "./wafers\\W-1.md")).toBe("lab data/wafers/W-1.md");
    expect(toDataPath({ prefix: "lab data/" }, "lab data/targets.yaml")).toBe("targets.yaml");
    expect(toDataPath({ prefix: "lab data/" }, "README.md")).toBeNull();
    expect(toDataPath({ prefix: "" }, "README.md")).toBe("README.md");
  });
});

describe.skipIf(!hasGit)("merge commits", () => {
  it("a merge lists what it changed against its first parent, so a limit a merge restores is in the targets history", async () => {
    const root = mkdtempSync(join(TMP, "wb-git-merge-"));
    try {
      git(root, ["init", "-q", "-b", "main"]);
      git(root, ["config", "user.name", "Imaginary Grower"]);
      git(root, ["config", "user.email", "grower@example.invalid"]);
      writeFileSync(join(root, "targets.yaml"), "v: 1\n");
      git(root, ["add", "-A"]);
      git(root, ["commit", "-q", "-m", "v1"], "2024-01-01T10:00:00+00:00");
      git(root, ["checkout", "-q", "-b", "side"]);
      writeFileSync(join(root, "targets.yaml"), "v: 2\n");
      git(root, ["commit", "-q", "-am", "v2 on a side branch"], "2024-01-02T10:00:00+00:00");
      git(root, ["checkout", "-q", "main"]);
      git(root, ["merge", "-q", "--no-ff", "-m", "Merge side", "side"], "2024-01-03T10:00:00+00:00");
      const repo = (await findRepo(root, run))!;
      const commits = await listCommits(repo);
      const merge = commits.find((c) => c.subject === "Merge side")!;
      expect(merge.files).toEqual(["targets.yaml"]);
      expect((await commitsChangingFile(repo, "targets.yaml")).map((c) => c.subject)).toContain("Merge side");
    } finally {
      rmSync(root, { recursive: true, force: true });
    }
  });
});
