#!/usr/bin/env node
// waferbook command. Start-up: the TypeScript sources are bundled once with
// esbuild (the compiler tsx itself uses) into .waferbook-build/<hash of src>/
// and run as plain JavaScript, main thread and analysis workers alike; loading
// ~150 modules through tsx's loader hooks cost about a second per process.
// A source change gives a new hash and a new bundle; if esbuild is missing or
// the package folder is read-only (or WAFERBOOK_NO_BUNDLE is set), the
// sources run through tsx as before. Same code either way: the bundle is a
// mechanical concatenation of the transpiled modules.
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const BUILD_DIR = path.join(ROOT, ".waferbook-build");

/** Every source file under dir (node's recursive readdir, the one directory walk the program uses), absolute paths. */
async function sources(dir) {
  const entries = await fs.readdir(dir, { recursive: true, withFileTypes: true });
  return entries.filter((e) => !e.isDirectory() && /\.(ts|mjs|js|json)$/.test(e.name)).map((e) => path.join(e.parentPath, e.name));
}

/** The bundle's folder for the current sources, bundling first when needed; null to run through tsx. */
async function bundle() {
  if (process.env.WAFERBOOK_NO_BUNDLE) return null;
  try {
    const h = createHash("sha256").update(`bundle-1\0${process.version}\0`);
    for (const f of (await sources(path.join(ROOT, "src"))).sort()) h.update(path.relative(ROOT, f)).update("\0").update(await fs.readFile(f)).update("\0");
    const dir = path.join(BUILD_DIR, h.digest("hex").slice(0, 20));
    if (await fs.access(path.join(dir, "main.js")).then(() => true, () => false)) return dir;
    const { build } = await import("esbuild");
    const tmp = `${dir}.tmp-${process.pid}`;
    await build({
      entryPoints: { main: path.join(ROOT, "src/cli/main.ts"), worker: path.join(ROOT, "src/cli/worker.ts") },
      outdir: tmp,
      bundle: true,
      splitting: true,
      format: "esm",
      platform: "node",
      target: "node20",
      packages: "external",
      keepNames: true,
      define: { WAFERBOOK_BUNDLED_WORKER: JSON.stringify("./worker.js") },
      logLevel: "silent",
    });
    await fs.rename(tmp, dir).catch(async (err) => {
      await fs.rm(tmp, { recursive: true, force: true });
      if (!(await fs.access(path.join(dir, "main.js")).then(() => true, () => false))) throw err;
    });
    // Bundles of older sources untouched for a day are of no further use (a build still running from one keeps it).
    for (const old of await fs.readdir(BUILD_DIR)) {
      const st = await fs.stat(path.join(BUILD_DIR, old)).catch(() => undefined);
      if (old !== path.basename(dir) && st && Date.now() - st.mtimeMs > 86400e3) await fs.rm(path.join(BUILD_DIR, old), { recursive: true, force: true });
    }
    return dir;
  } catch {
    return null;
  }
}

const dir = await bundle();
let main;
if (dir) ({ main } = await import(pathToFileURL(path.join(dir, "main.js")).href));
else {
  const { register } = await import("tsx/esm/api");
  register();
  ({ main } = await import("../src/cli/main.ts"));
}
process.exitCode = await main(process.argv.slice(2));
