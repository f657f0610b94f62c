/**
 * vitest globalSetup: one folder per test run for the demo site that
 * read-only tests share (test/helpers/demoSite.ts). Nothing is built here:
 * the first test file that asks for the demo site builds it there, once, and
 * the others wait for that build, so a run of unit tests alone pays nothing.
 * The folder (site, cache, the build's output) is removed when the run ends.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const root = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-demo-site-"));
  project.provide("demoSiteRoot", root);
  return async () => {
    await fs.rm(root, { recursive: true, force: true });
  };
}
