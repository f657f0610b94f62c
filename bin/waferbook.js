#!/usr/bin/env node
// The waferbook command. It runs compiled JavaScript: dist/, made from src/
// by scripts/bundle.mjs when the package is packed or prepared (npm pack,
// npm ci, an install from a git address). An installed package holds no
// sources and compiles nothing at run time.
//
// In a checkout (src/ beside this file) the sources may have changed since
// dist/ was made: dist/source-hash names the sources it was compiled from;
// when it does not match, the sources are compiled once into
// .waferbook-build/<hash>/ (about a quarter of a second) and run from there.
// If esbuild is missing or the folder read-only, or WAFERBOOK_NO_BUNDLE is
// set, the sources run through tsx (a development dependency) instead.
import { existsSync, promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const DIST = path.join(ROOT, "dist");

/** The folder of compiled code to run in a checkout, compiling first when needed; null to run the sources through tsx. */
async function checkoutBundle() {
  if (process.env.WAFERBOOK_NO_BUNDLE) return null;
  try {
    const { bundle, sourceHash } = await import(pathToFileURL(path.join(ROOT, "scripts", "bundle.mjs")).href);
    const hash = await sourceHash(ROOT);
    if ((await fs.readFile(path.join(DIST, "source-hash"), "utf8").catch(() => "")).trim() === hash) return DIST;
    const buildDir = path.join(ROOT, ".waferbook-build");
    const dir = path.join(buildDir, hash);
    if (!existsSync(path.join(dir, "main.js"))) await bundle(ROOT, dir);
    // Copies of older sources untouched for a day are of no further use (a build still running from one keeps it).
    for (const old of await fs.readdir(buildDir)) {
      const st = await fs.stat(path.join(buildDir, old)).catch(() => undefined);
      if (old !== hash && st && Date.now() - st.mtimeMs > 86400e3) await fs.rm(path.join(buildDir, old), { recursive: true, force: true });
    }
    return dir;
  } catch {
    return null;
  }
}

let main;
if (!existsSync(path.join(ROOT, "src", "cli", "main.ts"))) {
  // An installed package: dist/ is all there is.
  if (!existsSync(path.join(DIST, "main.js"))) {
    process.stderr.write(
      `waferbook: ${DIST} is missing: this copy of waferbook was installed without being compiled (npm runs "prepare" for that); reinstall it with npm.\n`,
    );
    process.exit(70);
  }
  ({ main } = await import(pathToFileURL(path.join(DIST, "main.js")).href));
} else {
  const dir = await checkoutBundle();
  if (dir) ({ main } = await import(pathToFileURL(path.join(dir, "main.js")).href));
  else {
    const { register } = await import("tsx/esm/api");
    register();
    ({ main } = await import("../src/cli/main.ts"));
  }
}
process.exitCode = await main(process.argv.slice(2));
