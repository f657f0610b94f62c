/**
 * waferbook as a lab installs it: `npm pack` (which runs `prepare`, compiling
 * src/ into dist/), the tarball installed as a dev dependency of an empty
 * data repository beside a copy of one demo wafer, then `npx waferbook build`
 * there. The installed package holds no sources, no tsx and no esbuild, so
 * this proves nothing compiles at run time, every imported package is declared
 * (or the install would lack it), and package files are found wherever
 * node_modules puts them.
 *
 * Offline: npm's cache holds the tarballs of our dependencies (npm ci put them
 * there) but not their registry metadata, so `npm install <tarball>` cannot
 * resolve offline. The lab repository gets a lockfile instead, as a lab
 * commits one: our package-lock.json's run-time entries (the same versions)
 * plus the tarball, installed with `npm ci --offline`. A machine whose cache
 * lacks a tarball falls back to `--prefer-offline` (the registry).
 *
 * The packing is done from a copy of the package, so this test never rewrites
 * the dist/ that other tests' builds run from.
 */
import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const run = promisify(execFile);
const ROOT = path.resolve(import.meta.dirname, "../..");
const NPM = process.platform === "win32" ? "npm.cmd" : "npm";
const WAFERS = ["TQ-2401"];

let tmp: string;
let app: string;
let build: { stdout: string; stderr: string };
const seconds: Record<string, number> = {};

async function timed<T>(name: string, f: () => Promise<T>): Promise<T> {
  const t = performance.now();
  const r = await f();
  seconds[name] = (performance.now() - t) / 1000;
  return r;
}

/** A copy of what `npm pack` reads (package.json's files, the sources prepare compiles), node_modules linked for esbuild. */
async function stagePackage(dir: string): Promise<void> {
  const pkg = JSON.parse(await fs.readFile(path.join(ROOT, "package.json"), "utf8")) as { files: string[] };
  const copied = [
    ...pkg.files.filter((f) => !f.startsWith("dist") && !f.includes("*")).map((f) => f.replace(/\/$/, "")),
    "src",
    "scripts/bundle.mjs",
    "docs",
    "package.json",
    "README.md",
  ];
  for (const f of copied) await fs.cp(path.join(ROOT, f), path.join(dir, f), { recursive: true });
  await fs.symlink(path.join(ROOT, "node_modules"), path.join(dir, "node_modules"), "dir");
}

/** The lab repository's lockfile: waferbook from the tarball and our lockfile's run-time packages, at the same places. */
async function labLockfile(tarball: string): Promise<object> {
  const lock = JSON.parse(await fs.readFile(path.join(ROOT, "package-lock.json"), "utf8")) as { packages: Record<string, Record<string, unknown>> };
  const ours = lock.packages[""];
  const integrity =
    "sha512-" +
    createHash("sha512")
      .update(await fs.readFile(tarball))
      .digest("base64");
  const packages: Record<string, object> = {
    "": { name: "lab-data", devDependencies: { waferbook: `file:${tarball}` } },
    "node_modules/waferbook": {
      version: ours.version,
      resolved: `file:${tarball}`,
      integrity,
      dev: true,
      license: ours.license,
      dependencies: ours.dependencies,
      bin: ours.bin,
      engines: ours.engines,
    },
  };
  for (const [where, entry] of Object.entries(lock.packages)) if (where && !entry.dev) packages[where] = { ...entry, dev: true };
  return { name: "lab-data", lockfileVersion: 3, requires: true, packages };
}

beforeAll(async () => {
  tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-pack-"));
  const stage = path.join(tmp, "stage");
  app = path.join(tmp, "lab");
  await fs.mkdir(stage);
  await fs.mkdir(app);
  await stagePackage(stage);
  const packed = await timed("pack", () => run(NPM, ["pack", "--json", "--pack-destination", tmp], { cwd: stage, maxBuffer: 1 << 24 }));
  const tarball = path.join(tmp, (JSON.parse(packed.stdout) as { filename: string }[])[0].filename);

  await fs.writeFile(
    path.join(app, "package.json"),
    JSON.stringify({ name: "lab-data", private: true, devDependencies: { waferbook: `file:${tarball}` } }, null, 2),
  );
  await fs.writeFile(path.join(app, "package-lock.json"), JSON.stringify(await labLockfile(tarball), null, 2));
  const npmCi = (mode: string) => run(NPM, ["ci", mode, "--no-audit", "--no-fund"], { cwd: app, maxBuffer: 1 << 24 });
  await timed("install", () =>
    npmCi("--offline").catch((e: { stderr?: string }) => (/ENOTCACHED/.test(e.stderr ?? "") ? npmCi("--prefer-offline") : Promise.reject(e))),
  );

  const data = path.join(app, "data");
  for (const f of ["targets.yaml", "analysis.yaml", "runs"]) await fs.cp(path.join(ROOT, "data", f), path.join(data, f), { recursive: true });
  for (const w of WAFERS) await fs.cp(path.join(ROOT, "data", "wafers", w), path.join(data, "wafers", w), { recursive: true });
  build = await timed("build", () =>
    run("npx", ["--no-install", "waferbook", "build", "--quiet"], { cwd: app, env: { ...process.env, CI: "true" }, maxBuffer: 1 << 24 }),
  );
}, 300_000);

afterAll(async () => {
  process.stderr.write(
    `packInstall: ${Object.entries(seconds)
      .map(([k, s]) => `${k} ${s.toFixed(1)} s`)
      .join(", ")}\n`,
  );
  if (tmp) await fs.rm(tmp, { recursive: true, force: true });
});

describe("waferbook packed, installed into an empty data repository and run with npx", () => {
  it("ships compiled code only: no sources, nothing to compile with", () => {
    const installed = path.join(app, "node_modules", "waferbook");
    expect(existsSync(path.join(installed, "dist", "main.js"))).toBe(true);
    expect(existsSync(path.join(installed, "dist", "code-version.json"))).toBe(true);
    expect(existsSync(path.join(installed, "src"))).toBe(false);
    // Development tools are not installed with it, and nothing was compiled into the package folder.
    expect(existsSync(path.join(app, "node_modules", "tsx"))).toBe(false);
    expect(existsSync(path.join(app, "node_modules", "esbuild"))).toBe(false);
    expect(existsSync(path.join(installed, ".waferbook-build"))).toBe(false);
  });

  it("builds the site: index, wafer pages, the libraries' browser files", async () => {
    expect(build.stdout).toMatch(/^1 wafer \(/m);
    const index = await fs.readFile(path.join(app, "site", "index.html"), "utf8");
    for (const w of WAFERS) {
      expect(index).toContain(`wafers/${w}/index.html`);
      expect(await fs.readFile(path.join(app, "site", "wafers", w, "index.html"), "utf8")).toContain(w);
    }
    // Copied from Chart.js and MiniSearch, found through the module resolver.
    for (const asset of ["chart.umd.min.js", "minisearch.js", "site.css"])
      expect((await fs.stat(path.join(app, "site", "assets", asset))).size).toBeGreaterThan(1000);
  });

  it("answers --version from the installed package", async () => {
    const pkg = JSON.parse(await fs.readFile(path.join(ROOT, "package.json"), "utf8")) as { version: string };
    const r = await timed("version", () => run(process.execPath, [path.join(app, "node_modules", ".bin", "waferbook"), "--version"], { cwd: app }));
    expect(r.stdout.trim()).toBe(pkg.version);
  });
});
