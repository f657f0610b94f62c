/**
 * A worker that fails says which job it was running, and a wafer page that
 * fails to render is named, whichever thread renders it (src/cli/workerPool.ts,
 * src/cli/render.ts). Builds run as child processes with a fault injector
 * loaded by `node --import` (test/fixtures/faults/inject.mjs): it fails the
 * reads of one wafer's files in the worker threads or in the main thread.
 * WAFERBOOK_PAGES_PER_RENDER=4 over five wafers makes the build render its
 * pages in batches (of two on the render worker), as a build of more than 40
 * wafers does. The cache is filled by a `--shard 1/1` build, so every later
 * build takes its analyses and its drawn pages from the cache: the render
 * worker must start even though no analysis ran (a shard assembly).
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, describe, expect, it } from "vitest";
import { PACKAGE_ROOT } from "../../src/cli/build.ts";
import { commitAll } from "../helpers/gitRepo.ts";
import { buildInProcess, siteFiles } from "../helpers/inProcessBuild.ts";
import { useTempDir } from "../helpers/tempDir.ts";

const run = promisify(execFile);
// No micrographs (their analysis is the costly part); the faulty wafer in the middle, so a batch range holds it.
const WAFERS = ["TQ-2402", "TQ-2404", "TQ-2408", "TQ-2501", "TQ-2502"];
const FAULTY = "TQ-2408";
const INJECT = path.join(PACKAGE_ROOT, "test", "fixtures", "faults", "inject.mjs");
const tempDir = useTempDir("worker-failures");

let data = "";
let cache = "";

/** `waferbook build` in a child process over `data` with the cache filled above; its exit code and output. */
async function build(out: string, env: Record<string, string>): Promise<{ code: number; stdout: string; stderr: string }> {
  const args = [path.join(PACKAGE_ROOT, "bin", "waferbook.js"), "build", "--data", data, "--out", out, "--cache", cache];
  const childEnv = { ...process.env, CI: "true", SOURCE_DATE_EPOCH: "1780000000", WAFERBOOK_PAGES_PER_RENDER: "4", ...env };
  try {
    const r = await run(process.execPath, args, { env: childEnv, maxBuffer: 1 << 26 });
    return { code: 0, stdout: r.stdout, stderr: r.stderr };
  } catch (e) {
    const x = e as { code: number; stdout: string; stderr: string };
    return { code: x.code, stdout: x.stdout, stderr: x.stderr };
  }
}

const faulty = (mode: "throw" | "exit", thread: "worker" | "main") => ({
  NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ""} --import ${INJECT}`.trim(),
  WB_TEST_FAULT: mode,
  WB_TEST_FAULT_WAFER: FAULTY,
  WB_TEST_FAULT_THREAD: thread,
});

describe("worker and render failures name the job and the wafer", () => {
  beforeAll(async () => {
    const root = tempDir();
    data = path.join(root, "data");
    cache = path.join(root, "cache");
    const sep = path.sep;
    await fs.cp(path.join(PACKAGE_ROOT, "data"), data, {
      recursive: true,
      filter: (src) => !src.includes(`${sep}wafers${sep}`) || WAFERS.some((w) => src.includes(`${sep}wafers${sep}${w}`)),
    });
    await commitAll(data, "Demo data", { init: true });
    // Analyses and drawn pages into the cache (a shard build stores both).
    const r = await buildInProcess(["--data", data, "--out", path.join(root, "never"), "--cache", cache, "--shard", "1/1"]);
    expect(r.code, r.err.join("\n")).toBe(0);
  }, 300_000);

  it("pages from the cache are rendered on the worker, byte for byte as in the main thread", async () => {
    const root = tempDir();
    const [inWorker, inMain] = [path.join(root, "site-worker"), path.join(root, "site-main")];
    const w = await build(inWorker, { WAFERBOOK_WORKERS: "1" });
    expect(w.code, w.stderr).toBe(0);
    expect(w.stdout).toContain("analysed 0 wafers (5 from the cache); drew 0 pages (5 from the cache, 0 reused from the previous site)");
    const m = await build(inMain, { WAFERBOOK_WORKERS: "0" });
    expect(m.code, m.stderr).toBe(0);
    const a = await siteFiles(inWorker);
    const b = await siteFiles(inMain);
    expect([...a.keys()].sort()).toEqual([...b.keys()].sort());
    expect([...a].filter(([f, bytes]) => !bytes.equals(b.get(f)!)).map(([f]) => f)).toEqual([]);
  }, 300_000);

  it("a page that fails to render on the worker is named (the worker ran although no analysis did)", async () => {
    const r = await build(path.join(tempDir(), "site-throw-worker"), { WAFERBOOK_WORKERS: "1", ...faulty("throw", "worker") });
    expect(r.code).toBe(70);
    expect(r.stderr).toMatch(/the wafer pages TQ-\d+…TQ-\d+ failed in a worker/);
    expect(r.stderr).toContain(`the page of wafers/${FAULTY} could not be rendered: injected failure`);
  }, 300_000);

  it("a page that fails to render in the main thread (WAFERBOOK_WORKERS=0) is named", async () => {
    const r = await build(path.join(tempDir(), "site-throw-main"), { WAFERBOOK_WORKERS: "0", ...faulty("throw", "main") });
    expect(r.code).toBe(70);
    expect(r.stderr).toContain(`the page of wafers/${FAULTY} could not be rendered: injected failure`);
  }, 300_000);

  it("a render worker that stops names the pages it was rendering", async () => {
    const r = await build(path.join(tempDir(), "site-exit-render"), { WAFERBOOK_WORKERS: "1", ...faulty("exit", "worker") });
    expect(r.code).toBe(70);
    const range = /the worker rendering the wafer pages (TQ-\d+)…(TQ-\d+) stopped unexpectedly \(exit code 3\)/.exec(r.stderr);
    expect(range, r.stderr).not.toBeNull();
    // The batch holds the faulty wafer (ids sort as text within a batch's range).
    expect(range![1] <= FAULTY && FAULTY <= range![2]).toBe(true);
  }, 300_000);

  it("an analysis worker that stops names the wafer it was analysing", async () => {
    // One changed file: that wafer alone is analysed, on the one worker.
    await fs.appendFile(path.join(data, "wafers", FAULTY, "wafer.md"), "\n");
    const r = await build(path.join(tempDir(), "site-exit-analysis"), { WAFERBOOK_WORKERS: "1", ...faulty("exit", "worker") });
    expect(r.code).toBe(70);
    expect(r.stderr).toContain(`the worker analysing wafers/${FAULTY} stopped unexpectedly (exit code 3)`);
  }, 300_000);
});
