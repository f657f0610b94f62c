/**
 * `waferbook serve` as a user runs it: the command on a free port against a
 * copy of two demo wafers; the index is served with the reload script; an
 * edit to a wafer.md is rebuilt and served; a broken targets.yaml is reported
 * with its line while the last good site stays served; a data folder removed
 * and put back is reported and watched again; Ctrl-C (SIGINT) stops it with
 * exit code 0.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { promises as fs } from "node:fs";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "../..");
// Two demo wafers without a micrograph: what is tested is the server and its watcher, not the analysis.
const WAFERS = ["TQ-2502", "TQ-2402"];
const MARKER = "Serve test sentence 7f3c";

let tmp: string;
let child: ChildProcess;
let url: string;
let stderr = "";

async function until<T>(what: string, f: () => Promise<T | undefined>, seconds: number): Promise<T> {
  const end = Date.now() + seconds * 1000;
  for (;;) {
    const v = await f().catch(() => undefined);
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}; serve's stderr:\n${stderr}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** A page as a browser opens it (the server adds its reload script to navigations only; fetch would send sec-fetch-mode: cors). */
const page = (rel: string) =>
  new Promise<{ status: number; text: string }>((resolve, reject) => {
    http
      .get(new URL(rel, url), { headers: { "sec-fetch-mode": "navigate" } }, (res) => {
        let text = "";
        res.setEncoding("utf8").on("data", (c: string) => (text += c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
      })
      .on("error", reject);
  });

beforeAll(async () => {
  tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-serve-"));
  const data = path.join(tmp, "data");
  for (const f of ["targets.yaml", "analysis.yaml", "runs"]) await fs.cp(path.join(ROOT, "data", f), path.join(data, f), { recursive: true });
  for (const w of WAFERS) await fs.cp(path.join(ROOT, "data", "wafers", w), path.join(data, "wafers", w), { recursive: true });
  child = spawn(process.execPath, [path.join(ROOT, "bin", "waferbook.js"), "serve", "--data", data, "--out", path.join(tmp, "site"), "--port", "0"], {
    env: { ...process.env, CI: "true" },
  });
  let stdout = "";
  child.stdout!.on("data", (b: Buffer) => (stdout += b.toString()));
  child.stderr!.on("data", (b: Buffer) => (stderr += b.toString()));
  url = await until("the address", async () => /http:\/\/localhost:\d+\//.exec(stdout)?.[0], 240);
}, 300_000);

afterAll(async () => {
  if (child && child.exitCode === null) child.kill("SIGKILL");
  if (tmp) await fs.rm(tmp, { recursive: true, force: true });
});

describe("waferbook serve", () => {
  it("serves the built site with the page-reload script", async () => {
    const index = await page("");
    expect(index.status).toBe(200);
    for (const w of WAFERS) expect(index.text).toContain(`wafers/${w}/index.html`);
    expect(index.text).toMatch(/<script type="module"[^>]* src="\/\.11ty\/reload-client\.js"/);
    expect((await page("wafers/TQ-2502/")).text).not.toContain(MARKER);
  });

  it("answers a path that climbs out of the site with 400 and keeps serving (hostile review: it ended the process)", async () => {
    for (const evil of ["..%2f..%2f..%2fetc%2fpasswd", "wafers/..%2f..%2f..%2f..%2fetc%2fhosts", "%2e%2e/%2e%2e/etc/passwd"]) {
      const r = await page(evil);
      expect([400, 404]).toContain(r.status);
      expect(r.text).not.toMatch(/root:/);
    }
    expect(child.exitCode).toBeNull();
    expect((await page("")).status).toBe(200);
  });

  it("rebuilds after a wafer.md changes and serves the new page", async () => {
    await fs.appendFile(path.join(tmp, "data", "wafers", "TQ-2502", "wafer.md"), `\n${MARKER}.\n`);
    await until("the rebuilt page", async () => ((await page("wafers/TQ-2502/")).text.includes(MARKER) ? true : undefined), 240);
    expect(stderr).toMatch(/wafers\/TQ-2502\/wafer\.md changed: building/);
  }, 300_000);

  it("says when the data folder is gone, keeps serving, and watches it again when it is back (hostile review: it went silent until restarted)", async () => {
    const data = path.join(tmp, "data");
    const away = path.join(tmp, "data-away");
    await fs.cp(data, away, { recursive: true });
    await fs.rm(data, { recursive: true, force: true });
    await until("the notice", async () => (/the data folder .* is gone/.test(stderr) ? true : undefined), 120);
    expect(stderr).toMatch(/waferbook serve: the data folder \S*data is gone \(removed or renamed\): the last site is still served/);
    expect(stderr).not.toMatch(/the build failed/);
    expect((await page("wafers/TQ-2502/")).text).toContain(MARKER);
    // Put back as a new folder (a copy: another inode, which the old watcher never sees).
    await fs.cp(away, data, { recursive: true });
    await until("the folder back", async () => (/the data folder \S*data is back: watching it again/.test(stderr) ? true : undefined), 120);
    // Edits in the new folder are seen: the watcher is the new folder's.
    await fs.appendFile(path.join(data, "wafers", "TQ-2402", "wafer.md"), `\n${MARKER} again.\n`);
    await until("the page rebuilt from the new folder", async () => ((await page("wafers/TQ-2402/")).text.includes(`${MARKER} again`) ? true : undefined), 240);
    expect(child.exitCode).toBeNull();
  }, 300_000);

  it("keeps serving the last good site when a rebuild fails, and says where the problem is", async () => {
    await fs.appendFile(path.join(tmp, "data", "targets.yaml"), "\nbroken: [\n");
    await until("the failed build", async () => (/the build failed/.test(stderr) ? true : undefined), 240);
    expect(stderr).toMatch(/^targets\.yaml:\d+(:\d+)?: YAML syntax error/m);
    expect((await page("wafers/TQ-2502/")).text).toContain(MARKER);
  }, 300_000);

  it("stops on SIGINT with exit code 0", async () => {
    const exited = new Promise<number | null>((resolve) => child.once("exit", (code) => resolve(code)));
    child.kill("SIGINT");
    expect(await exited).toBe(0);
  }, 60_000);
});
