/**
 * `waferbook init <folder>`: creates a new data repository laid out for
 * waferbook's defaults (`--data data --out site`, cache in .waferbook-cache):
 *
 *   data/targets.yaml, data/analysis.yaml   commented starters (starter/)
 *   data/runs/run-01.md                     a run's notes
 *   data/wafers/example-01/                 one small example wafer (initExample.ts)
 *   .gitignore                              the site, build leftovers and the cache
 *   .github/workflows/waferbook.yml         CI for GitHub Actions
 *   .gitlab-ci.yml                          CI for GitLab CI/CD
 *
 * With `--shards N` the two CI files are the sharded ones
 * (starter/*-sharded.yml): N parallel `build --shard K/N` jobs, then one job
 * that merges their cache entries and builds the site (docs/scaling.md).
 *
 * then prints the next three steps. Refuses a folder that exists and is not
 * empty (exit code 2), so nothing of the user's is ever overwritten; files
 * are created exclusively ("wx") for the same reason.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import type { CommandIO } from "./commands.ts";
import { EXAMPLE_RUN, EXAMPLE_WAFER, exampleWaferFiles } from "./initExample.ts";
import { PACKAGE_ROOT } from "./paths.ts";

/** The most shards `init --shards` writes (GitLab's `parallel` allows 200; a GitHub matrix 256 jobs). */
export const MAX_CI_SHARDS = 200;

export const INIT_HELP = `waferbook init — creates a new data repository

Usage:
  waferbook init [--shards N] <folder>

Writes, into <folder> (created if missing; it must be empty):
  data/targets.yaml               your grades and limits, commented
  data/analysis.yaml              analysis settings, commented
  data/runs/${EXAMPLE_RUN}.md            notes of a growth run
  data/wafers/${EXAMPLE_WAFER}/       one small example wafer that builds cleanly
  .gitignore                      keeps the site and the cache out of git
  .github/workflows/waferbook.yml CI for GitHub Actions
  .gitlab-ci.yml                  CI for GitLab CI/CD
Both CI files check out the full history, keep .waferbook-cache between runs,
run \`waferbook check\` and then \`waferbook build --strict\`, and upload the
site (docs/publishing.md walks through them).

Options:
  --shards N    CI files that split the analysis over N parallel jobs
                (2 ≤ N ≤ ${MAX_CI_SHARDS}), each running \`waferbook build --shard K/N\`,
                then one job that merges their cache entries and builds the
                site (docs/scaling.md)
  -h, --help    show this help
  --version     print the version

Exit codes: 0 created; 2 bad usage, or <folder> is not empty.`;

/** Starter files copied as they are: source in starter/, destination in the new repository. */
const COPIED: [string, string][] = [
  ["targets.yaml", "data/targets.yaml"],
  ["analysis.yaml", "data/analysis.yaml"],
  ["run.md", `data/runs/${EXAMPLE_RUN}.md`],
  ["gitignore", ".gitignore"],
  ["github-workflow.yml", ".github/workflows/waferbook.yml"],
  ["gitlab-ci.yml", ".gitlab-ci.yml"],
];

/**
 * A sharded CI file with its number of shards set to n: the GitHub matrix
 * list `shard: [1, 2, …]` becomes 1 … n, GitLab's `parallel:` becomes n.
 */
export function withShards(text: string, n: number): string {
  const list = Array.from({ length: n }, (_, i) => i + 1).join(", ");
  return text.replace(/^(\s*shard: )\[[\d, ]*\]/m, `$1[${list}]`).replace(/^(\s*parallel: )\d+/m, `$1${n}`);
}

/** Every file of a new data repository, by path inside it; `shards`: the sharded CI files with that many shards. */
export async function starterFiles(shards?: number): Promise<Map<string, string>> {
  const files = new Map<string, string>();
  for (const [from, to] of COPIED) {
    const sharded = shards !== undefined && from.endsWith(".yml");
    const text = await fs.readFile(path.join(PACKAGE_ROOT, "starter", sharded ? from.replace(/\.yml$/, "-sharded.yml") : from), "utf8");
    files.set(to, sharded ? withShards(text, shards) : text);
  }
  for (const [rel, text] of exampleWaferFiles()) files.set(`data/${rel}`, text);
  return files;
}

