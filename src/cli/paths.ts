/**
 * Where the package is on disk, found by walking up from this module to the
 * folder holding waferbook's package.json. Works both when the sources run
 * through tsx (this file is src/cli/paths.ts) and when they run from the
 * start-up bundle (bin/waferbook.js; the code then lives in
 * .waferbook-build/<hash>/), where fixed "../.." steps would point elsewhere.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

function findRoot(): string {
  let dir = path.dirname(fileURLToPath(import.meta.url));
  for (;;) {
    if (existsSync(path.join(dir, "package.json")) && existsSync(path.join(dir, "src", "cli"))) return dir;
    const up = path.dirname(dir);
    if (up === dir) throw new Error("waferbook: cannot find the package folder above " + fileURLToPath(import.meta.url));
    dir = up;
  }
}

/** The package's root folder (package.json, src/, templates/). */
export const PACKAGE_ROOT = findRoot();

/** The TypeScript sources, src/. */
export const SRC_DIR = path.join(PACKAGE_ROOT, "src");

declare const WAFERBOOK_BUNDLED_WORKER: string | undefined;

/** Entry module of an analysis worker thread: the bundle's worker.js when running bundled, else workerBoot.mjs (tsx). */
export function workerEntry(): URL {
  return typeof WAFERBOOK_BUNDLED_WORKER === "string" ? new URL(WAFERBOOK_BUNDLED_WORKER, import.meta.url) : new URL("./workerBoot.mjs", import.meta.url);
}
