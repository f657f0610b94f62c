/**
 * `waferbook build …` run in this process (runBuild with the command line's
 * own argument parsing), its output lines collected; and every file of an
 * output folder with its bytes, for comparing two sites byte for byte. For
 * tests that build small fixture sites several times (shards, forged cache
 * pages): no child process, so no start-up per build.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { parseArgs } from "../../src/cli/args.ts";
import { runBuild } from "../../src/cli/buildCommand.ts";

export async function buildInProcess(args: string[]): Promise<{ code: number; out: string[]; err: string[] }> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await runBuild(
    { data: "", out: "", strict: false, basePath: "", quiet: true, ...(parseArgs(["build", ...args]) as { options: object }).options },
    { out: (s) => out.push(s), err: (s) => err.push(s) },
  );
  return { code, out, err };
}

/** Every file under `dir` (links and folders walked as the site holds them), by path relative to it. */
export async function siteFiles(dir: string, sub = "", acc = new Map<string, Buffer>()): Promise<Map<string, Buffer>> {
  for (const e of await fs.readdir(path.join(dir, sub), { withFileTypes: true })) {
    const rel = sub ? `${sub}/${e.name}` : e.name;
    if (e.isDirectory()) await siteFiles(dir, rel, acc);
    else acc.set(rel, await fs.readFile(path.join(dir, rel)));
  }
  return acc;
}
