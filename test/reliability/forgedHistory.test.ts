/**
 * Issue 13 §3, history that cannot be forged: the log is read as NUL-terminated
 * tokens by position (src/read/gitLog.ts), so no byte a commit message, author
 * name or path may hold (U+001E, U+001F, newlines, text that looks like a
 * field, a hash or a file status) makes a phantom commit; a log of any size is
 * streamed; a history that cannot be read is a warning on the changes page and
 * in the build output, never "not in a git repository".
 *
 * Sources: the output layout is git-log(1) (PRETTY FORMATS %H %h %aI %cI %an
 * %s, "-z", "--name-status"), checked here against the installed git itself;
 * the expected commits are the ones each test makes. Nothing is computed with
 * the code under test.
 */
import { execFileSync } from "node:child_process";
import { promises as fs, mkdirSync, mkdtempSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { findRepo, listCommits, makeGitRunner, type GitRepo, type GitRunner } from "../../src/read/gitHistory.ts";
import { GitLogParser, type GitCommit } from "../../src/read/gitLog.ts";
import { loadDataHistory, MAX_COMMITS } from "../../src/validate/load/history.ts";
import { build } from "../../src/cli/build.ts";
import { HEALTHY_DIR, io } from "./corpus.ts";

const TMP = realpathSync(tmpdir());
const ENV = { GIT_CONFIG_GLOBAL: "/dev/null", GIT_CONFIG_NOSYSTEM: "1", GIT_CEILING_DIRECTORIES: TMP };
const run = makeGitRunner({ env: ENV });
let tmp = "";
beforeAll(() => {
  tmp = mkdtempSync(path.join(TMP, "waferbook-forged-"));
});
afterAll(() => {
  if (tmp) rmSync(tmp, { recursive: true, force: true });
});

function git(cwd: string, args: string[], env: Record<string, string> = {}): string {
  return execFileSync("git", args, {
    cwd,
    env: { ...process.env, ...ENV, GIT_AUTHOR_EMAIL: "a@example.invalid", GIT_COMMITTER_NAME: "C", GIT_COMMITTER_EMAIL: "c@example.invalid", ...env },
    encoding: "utf8",
  });
}

/** A repository with the data folder "d/" inside it; returns its root. */
function newRepo(name: string): string {
  const root = path.join(tmp, name);
  mkdirSync(path.join(root, "d"), { recursive: true });
  git(root, ["init", "-q"]);
  git(root, ["config", "commit.gpgsign", "false"]);
  return root;
}

let written = 0;
/** Commits one new file under d/ with this exact message (no clean-up) and author. */
function commitFile(root: string, file: string, message: string, author: string, date = "2024-05-06T07:08:09+02:00"): void {
  writeFileSync(path.join(root, "d", file), `${++written}\n`);
  writeFileSync(path.join(root, ".msg"), message);
  git(root, ["add", "--", path.join("d", file)]);
  git(root, ["commit", "-q", "--cleanup=verbatim", "-F", ".msg"], { GIT_AUTHOR_NAME: author, GIT_AUTHOR_DATE: date, GIT_COMMITTER_DATE: date });
}

const FAKE_HASH = "f".repeat(40);
/** The attack of the issue: separators and fields of a whole invented commit inside a subject. */
const FORGED_SUBJECT = `Fix typo\x1e${FAKE_HASH}\x1fffffff\x1f2024-01-01T00:00:00+00:00\x1f2024-01-01T00:00:00+00:00\x1fInvented QA Lead\x1fApproved all wafers`;

describe("real commits whose message, author and path hold separators and fake fields", () => {
  let root = "";
  let repo: GitRepo;
  beforeAll(async () => {
    root = newRepo("fixed");
    commitFile(root, "ok.md", "An ordinary commit", "Ann Grower");
    commitFile(root, "a\x1eb\x1fc.csv", FORGED_SUBJECT, "Bo\x1f2024-01-01T00:00:00+00:00\x1eMallory");
    // A subject paragraph over two lines: git's %s joins them with a space (git-log(1), "%s: subject").
    commitFile(root, `\n${FAKE_HASH}`, `first line\nM\n\nbody ${FAKE_HASH}`, "Cy");
    commitFile(root, "M", "\nR100\x1f\x1e", "Di");
    repo = (await findRepo(path.join(root, "d"), run))!;
  });

  it("reads exactly the commits made, with their subjects, authors and paths intact", async () => {
    const commits = await listCommits(repo);
    expect(commits.map((c) => [c.subject, c.author, c.dataFiles])).toEqual([
      ["R100\x1f\x1e", "Di", ["M"]],
      ["first line M", "Cy", [`\n${FAKE_HASH}`]],
      [FORGED_SUBJECT, "Bo\x1f2024-01-01T00:00:00+00:00\x1eMallory", ["a\x1eb\x1fc.csv"]],
      ["An ordinary commit", "Ann Grower", ["ok.md"]],
    ]);
    expect(commits.map((c) => c.hash)).not.toContain(FAKE_HASH);
    expect(commits.some((c) => c.author.startsWith("Invented"))).toBe(false);
  });

  it("property: any NUL-free message, author name and file name round-trips through a real commit", async () => {
    const prop = fc.asyncProperty(text(), text(), text(), async (core, who, name) => {
      // Git trims blank lines and white space at the ends of a subject, and refuses <, > and newlines in a name: fixed letters around each core.
      const subject = `S${core.replace(/[\n\r]/g, " ")}E`;
      const author = `A${who.replace(/[<>\n\r]/g, "_")}Z`;
      const file = `f${Array.from(name.replace(/\//g, "_")).slice(0, 40).join("")}`;
      commitFile(root, file, subject, author);
      const [c] = await listCommits(repo, { maxCount: 1 });
      expect(c).toMatchObject({ subject, author, dataFiles: [file] });
    });
    await fc.assert(prop, { numRuns: 12, seed: 1301 });
  }, 20_000);
});

/** NUL-free text mixing arbitrary Unicode with the characters and strings a naive parser would split on. */
function text(): fc.Arbitrary<string> {
  const special = fc.constantFrom(
    "\x1e",
    "\x1f",
    "\n",
    "\n\n",
    "\r",
    " ",
    FAKE_HASH,
    "M",
    "\nM",
    "R100",
    "C075",
    "2024-01-01T00:00:00+00:00",
    "Invented QA Lead",
  );
  return fc.array(fc.oneof(fc.string({ unit: "binary", maxLength: 8 }), special), { maxLength: 6 }).map((parts) => parts.join("").replace(/\0/g, ""));
}

interface Synth {
  hash: string;
  short: number;
  date: string;
  committed: string;
  author: string;
  subject: string;
  entries: { status: string; paths: string[] }[];
}

const hex = (n: number) => fc.string({ unit: fc.constantFrom(..."0123456789abcdef"), minLength: n, maxLength: n });
const iso = fc
  .record({
    y: fc.integer({ min: 1970, max: 2099 }),
    mo: fc.integer({ min: 1, max: 12 }),
    d: fc.integer({ min: 1, max: 28 }),
    h: fc.integer({ min: 0, max: 23 }),
    mi: fc.integer({ min: 0, max: 59 }),
    oh: fc.integer({ min: -12, max: 14 }),
  })
  .map(({ y, mo, d, h, mi, oh }) => {
    const p = (n: number) => String(Math.abs(n)).padStart(2, "0");
    return `${y}-${p(mo)}-${p(d)}T${p(h)}:${p(mi)}:${p(mi)}${oh < 0 ? "-" : "+"}${p(oh)}:00`;
  });
const filePath = fc.tuple(fc.constantFrom("", "d/", "lab data/", "other/"), text()).map(([pre, t]) => pre + (t || "x"));
const entry = fc.oneof(
  fc.record({ status: fc.constantFrom("A", "M", "D", "T"), paths: fc.tuple(filePath) }),
  fc.record({ status: fc.constantFrom("R100", "C075", "R050"), paths: fc.tuple(filePath, filePath) }),
);
const commit: fc.Arbitrary<Synth> = fc.record({
  hash: fc.oneof(hex(40), hex(64)),
  short: fc.integer({ min: 4, max: 12 }),
  date: iso,
  committed: iso,
  author: text(),
  subject: text(),
  entries: fc.array(entry, { maxLength: 5 }),
});

/** The bytes git writes for these commits (git-log(1): -z ends every field and path with NUL; a newline comes before a commit's file list). */
function serialise(commits: Synth[]): Buffer {
  let out = "";
  for (const c of commits) {
    out += [c.hash, c.hash.slice(0, c.short), c.date, c.committed, c.author, c.subject].map((f) => `${f}\0`).join("");
    if (c.entries.length) out += "\n" + c.entries.map((e) => [e.status, ...e.paths].map((f) => `${f}\0`).join("")).join("");
  }
  return Buffer.from(out, "utf8");
}

function parseInChunks(bytes: Buffer, cuts: number[], prefix: string): GitCommit[] {
  const got: GitCommit[] = [];
  const parser = new GitLogParser(prefix, (c) => got.push(c));
  let from = 0;
  for (const cut of [...new Set(cuts.map((c) => Math.floor(c * bytes.length)))].sort((a, b) => a - b)) {
    parser.push(bytes.subarray(from, cut));
    from = cut;
  }
  parser.push(bytes.subarray(from));
  parser.end();
  return got;
}

describe("the parser on synthesised byte streams", () => {
  it("property: every commit comes back exactly, however the bytes are cut into chunks", () => {
    const prop = fc.property(
      fc.array(commit, { maxLength: 6 }),
      fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { maxLength: 8 }),
      fc.constantFrom("", "d/", "lab data/"),
      (commits, cuts, prefix) => {
        const got = parseInChunks(serialise(commits), cuts, prefix);
        const files = (c: Synth) => c.entries.flatMap((e) => e.paths);
        expect(got).toEqual(
          commits.map((c) => ({
            hash: c.hash,
            shortHash: c.hash.slice(0, c.short),
            date: c.date,
            committedAt: c.committed,
            author: c.author,
            subject: c.subject,
            files: files(c),
            // Data-folder paths: those under the prefix, with it removed (the whole list when the data folder is the repository).
            dataFiles: files(c)
              .filter((f) => f.startsWith(prefix))
              .map((f) => f.slice(prefix.length)),
          })),
        );
      },
    );
    fc.assert(prop, { numRuns: 400, seed: 1302 });
  });

  it("refuses, rather than guesses, a stream that is cut short or has a field where a status should be", () => {
    const one: Synth = {
      hash: "a".repeat(40),
      short: 7,
      date: "2024-01-01T00:00:00+00:00",
      committed: "2024-01-01T00:00:00+00:00",
      author: "A",
      subject: "s",
      entries: [{ status: "M", paths: ["x"] }],
    };
    const bytes = serialise([one]);
    for (const cut of [3, 41, bytes.length - 1, bytes.length - 2])
      expect(() => parseInChunks(bytes.subarray(0, cut), [], "")).toThrow(/could not be read at byte/);
    expect(() => parseInChunks(Buffer.concat([bytes, Buffer.from("Invented QA Lead\0")]), [], "")).toThrow(/expected a commit hash or a file status/);
    expect(() => parseInChunks(Buffer.from(`${"a".repeat(40)}\0abc\0` + "2024\0".repeat(2) + "A\0s\0"), [], "")).toThrow(/short hash/);
  });
});

