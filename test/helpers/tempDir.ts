/**
 * A temporary folder for a test file: created before its tests, removed after
 * them. Returns a getter (the folder exists only once the tests run).
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll } from "vitest";

export function useTempDir(prefix: string): () => string {
  let dir = "";
  beforeAll(async () => {
    dir = await fs.mkdtemp(path.join(os.tmpdir(), `waferbook-${prefix}-`));
  });
  afterAll(async () => {
    if (dir) await fs.rm(dir, { recursive: true, force: true });
  });
  return () => dir;
}
