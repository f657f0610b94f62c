/**
 * Helpers for the malformed-input corpus (test/fixtures/bad/<case>/): copy a
 * case and the healthy wafer into a temporary data folder, add the parts that
 * cannot live in git (a symbolic link, a file above the size limit), and run
 * the real build into a temporary output folder.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { build, type BuildIO, type BuildResult } from "../../src/cli/build.ts";
import { MAX_TEXT_FILE_BYTES } from "../../src/read/dataFiles.ts";

export const ROOT = path.resolve(import.meta.dirname, "../..");
export const BAD_DIR = path.join(ROOT, "test", "fixtures", "bad");
export const HEALTHY_DIR = path.join(ROOT, "test", "fixtures", "healthy");
/** The date builds in these tests treat as today. */
export const TODAY = "2025-06-01";
export const STAMP = "2025-06-01T12:00:00Z";
/** Placeholder in expected.txt for the absolute path of the file a symbolic link points at. */
export const OUTSIDE = "<OUTSIDE>";

export const io: BuildIO = { log: () => {}, today: () => TODAY, now: () => STAMP };

export async function caseNames(): Promise<string[]> {
  return (await fs.readdir(BAD_DIR, { withFileTypes: true }))
    .filter((e) => e.isDirectory())
    .map((e) => e.name)
    .sort();
}

export async function prepareCase(name: string, tmpRoot?: string): Promise<{ tmp: string; data: string; out: string; outside: string }> {
  const tmp = tmpRoot ?? (await fs.mkdtemp(path.join(os.tmpdir(), `waferbook-bad-${name}-`)));
  const data = path.join(tmp, "data");
  await fs.cp(path.join(BAD_DIR, name), data, { recursive: true });
  await fs.rm(path.join(data, "expected.txt"), { force: true });
  await fs.cp(path.join(HEALTHY_DIR, "wafers", "OK-1"), path.join(data, "wafers", "OK-1"), { recursive: true });
  const outside = path.join(tmp, "outside.csv");
  await completeCase(name, data, outside);
  return { tmp, data, out: path.join(tmp, "site"), outside };
}

/** Adds to a copy of case `name` in `data` what git cannot carry; `outside` is where a symbolic link's target goes (outside the data folder). */
export async function completeCase(name: string, data: string, outside: string): Promise<void> {
  if (name === "symlink-outside-data") {
    await fs.copyFile(path.join(HEALTHY_DIR, "wafers", "OK-1", "transport", "vg_0p50V.csv"), outside);
    await fs.symlink(outside, path.join(data, "wafers", "SYMLINK", "transport", "link.csv"));
  }
  if (name === "file-too-large") {
    // A sparse file: one byte above the limit costs no disk space.
    const h = await fs.open(path.join(data, "wafers", "HUGE", "transport", "huge.csv"), "w");
    await h.truncate(MAX_TEXT_FILE_BYTES + 1);
    await h.close();
  }
}

export async function expectedLines(name: string, outside: string): Promise<string[]> {
  const text = await fs.readFile(path.join(BAD_DIR, name, "expected.txt"), "utf8");
  return text
    .split("\n")
    .filter((l) => l.trim() !== "")
    .map((l) => l.replaceAll(OUTSIDE, JSON.stringify(outside).slice(1, -1)));
}

export async function buildCase(data: string, out: string): Promise<BuildResult> {
  return build({ data, out, strict: false, basePath: "/", quiet: true }, io);
}

/** Runs the waferbook command with `args` (CI=true); its exit code and output, also when it fails. */
export async function runCli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const r = await promisify(execFile)(process.execPath, [path.join(ROOT, "bin", "waferbook.js"), ...args], { env: { ...process.env, CI: "true" } });
    return { code: 0, stdout: r.stdout, stderr: r.stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}
