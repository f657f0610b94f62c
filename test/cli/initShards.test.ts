// `waferbook init --shards N` (src/cli/init.ts, starter/*-sharded.yml): the sharded CI files, parsed with js-yaml.
// Each runs N shard jobs calling the documented shard command, keeps only the cache entries the shard wrote,
// uploads them, and one job merges them into the cache and runs the documented build. Expectations are this
// program's own interface (docs/scaling.md "Shards on CI") and the CI services' documented keys (from memory:
// GitHub Actions `strategy.matrix`, `strategy.job-total`, download-artifact v4 `pattern` + `merge-multiple`;
// GitLab `parallel: N` with CI_NODE_INDEX 1 … N and CI_NODE_TOTAL, `needs`, `cache: policy: pull`).
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { load } from "js-yaml";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { CommandIO } from "../../src/cli/commands.ts";
import { initCommand } from "../../src/cli/init.ts";
import { parseArgs } from "../../src/cli/args.ts";
import { PACKAGE_ROOT } from "../../src/cli/paths.ts";

function capture(): CommandIO & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (s) => stdout.push(s), err: (s) => stderr.push(s), today: () => "2026-01-01", version: async () => "test" };
}

let root = "";
let repo = "";
beforeAll(async () => {
  root = mkdtempSync(path.join(tmpdir(), "wb-init-shards-"));
  repo = path.join(root, "qual-data");
  expect(await initCommand(["--shards", "3", repo], capture())).toBe(0);
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** docs/scaling.md's "ci-commands-sharded" block: the shard job's command, then the assembling job's. */
function documentedCommands(): string[] {
  const doc = readFileSync(path.join(PACKAGE_ROOT, "docs", "scaling.md"), "utf8");
  const block = /<!-- ci-commands-sharded -->\s*```sh\n([\s\S]*?)```/.exec(doc);
  if (!block) throw new Error("docs/scaling.md has no <!-- ci-commands-sharded --> block");
  return block[1]
    .split("\n")
    .map((l) => l.trim())
    .filter((l) => l.startsWith("npx waferbook"));
}

/**
 * Runs a CI file's "keep only what this shard wrote" line in a scratch folder holding one entry restored
 * from an earlier run (old modification time) and one written after the mark; returns what shard-cache holds.
 */
function keptEntries(line: string): string[] {
  const dir = mkdtempSync(path.join(root, "keep-"));
  mkdirSync(path.join(dir, ".waferbook-cache", "aa"), { recursive: true });
  mkdirSync(path.join(dir, "shard-cache"));
  const old = path.join(dir, ".waferbook-cache", "aa", "aa01.slim.v8");
  writeFileSync(old, "restored");
  utimesSync(old, new Date("2026-01-01T00:00:00Z"), new Date("2026-01-01T00:00:00Z"));
  writeFileSync(path.join(dir, ".shard-start"), "");
  utimesSync(path.join(dir, ".shard-start"), new Date("2026-01-02T00:00:00Z"), new Date("2026-01-02T00:00:00Z"));
  mkdirSync(path.join(dir, ".waferbook-cache", "bb"));
  writeFileSync(path.join(dir, ".waferbook-cache", "bb", "bb02.page.v8"), "new");
  writeFileSync(path.join(dir, ".waferbook-cache", "file-hashes.json"), "{}");
  execFileSync("bash", ["-euc", line], { cwd: dir });
  const out: string[] = [];
  const walk = (d: string, rel: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) e.isDirectory() ? walk(path.join(d, e.name), `${rel}${e.name}/`) : out.push(rel + e.name);
  };
  walk(path.join(dir, "shard-cache"), "");
  return out.sort();
}

describe("waferbook init --shards N", () => {
  it("documents one command per shard job and one for the assembling job, both accepted by the parser", () => {
    expect(documentedCommands()).toEqual(["npx waferbook build --strict --shard K/N", "npx waferbook build --strict"]);
    expect(parseArgs(["build", "--strict", "--shard", "2/3"])).toMatchObject({ command: "build", options: { strict: true, shard: { index: 2, count: 3 } } });
  });

  it("refuses a number of shards that is not 2 … 200 (exit 2) and writes nothing", async () => {
    for (const bad of ["1", "0", "201", "three", "2.5"]) {
      const dir = path.join(root, `bad-${bad}`);
      const io = capture();
      expect(await initCommand(["--shards", bad, dir], io)).toBe(2);
      expect(io.stderr[0]).toMatch(/--shards needs a whole number of parallel jobs from 2 to 200/);
      expect(() => readdirSync(dir)).toThrow();
    }
  });

  it("GitHub Actions: a matrix of shards 1 … N running the shard command, then one job merging their entries and building", () => {
    type Step = { uses?: string; run?: string; with?: Record<string, unknown> };
    type Job = { needs?: string | string[]; strategy?: { matrix: { shard: number[] } }; steps: Step[] };
    const wf = load(readFileSync(path.join(repo, ".github/workflows/waferbook.yml"), "utf8")) as { on: unknown; jobs: Record<string, Job> };
    expect(wf.on).toBeTruthy();
    const [shardName, shard] = Object.entries(wf.jobs).find(([, j]) => j.strategy)!;
    expect(shard.strategy!.matrix.shard).toEqual([1, 2, 3]);
    const at = (steps: Step[], pred: (s: Step) => boolean) => steps.findIndex(pred);
    const cmds = (steps: Step[]) => steps.filter((s) => s.run?.includes("npx waferbook")).map((s) => s.run!.trim());
    // K/N from the matrix: the shard number and the number of matrix jobs.
    // biome-ignore lint/suspicious/noTemplateCurlyInString: the CI service's own expression syntax, not a JavaScript template
    expect(cmds(shard.steps).map((c) => c.replace("${{ matrix.shard }}/${{ strategy.job-total }}", "K/N"))).toEqual([documentedCommands()[0]]);
    const build = at(shard.steps, (s) => !!s.run?.includes("npx waferbook"));
    expect(at(shard.steps, (s) => !!s.uses?.startsWith("actions/checkout@"))).toBe(0);
    expect(at(shard.steps, (s) => s.run?.trim() === "npm ci")).toBeLessThan(build);
    const restore = at(shard.steps, (s) => !!s.uses?.startsWith("actions/cache/restore@"));
    expect(restore).toBeGreaterThan(0);
    expect(restore).toBeLessThan(build);
    expect(shard.steps[restore].with?.path).toBe(".waferbook-cache");
    const mark = at(shard.steps, (s) => !!s.run?.includes("touch .shard-start"));
    expect(mark).toBeGreaterThan(restore);
    expect(mark).toBeLessThan(build);
    const keep = at(shard.steps, (s) => !!s.run?.includes("-newer ../.shard-start"));
    expect(keep).toBeGreaterThan(build);
    expect(keptEntries(shard.steps[keep].run!)).toEqual(["bb/bb02.page.v8"]);
    const upload = at(shard.steps, (s) => !!s.uses?.startsWith("actions/upload-artifact@"));
    expect(upload).toBeGreaterThan(keep);
    expect(shard.steps[upload].with).toMatchObject({ path: "shard-cache" });
    const artifactName = String(shard.steps[upload].with?.name);

    const [, site] = Object.entries(wf.jobs).find(([n]) => n !== shardName)!;
    expect([site.needs].flat()).toEqual([shardName]);
    expect(site.steps[0].uses).toMatch(/^actions\/checkout@/);
    expect(site.steps[0].with?.["fetch-depth"]).toBe(0);
    const siteBuild = at(site.steps, (s) => !!s.run?.includes("npx waferbook"));
    expect(cmds(site.steps)).toEqual([documentedCommands()[1]]);
    const cache = at(site.steps, (s) => !!s.uses?.startsWith("actions/cache@"));
    expect(site.steps[cache].with?.path).toBe(".waferbook-cache");
    const download = at(site.steps, (s) => !!s.uses?.startsWith("actions/download-artifact@"));
    expect(cache).toBeLessThan(download);
    expect(download).toBeLessThan(siteBuild);
    const dl = site.steps[download].with!;
    expect(dl).toMatchObject({ "merge-multiple": true, path: ".waferbook-cache" });
    // The pattern (a glob ending in *) matches every shard's artifact name.
    expect(String(dl.pattern).endsWith("*")).toBe(true);
    expect(artifactName.startsWith(String(dl.pattern).slice(0, -1))).toBe(true);
    const siteUpload = at(site.steps, (s) => !!s.uses?.startsWith("actions/upload-artifact@"));
    expect(siteUpload).toBeGreaterThan(siteBuild);
    expect(site.steps[siteUpload].with?.path).toBe("site");
  });

  it("GitLab CI/CD: `parallel: N` shard jobs running the shard command, then one job merging their entries and building", () => {
    type Job = {
      stage?: string;
      parallel?: number;
      needs?: string[];
      variables?: Record<string, string>;
      cache?: { paths: string[]; policy?: string };
      script?: string[];
      artifacts?: { paths: string[] };
    };
    const ci = load(readFileSync(path.join(repo, ".gitlab-ci.yml"), "utf8")) as Record<string, Job> & { stages: string[] };
    const jobs = Object.entries(ci).filter(([, j]) => j && typeof j === "object" && Array.isArray((j as Job).script)) as [string, Job][];
    expect(jobs).toHaveLength(2);
    const [shardName, shard] = jobs.find(([, j]) => j.parallel !== undefined)!;
    const [, site] = jobs.find(([n]) => n !== shardName)!;
    expect(shard.parallel).toBe(3);
    const cmds = (j: Job) => j.script!.filter((l) => l.includes("npx waferbook"));
    expect(cmds(shard).map((c) => c.replace("$CI_NODE_INDEX/$CI_NODE_TOTAL", "K/N"))).toEqual([documentedCommands()[0]]);
    expect(shard.script![0]).toMatch(/^npm ci/);
    expect(shard.cache?.paths.map((p) => p.replace(/\/$/, ""))).toContain(".waferbook-cache");
    expect(shard.cache?.policy).toBe("pull");
    const build = shard.script!.findIndex((l) => l.includes("npx waferbook"));
    expect(shard.script!.findIndex((l) => l.includes("touch .shard-start"))).toBeLessThan(build);
    const keep = shard.script!.findIndex((l) => l.includes("-newer ../.shard-start"));
    expect(keep).toBeGreaterThan(build);
    expect(keptEntries(shard.script![keep])).toEqual(["bb/bb02.page.v8"]);
    expect(shard.artifacts?.paths.map((p) => p.replace(/\/$/, ""))).toEqual(["shard-cache"]);

    expect(ci.stages.indexOf(site.stage!)).toBeGreaterThan(ci.stages.indexOf(shard.stage!));
    expect(site.needs).toEqual([shardName]);
    expect(site.variables?.GIT_DEPTH).toBe("0");
    expect(site.cache?.paths.map((p) => p.replace(/\/$/, ""))).toContain(".waferbook-cache");
    expect(site.cache?.policy).toBeUndefined();
    expect(cmds(site)).toEqual([documentedCommands()[1]]);
    const merge = site.script!.findIndex((l) => l.includes("cp -r shard-cache/. .waferbook-cache/"));
    expect(merge).toBeGreaterThan(-1);
    expect(merge).toBeLessThan(site.script!.findIndex((l) => l.includes("npx waferbook")));
    expect(site.script!.at(-1)).toMatch(/cp -rL site\/\. site-files\//);
    expect(site.artifacts?.paths.map((p) => p.replace(/\/$/, ""))).toEqual(["site-files"]);
  });
});
