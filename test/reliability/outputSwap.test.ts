/**
 * Issue 13 §1: publishing a site never leaves readers without one, and never
 * fails (or lies) because an old copy cannot be removed. The site is a link to
 * a generation folder replaced with rename(2) (src/cli/siteLayout.ts); a
 * plain-folder site of an older version is migrated and its pages still
 * reused; a previous generation that cannot be removed is a warning. The
 * expectations are this program's own rules (docs/publishing.md).
 */
import { spawn } from "node:child_process";
import { promises as fs } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { build } from "../../src/cli/build.ts";
import { io } from "./corpus.ts";
import { cli, healthyData, siteFiles, snapshot } from "./outputHelpers.ts";

const tempDir = useTempDir("swap");
let root = "";
let data = "";
beforeAll(async () => {
  root = tempDir();
  data = await healthyData(path.join(root, "data"));
});

const opts = (out: string, cache?: string | null) => ({ data, out, strict: false, basePath: "/", quiet: true, cache });
const generations = async (dir: string, base: string) => (await fs.readdir(dir)).filter((n) => n.startsWith(`.${base}-gen-`)).sort();

/** A separate process reading `file` as fast as it can until `stop` exists; resolves to its counts. */
function poll(file: string, stop: string): Promise<{ ok: number; missing: number; broken: number }> {
  const script = `const fs = require("node:fs"); const [file, stop] = process.argv.slice(1); let ok = 0, missing = 0, broken = 0;
for (let i = 0; ; i++) {
  if (i % 64 === 0 && fs.existsSync(stop)) break;
  let text; try { text = fs.readFileSync(file, "utf8"); } catch { missing++; continue; }
  try { JSON.parse(text); ok++; } catch { broken++; }
}
process.stdout.write(JSON.stringify({ ok, missing, broken }));`;
  const child = spawn(process.execPath, ["-e", script, file, stop], { stdio: ["ignore", "pipe", "inherit"] });
  let out = "";
  child.stdout.on("data", (d) => (out += d));
  return new Promise((resolve, reject) => child.once("exit", () => (out ? resolve(JSON.parse(out)) : reject(new Error("poller gave no counts")))));
}

describe("readers never find the site missing", () => {
  it("a process reading results.json without pause through three builds always finds it whole; the site is a link to a generation", async () => {
    const out = path.join(root, "site");
    await build(opts(out), io);
    const stop = path.join(root, "stop-polling");
    const counts = poll(path.join(out, "results.json"), stop);
    await new Promise((r) => setTimeout(r, 300));
    for (let i = 0; i < 3; i++) {
      await fs.appendFile(path.join(data, "wafers", "OK-1", "wafer.md"), `\nRe-checked ${i}.\n`);
      expect((await build(opts(out), io)).ok).toBe(true);
    }
    await fs.writeFile(stop, "");
    const c = await counts;
    expect(c.missing).toBe(0);
    expect(c.broken).toBe(0);
    expect(c.ok).toBeGreaterThan(100);
    // The layout of docs/publishing.md: a relative link to the current generation, and the previous one kept for readers still on it.
    expect((await fs.lstat(out)).isSymbolicLink()).toBe(true);
    expect(await fs.readlink(out)).toBe(".site-gen-4");
    expect(await generations(root, "site")).toEqual([".site-gen-3", ".site-gen-4"]);
    expect(await fs.readFile(path.join(out, "wafers", "OK-1", "index.html"), "utf8")).toContain("Re-checked 2.");
    expect((await fs.readdir(root)).filter((n) => n.includes("-building-") || n.includes("-link-"))).toEqual([]);
  }, 180_000);
});

describe("a plain-folder site of an older version", () => {
  it("is migrated to a generation behind a link, byte for byte, and its wafer pages are still reused", async () => {
    const fresh = path.join(root, "fresh");
    await build(opts(fresh), io);
    // What an older version left: the same site as a plain folder, without the marker file.
    const old = path.join(root, "old");
    await fs.cp(await fs.realpath(fresh), old, { recursive: true });
    await fs.rm(path.join(old, ".waferbook-site"));
    const before = await snapshot(old);
    const r = await build(opts(old), io);
    expect(r.ok).toBe(true);
    expect(r.stats?.pagesReused).toBe(1);
    expect(await fs.readlink(old)).toBe(".old-gen-2");
    // The old site, byte for byte, with the marker added (it is a generation of ours now).
    const migrated = await snapshot(path.join(root, ".old-gen-1"));
    expect(migrated.has(".waferbook-site")).toBe(true);
    migrated.delete(".waferbook-site");
    expect(migrated).toEqual(before);
    expect(await siteFiles(old)).toEqual(await siteFiles(fresh));
  }, 120_000);
});

describe("an old generation that cannot be removed", () => {
  it("is a one-line warning: the new site is published, exit 0, and later builds still succeed", async () => {
    const pub = path.join(root, "pub");
    await fs.mkdir(pub);
    await build(opts(path.join(pub, "site"), null), io);
    // A generation this user may not remove (owned by another user, or read-only).
    const locked = path.join(pub, ".site-gen-0", "locked");
    await fs.mkdir(locked, { recursive: true });
    await fs.writeFile(path.join(locked, "page.html"), "old\n");
    // A generation of ours carries the marker (a look-alike folder without it is never touched: workingNames.test.ts).
    await fs.writeFile(path.join(pub, ".site-gen-0", ".waferbook-site"), "a site written by waferbook\n");
    await fs.chmod(locked, 0o555);
    const asRoot = process.getuid?.() === 0;
    if (asRoot) {
      await fs.chmod(root, 0o755);
      await fs.chmod(pub, 0o777);
    }
    const prefix = asRoot ? ["setpriv", "--reuid=65534", "--regid=65534", "--clear-groups"] : [];
    const warning = (gen: string) => `waferbook: warning: could not remove ${path.join(pub, gen)} (EACCES); the site is not affected — remove it by hand\n`;
    // The second build also cannot remove the first build's generation when another user wrote it (as root here).
    for (const [expected, left] of [
      [".site-gen-2", [".site-gen-0"]],
      [".site-gen-3", asRoot ? [".site-gen-0", ".site-gen-1"] : [".site-gen-0"]],
    ] as const) {
      const r = await cli(["build", "--data", data, "--out", path.join(pub, "site"), "--no-cache"], { prefix });
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toBe(left.map(warning).join(""));
      expect(await fs.readlink(path.join(pub, "site"))).toBe(expected);
      expect(await fs.readFile(path.join(pub, "site", "index.html"), "utf8")).toContain("OK-1");
    }
    await fs.chmod(locked, 0o755);
  }, 180_000);
});
