/**
 * The demo site built ONCE per test run and shared by every test that only
 * reads it (the browser tests through startSite(), the CLI build test, the
 * link checks). The build is the real command line — `waferbook build --data
 * data --out <folder>`, default cache beside it — run in a child process by
 * whichever test file asks first; the other files (other vitest workers) wait
 * for it. Its exit code, stdout and stderr are kept, so a test can check what
 * the command printed.
 *
 * The run's folder comes from test/globalSetup.ts (`inject("demoSiteRoot")`);
 * the first caller claims it by creating `building/` (mkdir is atomic) and
 * writes `result.json` when the build is over. Without the global setup (a
 * file of the unit project) demoSite() refuses, rather than build a copy of
 * its own.
 *
 * A test that CHANGES a site must build its own: this one is read by several
 * files at the same time.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import path from "node:path";
import { inject } from "vitest";

declare module "vitest" {
  export interface ProvidedContext {
    demoSiteRoot: string;
  }
}

export const ROOT = path.resolve(import.meta.dirname, "../..");
/** Generous: the demo build takes ~25 s on a quiet 2-core machine and several times that when it is busy. */
export const DEMO_BUILD_TIMEOUT_MS = 600_000;
/** For a beforeAll that waits for the demo site: the build's limit and a margin for what the hook does after. */
export const DEMO_HOOK_TIMEOUT_MS = DEMO_BUILD_TIMEOUT_MS + 120_000;

export interface DemoBuild {
  /** The site folder (the output link the build made). */
  dir: string;
  /** The command line's exit code (0: built; input errors in the demo do not fail a build without --strict). */
  code: number;
  stdout: string;
  stderr: string;
  seconds: number;
}

interface Failure {
  failed: string;
}

let mine: Promise<DemoBuild> | undefined;

/** The shared demo build, whatever its exit code (a test of the command line checks it itself). */
export function demoBuild(): Promise<DemoBuild> {
  mine ??= shared();
  return mine;
}

/** The shared demo site; throws a plain message if its build did not succeed. */
export async function demoSite(): Promise<string> {
  const b = await demoBuild();
  if (b.code !== 0) {
    throw new Error(
      `the shared demo build (waferbook build --data data --out ${b.dir}) exited ${b.code} after ${b.seconds} s; its stderr ends:\n${b.stderr.slice(-2000)}`,
    );
  }
  return b.dir;
}

async function shared(): Promise<DemoBuild> {
  let root: string | undefined;
  try {
    root = inject("demoSiteRoot");
  } catch {
    root = undefined;
  }
  if (!root) {
    // A file of the unit or builds project (vitest.config.ts) has no run folder: it would pay a whole demo build of its own.
    throw new Error(
      "this test reads the shared demo site, so it belongs to the integration project (vitest.config.ts: test/cli, test/reliability, test/browser, outside UNIT_FILES and SHARED_BUILD_FILES), whose global setup gives the run its one demo build; move the test there",
    );
  }
  const result = path.join(root, "result.json");
  try {
    await fs.mkdir(path.join(root, "building"));
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
    return waitFor(result);
  }
  let outcome: DemoBuild | Failure;
  try {
    outcome = await runBuild(root);
  } catch (e) {
    outcome = { failed: (e as Error).message };
  }
  // Written whole, then renamed: a waiting file never reads half of it.
  await fs.writeFile(`${result}.part`, JSON.stringify(outcome));
  await fs.rename(`${result}.part`, result);
  if ("failed" in outcome) throw new Error(outcome.failed);
  return outcome;
}

async function waitFor(result: string): Promise<DemoBuild> {
  const deadline = Date.now() + DEMO_BUILD_TIMEOUT_MS + 60_000;
  for (;;) {
    const text = await fs.readFile(result, "utf8").catch(() => null);
    if (text !== null) {
      const outcome = JSON.parse(text) as DemoBuild | Failure;
      if ("failed" in outcome) throw new Error(outcome.failed);
      return outcome;
    }
    if (Date.now() > deadline)
      throw new Error(
        `waited ${DEMO_BUILD_TIMEOUT_MS / 1000 + 60} s for the shared demo build (another test file builds it into ${path.dirname(result)}); it never finished`,
      );
    await new Promise((r) => setTimeout(r, 250));
  }
}

function runBuild(root: string): Promise<DemoBuild> {
  const dir = path.join(root, "site");
  const t0 = Date.now();
  const seconds = () => Math.round((Date.now() - t0) / 100) / 10;
  return new Promise((resolve, reject) => {
    execFile(
      process.execPath,
      [path.join(ROOT, "bin", "waferbook.js"), "build", "--data", path.join(ROOT, "data"), "--out", dir],
      { cwd: ROOT, env: { ...process.env, CI: "true" }, timeout: DEMO_BUILD_TIMEOUT_MS, maxBuffer: 64 * 1024 * 1024 },
      (err, stdout, stderr) => {
        const e = err as (Error & { code?: number | string; killed?: boolean; signal?: string }) | null;
        if (e && typeof e.code !== "number") {
          const why = e.killed
            ? `did not finish within ${DEMO_BUILD_TIMEOUT_MS / 1000} s and was stopped`
            : `could not run (${e.code ?? e.signal ?? e.message})`;
          reject(new Error(`the shared demo build (waferbook build --data data --out ${dir}) ${why}; its stderr ends:\n${String(stderr).slice(-2000)}`));
          return;
        }
        resolve({ dir, code: e ? (e.code as number) : 0, stdout: String(stdout), stderr: String(stderr), seconds: seconds() });
      },
    );
  });
}
