// `waferbook init <folder>` (src/cli/init.ts): the files of a new data repository, that they check and
// analyse cleanly, that a non-empty folder is refused, that .gitignore covers the site and the cache,
// and that both CI files run the commands docs/publishing.md documents. Expectations are this program's
// own layout and the CI services' documented keys (from memory: GitHub Actions `fetch-depth: 0` for full
// history; GitLab `GIT_DEPTH: "0"` turns shallow cloning off).
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { load } from "js-yaml";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { checkCommand } from "../../src/cli/check.ts";
import { analyseFolder } from "../../src/cli/analyseFolder.ts";
import type { CommandIO } from "../../src/cli/commands.ts";
import { initCommand } from "../../src/cli/init.ts";
import { judgeOutcome } from "../../src/judge/outcome.ts";
import { PACKAGE_ROOT } from "../../src/cli/paths.ts";
import { loadSiteInputs } from "../../src/validate/load/site.ts";

function capture(): CommandIO & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (s) => stdout.push(s), err: (s) => stderr.push(s), today: () => "2026-01-01", version: async () => "test" };
}

function walk(dir: string, base = dir): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = path.join(dir, n);
    return statSync(p).isDirectory() ? walk(p, base) : [path.relative(base, p).split(path.sep).join("/")];
  });
}

let root = "";
let repo = "";
let io: ReturnType<typeof capture>;
let code = -1;