/** The steps after init, for a repository created at `shown` (as the user typed it). */
export function nextSteps(shown: string): string[] {
  return [
    `1. cd ${shown} && git init, then add waferbook as a dev dependency: npm install --save-dev <waferbook's git address or tarball> (commit package.json and package-lock.json; the CI files run npm ci)`,
    "2. npx waferbook check, then npx waferbook build, and open site/index.html in a browser",
    `3. Put your first wafer in data/wafers/<id>/ (wafer.md and its raw files) in place of ${EXAMPLE_WAFER}, set your grades in data/targets.yaml, commit and push: CI checks and builds on every push (docs/publishing.md)`,
  ];
}

/** Why `dir` cannot take a new repository, or null when it can (missing, or an empty folder). */
async function refusal(dir: string): Promise<string | null> {
  const st = await fs.stat(dir).catch(() => null);
  if (!st) return null;
  if (!st.isDirectory()) return "is a file, not a folder";
  const entries = await fs.readdir(dir);
  if (entries.length === 0) return null;
  const listed = entries.sort().slice(0, 3).join(", ") + (entries.length > 3 ? ", …" : "");
  return `is not empty (holds ${listed})`;
}

/** The `init` command: argv after "init"; returns the exit code. */
export async function initCommand(argv: string[], io: CommandIO): Promise<number> {
  let parsed: { values: { help?: boolean; version?: boolean; shards?: string }; positionals: string[] };
  try {
    parsed = parseArgs({
      args: argv,
      options: { help: { type: "boolean", short: "h" }, version: { type: "boolean" }, shards: { type: "string" } },
      strict: true,
      allowPositionals: true,
    });
  } catch (e) {
    io.err(`waferbook init: ${(e as Error).message}`);
    io.err("Run `waferbook init --help` for the usage.");
    return 2;
  }
  if (parsed.values.help) {
    io.out(INIT_HELP);
    return 0;
  }
  if (parsed.values.version) {
    io.out(await io.version());
    return 0;
  }
  if (parsed.positionals.length !== 1) {
    io.err(
      `waferbook init: ${parsed.positionals.length === 0 ? "name the folder to create, e.g. waferbook init qual-data" : `one folder only, found ${parsed.positionals.length}: ${parsed.positionals.join(" ")}`}`,
    );
    io.err("Run `waferbook init --help` for the usage.");
    return 2;
  }
  let shards: number | undefined;
  if (parsed.values.shards !== undefined) {
    const raw = parsed.values.shards;
    shards = /^\d{1,4}$/.test(raw) ? Number(raw) : NaN;
    if (!(shards >= 2 && shards <= MAX_CI_SHARDS)) {
      io.err(`waferbook init: --shards needs a whole number of parallel jobs from 2 to ${MAX_CI_SHARDS}, found ${JSON.stringify(raw)}; nothing was written.`);
      io.err("Run `waferbook init --help` for the usage.");
      return 2;
    }
  }
  const shown = parsed.positionals[0];
  const dir = path.resolve(shown);
  const why = await refusal(dir);
  if (why) {
    io.err(`waferbook init: ${shown} ${why}; nothing was written.`);
    io.err("Give a new folder name, or an empty folder, so that none of its files are overwritten.");
    return 2;
  }
  const files = await starterFiles(shards);
  for (const [rel, text] of files) {
    const abs = path.join(dir, rel);
    await fs.mkdir(path.dirname(abs), { recursive: true });
    await fs.writeFile(abs, text, { flag: "wx" });
  }
  io.out(
    `Created a waferbook data repository in ${shown}/ (${files.size} files): data/ with targets, settings and an example wafer, .gitignore, and CI files for GitHub Actions and GitLab CI/CD${shards ? `, each running ${shards} shard jobs and one job that builds the site` : ""}.`,
  );
  io.out("");
  io.out("Next steps:");
  for (const s of nextSteps(shown)) io.out(`  ${s}`);
  return 0;
}
