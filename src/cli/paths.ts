/**
 * Where the package is on disk, found by walking up from this module to the
 * folder holding waferbook's package.json. Works when the sources run
 * through tsx (this file is src/cli/paths.ts), from the compiled copy an
 * installed package runs (dist/, made by scripts/bundle.mjs) and from a
 * checkout's start-up bundle (.waferbook-build/<hash>/), where fixed "../.."
 * steps would point elsewhere. Files of other packages (Chart.js, MiniSearch)
 * are found through Node's module resolver (`packageFile`), never by a fixed
 * node_modules path: an installed waferbook may share the lab's node_modules.
 */
import { existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { fileURLToPath } from "node:url";

function isOurs(dir: string): boolean {
  try {
    return (JSON.parse(readFileSync(path.join(dir, "package.json"), "utf8")) as { name?: string }).name === "waferbook";
  } catch {
    return false;
  }
}

function findRoot(): string {
  let dir = path.dirname(fileURLToPath(import.meta.url));
  for (;;) {
    if (isOurs(dir)) return dir;
    const up = path.dirname(dir);
    if (up === dir) throw new Error("waferbook: cannot find the package folder above " + fileURLToPath(import.meta.url));
    dir = up;
  }
}

/** The package's root folder (package.json, templates/, starter/, .eleventy.js). */
export const PACKAGE_ROOT = findRoot();

/** The TypeScript sources, src/ (only in a checkout: an installed package runs dist/). */
export const SRC_DIR = path.join(PACKAGE_ROOT, "src");

declare const WAFERBOOK_BUNDLED_WORKER: string | undefined;

/** True when running compiled (dist/ or a start-up bundle), false when the sources run through tsx. */
export const BUNDLED = typeof WAFERBOOK_BUNDLED_WORKER === "string";

/** Entry module of an analysis worker thread: the bundle's worker.js when running bundled, else workerBoot.mjs (tsx). */
export function workerEntry(): URL {
  return typeof WAFERBOOK_BUNDLED_WORKER === "string" ? new URL(WAFERBOOK_BUNDLED_WORKER, import.meta.url) : new URL("./workerBoot.mjs", import.meta.url);
}

const resolver = createRequire(import.meta.url);

/**
 * The absolute path of `file` (relative to the package folder) inside the
 * installed package `name`, as Node's resolver finds it from here. The
 * package's main entry is resolved (its `exports` may hide other files) and
 * its folder is the nearest one above with that package's package.json.
 */
export function packageFile(name: string, file: string): string {
  let dir = path.dirname(resolver.resolve(name));
  for (;;) {
    const pkg = path.join(dir, "package.json");
    if (existsSync(pkg) && (JSON.parse(readFileSync(pkg, "utf8")) as { name?: string }).name === name) return path.join(dir, file);
    const up = path.dirname(dir);
    if (up === dir) throw new Error(`waferbook: cannot find the folder of the package ${name} (resolved to ${resolver.resolve(name)})`);
    dir = up;
  }
}