/** A stand-in for git (a shell script running a Node script) answering rev-parse, and `log` with `megabytes` of history. */
async function fakeGit(dir: string, megabytes: number, failLog = false): Promise<GitRunner> {
  await fs.mkdir(dir, { recursive: true });
  const script = path.join(dir, "fake-git.mjs");
  await fs.writeFile(
    script,
    `const args = process.argv.slice(2);
const out = process.stdout;
if (args[0] === "rev-parse" && args[1] === "--is-inside-work-tree") out.write("true\\n" + process.cwd() + "\\n\\n");
else if (args[0] === "rev-parse") out.write("${"c".repeat(40)}\\n");
else if (args[0] === "log" && args.at(-1).endsWith("targets.yaml")) out.write("");
else if (args[0] === "log") {
  const total = ${megabytes} * 1048576, commits = ${MAX_COMMITS};
  const files = Math.ceil(total / commits / 1010);
  let i = 0;
  const write = () => {
    while (i < commits) {
      const h = i.toString(16).padStart(40, "0");
      let s = h + "\\0" + h.slice(0, 7) + "\\0" + "2024-01-01T00:00:00+00:00\\0".repeat(2) + "Grower\\0bulk import " + i + "\\0\\n";
      for (let k = 0; k < files; k++) s += "A\\0wafers/W-" + i + "/" + String(k).padStart(1000, "0") + ".csv\\0";
      i++;
      if (!out.write(s)) return out.once("drain", write);
    }
    ${failLog ? 'process.stderr.write("fatal: unable to read tree 0123\\n"); process.exitCode = 128;' : ""}
  };
  write();
} else process.exitCode = 1;
`,
  );
  const sh = path.join(dir, "git");
  await fs.writeFile(sh, `#!/bin/sh\nexec "${process.execPath}" "${script}" "$@"\n`, { mode: 0o755 });
  return makeGitRunner({ gitPath: sh });
}

