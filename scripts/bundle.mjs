// Compiles the TypeScript sources into plain JavaScript with esbuild: the
// command's entry (src/cli/main.ts) and the analysis worker
// (src/cli/worker.ts), bundled with shared chunks; libraries stay external
// (loaded from node_modules as usual). Beside them: code-version.json (the
// digests of the sources, src/cli/codeDigest.ts, since an installed package
// has no src/ to hash) and source-hash (what bin/waferbook.js compares in a
// checkout to know whether dist/ is current).
//
//   node scripts/bundle.mjs            → dist/ (npm's prepare: npm ci, npm pack, install from git)
//   bundle(root, outdir)               → used by bin/waferbook.js in a checkout whose dist/ is stale
//
// The output is written to a temporary folder and renamed into place.
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const exists = (p) =>
  fs.access(p).then(
    () => true,
    () => false,
  );

/** Every source file under dir (node's recursive readdir), absolute paths. */
async function sources(dir) {
  const entries = await fs.readdir(dir, { recursive: true, withFileTypes: true });
  return entries.filter((e) => e.isFile() && /\.(ts|mjs|js|json)$/.test(e.name)).map((e) => path.join(e.parentPath, e.name));
}

/** SHA-256 (hex, 20 digits) of the sources under root/src, this script and the Node.js version: names the compiled copy. */
export async function sourceHash(root) {
  const h = createHash("sha256")
    .update(`bundle-2\0${process.version}\0`)
    .update(await fs.readFile(fileURLToPath(import.meta.url)));
  for (const f of (await sources(path.join(root, "src"))).sort())
    h.update(path.relative(root, f))
      .update("\0")
      .update(await fs.readFile(f))
      .update("\0");
  return h.digest("hex").slice(0, 20);
}

/**
 * Compiles root/src into outdir; returns outdir. With `replace` an existing
 * outdir is replaced (dist/); without, a copy another process put in place
 * first is kept (a checkout's .waferbook-build/<hash>/, which a running build
 * may be using).
 */
export async function bundle(root, outdir, { replace = false } = {}) {
  const { build } = await import("esbuild");
  const tmp = `${outdir}.tmp-${process.pid}`;
  await fs.rm(tmp, { recursive: true, force: true });
  await build({
    entryPoints: {
      main: path.join(root, "src/cli/main.ts"),
      worker: path.join(root, "src/cli/worker.ts"),
      codeDigest: path.join(root, "src/cli/codeDigest.ts"),
    },
    outdir: tmp,
    bundle: true,
    splitting: true,
    format: "esm",
    platform: "node",
    target: "node20",
    packages: "external",
    keepNames: true,
    define: { WAFERBOOK_BUNDLED_WORKER: JSON.stringify("./worker.js") },
    logLevel: "warning",
  });
  const { sourceDigests } = await import(pathToFileURL(path.join(tmp, "codeDigest.js")).href);
  await fs.writeFile(path.join(tmp, "code-version.json"), JSON.stringify(await sourceDigests(path.join(root, "src"))) + "\n");
  await fs.writeFile(path.join(tmp, "source-hash"), (await sourceHash(root)) + "\n");
  // Replace: the old copy is moved aside first (a folder cannot be renamed onto a non-empty one).
  const old = `${outdir}.old-${process.pid}`;
  if (replace && (await exists(outdir))) await fs.rename(outdir, old);
  try {
    await fs.rename(tmp, outdir);
  } catch (err) {
    await fs.rm(tmp, { recursive: true, force: true });
    // Another process put the same sources in place first.
    if (!(await exists(path.join(outdir, "main.js")))) throw err;
  }
  await fs.rm(old, { recursive: true, force: true });
  return outdir;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
  const started = performance.now();
  await bundle(root, path.join(root, "dist"), { replace: true });
  process.stderr.write(`waferbook: compiled src/ into dist/ (${((performance.now() - started) / 1000).toFixed(1)} s)\n`);
}