beforeAll(async () => {
  root = mkdtempSync(path.join(tmpdir(), "wb-init-"));
  repo = path.join(root, "qual-data");
  io = capture();
  code = await initCommand([repo], io);
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("waferbook init <folder>", () => {
  it("writes the data folder, the example wafer, .gitignore and both CI files, and prints three next steps", () => {
    expect(code).toBe(0);
    expect(io.stderr).toEqual([]);
    expect(walk(repo).sort()).toEqual([
      ".github/workflows/waferbook.yml",
      ".gitignore",
      ".gitlab-ci.yml",
      "data/analysis.yaml",
      "data/runs/run-01.md",
      "data/targets.yaml",
      "data/wafers/example-01/transport/HB1/vg_0p50V.csv",
      "data/wafers/example-01/transport/HB1/vg_0p70V.csv",
      "data/wafers/example-01/transport/HB1/vg_0p90V.csv",
      "data/wafers/example-01/transport/HB1/vg_1p10V.csv",
      "data/wafers/example-01/wafer.md",
    ]);
    const text = io.stdout.join("\n");
    expect(text).toContain("Next steps:");
    expect(io.stdout.filter((l) => /^ {2}\d\. /.test(l)).map((l) => l.trim().slice(0, 2))).toEqual(["1.", "2.", "3."]);
    expect(text).toContain("npx waferbook check");
  });

  it("explains its settings: targets.yaml and analysis.yaml are commented", () => {
    for (const f of ["data/targets.yaml", "data/analysis.yaml"]) {
      const comments = readFileSync(path.join(repo, f), "utf8")
        .split("\n")
        .filter((l) => /^\s*#/.test(l));
      expect(comments.length, f).toBeGreaterThan(5);
    }
  });

  it("passes `waferbook check`: no problem in any file", async () => {
    const out = capture();
    expect(await checkCommand(["--data", path.join(repo, "data")], out)).toBe(0);
    expect(out.stdout).toHaveLength(1);
    expect(out.stdout[0]).toMatch(/^checked 1 wafer \(\d+ files read\): no problems; /);
  });

  it("analyses the example wafer without a problem, to the densities it was made with, and it passes the starter targets", async () => {
    const dataDir = path.join(repo, "data");
    const site = await loadSiteInputs(dataDir);
    expect(site.problems).toEqual([]);
    const r = await analyseFolder("example-01", { dataDir, today: "2026-01-01", siteSettings: site.settings, cacheDir: null, code: "" });
    const o = judgeOutcome(r.entry, r.entry.analysis, { targets: site.targets, siteOverrides: site.settingOverrides, version: "test", sitewideErrors: [] });
    expect(o.problems).toEqual([]);
    // The example's gate model, written out: n = 5.5e11 cm⁻²/V · (Vg − 0.3 V) (src/cli/initExample.ts); the Hall density n = B/(e·Rxy)
    // recovers it to the noise (2e-4 relative) — common practice, 1 % tolerance.
    const points = r.entry.analysis!.devices[0].points;
    expect(points).toHaveLength(4);
    for (const p of points) {
      const vg = p.gate_V;
      expect(p.density / 1e4 / (5.5e11 * (vg - 0.3))).toBeCloseTo(1, 2);
    }
    expect(o.judgement.verdict).toBe("pass");
  });

  it("keeps the site, build leftovers and the cache out of git (.gitignore, read by git itself)", () => {
    execFileSync("git", ["init", "-q", repo]);
    const ignored = (p: string) => {
      try {
        execFileSync("git", ["-C", repo, "check-ignore", "-q", p]);
        return true;
      } catch {
        return false;
      }
    };
    expect(ignored("site/index.html")).toBe(true);
    expect(ignored(".waferbook-cache/entries/x.v8")).toBe(true);
    expect(ignored(".site-building-123/index.html")).toBe(true);
    expect(ignored("data/wafers/example-01/wafer.md")).toBe(false);
    expect(ignored(".github/workflows/waferbook.yml")).toBe(false);
    rmSync(path.join(repo, ".git"), { recursive: true, force: true });
  });

  it("accepts an existing empty folder", async () => {
    const empty = path.join(root, "empty");
    mkdirSync(empty);
    expect(await initCommand([empty], capture())).toBe(0);
    expect(existsSync(path.join(empty, "data", "targets.yaml"))).toBe(true);
  });

  it("refuses a folder that is not empty (exit 2), naming it, and writes nothing", async () => {
    const full = path.join(root, "full");
    mkdirSync(full);
    writeFileSync(path.join(full, "notes.txt"), "mine");
    const out = capture();
    expect(await initCommand([full], out)).toBe(2);
    expect(out.stderr[0]).toBe(`waferbook init: ${full} is not empty (holds notes.txt); nothing was written.`);
    expect(readdirSync(full)).toEqual(["notes.txt"]);
    expect(readFileSync(path.join(full, "notes.txt"), "utf8")).toBe("mine");
  });

  it("refuses a path that is a file, no folder, or two folders (exit 2)", async () => {
    const file = path.join(root, "a-file");
    writeFileSync(file, "x");
    const out = capture();
    expect(await initCommand([file], out)).toBe(2);
    expect(out.stderr[0]).toContain("is a file, not a folder");
    expect(await initCommand([], capture())).toBe(2);
    expect(await initCommand(["a", "b"], capture())).toBe(2);
    expect(await initCommand(["--bogus", "x"], capture())).toBe(2);
  });

  it("has --help", async () => {
    const out = capture();
    expect(await initCommand(["--help"], out)).toBe(0);
    expect(out.stdout.join("\n")).toMatch(/^waferbook init — creates a new data repository/);
  });
});

/** The commands docs/publishing.md documents for CI: the `npx waferbook` lines of its "ci-commands" block. */
function documentedCommands(): string[] {
  const doc = readFileSync(path.join(PACKAGE_ROOT, "docs", "publishing.md"), "utf8");
  const block = /<!-- ci-commands -->\s*```sh\n([\s\S]*?)```/.exec(doc);
  if (!block) throw new Error("docs/publishing.md has no <!-- ci-commands --> block");
  return block[1]
    .split("\n")
    .map((l) => l.trim())
    .filter((l) => l.startsWith("npx waferbook"));
}

describe("CI files (parsed with js-yaml)", () => {
  it("docs/publishing.md documents check, then build --strict", () => {
    expect(documentedCommands()).toEqual(["npx waferbook check", "npx waferbook build --strict"]);
  });

  it("GitHub Actions: full history, the cache kept, the documented commands in order, the site uploaded", () => {
    type Step = { uses?: string; run?: string; with?: Record<string, unknown> };
    const wf = load(readFileSync(path.join(repo, ".github/workflows/waferbook.yml"), "utf8")) as {
      on: unknown;
      jobs: Record<string, { "runs-on": string; steps: Step[] }>;
    };
    expect(wf.on).toBeTruthy();
    const jobs = Object.values(wf.jobs);
    expect(jobs).toHaveLength(1);
    const steps = jobs[0].steps;
    const at = (pred: (s: Step) => boolean) => steps.findIndex(pred);
    const checkout = at((s) => !!s.uses?.startsWith("actions/checkout@"));
    expect(checkout).toBe(0);
    expect(steps[checkout].with?.["fetch-depth"]).toBe(0);
    const cache = at((s) => !!s.uses?.startsWith("actions/cache@"));
    expect(cache).toBeGreaterThan(0);
    expect(String(steps[cache].with?.path).split("\n")).toContain(".waferbook-cache");
    expect(steps.filter((s) => s.run?.includes("waferbook")).map((s) => s.run!.trim())).toEqual(documentedCommands());
    const install = at((s) => s.run?.trim() === "npm ci");
    const firstCommand = at((s) => !!s.run?.includes("waferbook"));
    expect(install).toBeGreaterThan(-1);
    expect(install).toBeLessThan(firstCommand);
    expect(cache).toBeLessThan(firstCommand);
    const upload = at((s) => !!s.uses?.startsWith("actions/upload-artifact@"));
    expect(upload).toBeGreaterThan(firstCommand);
    expect(steps[upload].with?.path).toBe("site");
  });

  it("GitLab CI/CD: full history, the cache kept, the documented commands in order, the site uploaded", () => {
    const ci = load(readFileSync(path.join(repo, ".gitlab-ci.yml"), "utf8")) as Record<
      string,
      { image?: string; variables?: Record<string, string>; cache?: { paths: string[] }; script?: string[]; artifacts?: { paths: string[] } }
    >;
    const jobs = Object.values(ci).filter((j) => j && typeof j === "object" && Array.isArray(j.script));
    expect(jobs).toHaveLength(1);
    const job = jobs[0];
    expect(job.variables?.GIT_DEPTH).toBe("0");
    expect(job.cache?.paths.map((p) => p.replace(/\/$/, ""))).toContain(".waferbook-cache");
    expect(job.script!.filter((l) => l.includes("waferbook"))).toEqual(documentedCommands());
    expect(job.script!.findIndex((l) => l.startsWith("npm ci"))).toBe(0);
    // site is a symbolic link (docs/publishing.md): the job uploads a plain copy of what it points to.
    expect(job.script!.at(-1)).toMatch(/cp -rL site\/\. site-files\//);
    expect(job.artifacts?.paths.map((p) => p.replace(/\/$/, ""))).toEqual(["site-files"]);
  });
});