describe("a long history streams, and a failure to read it is visible", () => {
  it("reads more than 64 MiB of log output in full (no buffer limit)", async () => {
    const data = path.join(tmp, "big-data");
    await fs.mkdir(data, { recursive: true });
    const history = await loadDataHistory(data, await fakeGit(path.join(tmp, "big-git"), 66));
    expect(history?.failure).toBeUndefined();
    expect(history?.commits).toHaveLength(MAX_COMMITS);
    const files = history!.commits.reduce((n, c) => n + c.dataFiles.length, 0);
    // 66 MiB in entries of 1010 bytes (each entry, "A\0" + a path of 1000-odd bytes + NUL, is longer): every file of every commit is there.
    expect(files).toBe(MAX_COMMITS * Math.ceil((66 * 1048576) / MAX_COMMITS / 1010));
    expect(history!.commits[0].subject).toBe("bulk import 0");
  }, 20_000);

  it("a git that fails after writing part of the log gives a failure in git's words, not a partial or absent history", async () => {
    const data = path.join(tmp, "fail-data");
    await fs.mkdir(data, { recursive: true });
    const history = await loadDataHistory(data, await fakeGit(path.join(tmp, "fail-git"), 1, true));
    expect(history).not.toBeNull();
    expect(history!.commits).toEqual([]);
    expect(history!.failure).toMatch(/exit code 128: fatal: unable to read tree/);
  });

  it("an injected stream that ends inside a commit is a failure, not a shorter history", async () => {
    const runner: GitRunner = async (args) => (args.includes("--is-inside-work-tree") ? "true\n/r\n\n" : `${"c".repeat(40)}\n`);
    runner.stream = async function* () {
      yield Buffer.from(`${"a".repeat(40)}\0aaaaaaa\0`);
    };
    const history = await loadDataHistory("/r", runner);
    expect(history?.failure).toMatch(/ends inside a commit header/);
  });

  it("a damaged .git makes the build warn, and the changes page says so instead of 'not inside a git repository'", async () => {
    const data = path.join(tmp, "damaged");
    await fs.cp(HEALTHY_DIR, data, { recursive: true });
    git(data, ["init", "-q"]);
    git(data, ["add", "-A"]);
    git(data, ["commit", "-q", "-m", "wafers"], { GIT_AUTHOR_NAME: "Ann" });
    await fs.writeFile(path.join(data, ".git", "HEAD"), "garbage\n");
    const out = path.join(tmp, "damaged-site");
    const result = await build({ data, out, strict: false, basePath: "/", quiet: true, cache: null }, io);
    const warning = result.problems.find((p) => p.severity === "warning" && /git history could not be read/.test(p.message));
    expect(warning?.message).toMatch(/\.git exists: the repository may be damaged/);
    const changes = await fs.readFile(path.join(out, "changes", "index.html"), "utf8");
    expect(changes).toMatch(/history could not be read/);
    expect(changes).not.toMatch(/not inside a git repository/);
    const wafer = await fs.readFile(path.join(out, "wafers", "OK-1", "index.html"), "utf8");
    expect(wafer).toMatch(/history could not be read/);
  }, 60_000);

  it("a folder outside any repository is still reported as such (no false warning)", async () => {
    const plain = path.join(tmp, "plain");
    await fs.mkdir(plain, { recursive: true });
    expect(await loadDataHistory(plain, run)).toBeNull();
  });
});
