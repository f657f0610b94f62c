/**
 * Nothing lost, nothing varies: a killed build leaves the previous site
 * exactly as it was; raw files are never written (hashes before and after,
 * and no write call in the readers); two builds of the same inputs are
 * byte-identical apart from the footer's "Built …" stamp; the output lock
 * refuses a second build with a clear message; a build on mutated demo data
 * publishes no NaN or Infinity.
 */
import { spawn, execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, promises as fs, readdirSync, readFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { isDeepStrictEqual, promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { build, BuildLockedError } from "../../src/cli/build.ts";
import { io, ROOT } from "./corpus.ts";

const run = promisify(execFile);
const BIN = path.join(ROOT, "bin", "waferbook.js");
let tmp: string;
beforeAll(async () => {
  tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-lost-"));
});
afterAll(async () => {
  await fs.rm(tmp, { recursive: true, force: true });
});

async function hashTree(dir: string): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  async function walk(sub: string): Promise<void> {
    for (const e of (await fs.readdir(path.join(dir, sub), { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const rel = sub ? `${sub}/${e.name}` : e.name;
      if (e.isDirectory()) await walk(rel);
      else
        out.set(
          rel,
          createHash("sha256")
            .update(await fs.readFile(path.join(dir, rel)))
            .digest("hex"),
        );
    }
  }
  await walk("");
  return out;
}

/** The demo data without its git history: copied, so the test never depends on the checkout. */
async function demoCopy(name: string, wafers?: string[]): Promise<string> {
  const data = path.join(tmp, name);
  await fs.cp(path.join(ROOT, "data"), data, {
    recursive: true,
    filter: (src) => !wafers || !src.includes(`${path.sep}wafers${path.sep}`) || wafers.some((w) => src.includes(`${path.sep}wafers${path.sep}${w}`)),
  });
  return data;
}

const opts = (data: string, out: string) => ({ data, out, strict: false, basePath: "", quiet: true });

/**
 * Two builds of the same demo wafers from two copies at different paths, at different times; the first copy's files
 * hashed before and after its build. Two wafers hold every kind of input and section: TQ-2401 has transport, X-ray,
 * depth profiles and micrographs; TQ-2404 has an input error (one broken sweep) beside sections that still build.
 */
const DET_WAFERS = ["TQ-2401", "TQ-2404"];
let det: Promise<{ dataBefore: Map<string, string>; dataAfter: Map<string, string>; mtimesBefore: number[]; mtimesAfter: number[] }> | undefined;
function twoBuilds() {
  det ??= (async () => {
    const a = await demoCopy("det-a", DET_WAFERS);
    const b = await demoCopy("det-b-other-path", DET_WAFERS);
    const dataBefore = await hashTree(a);
    const mtimes = () => Promise.all([...dataBefore.keys()].map((f) => fs.stat(path.join(a, f)).then((s) => s.mtimeMs)));
    const mtimesBefore = await mtimes();
    await build(opts(a, path.join(tmp, "det-site-a")), { ...io, now: () => "2025-06-01T12:00:00Z" });
    const dataAfter = await hashTree(a);
    const mtimesAfter = await mtimes();
    await build(opts(b, path.join(tmp, "det-site-b")), { ...io, now: () => "2025-07-09T08:30:15Z" });
    return { dataBefore, dataAfter, mtimesBefore, mtimesAfter };
  })();
  return det;
}

describe("raw files are only read", () => {
  it("a build leaves every file of the data folder byte-identical", async () => {
    // The first of the two deterministic-output builds below (two demo wafers, one with an input error).
    const d = await twoBuilds();
    expect(d.dataBefore.size).toBeGreaterThan(20);
    expect(d.dataAfter).toEqual(d.dataBefore);
    expect(d.mtimesAfter).toEqual(d.mtimesBefore);
  }, 600_000);

  it("the readers contain no call that could write, and open raw files with the read flag", async () => {
    for (const dir of ["src/read", "src/validate"]) {
      for (const e of await fs.readdir(path.join(ROOT, dir), { recursive: true, withFileTypes: true })) {
        if (!e.isFile()) continue;
        const f = path.relative(path.join(ROOT, dir), path.join(e.parentPath, e.name));
        const text = await fs.readFile(path.join(ROOT, dir, f), "utf8");
        expect(text, `${dir}/${f}`).not.toMatch(/\b(writeFile|appendFile|createWriteStream|rename|unlink|rm|rmdir|mkdir|truncate|chmod|copyFile|symlink)\s*\(/);
        expect(text, `${dir}/${f}`).not.toMatch(/O_WRONLY|O_RDWR|flag:\s*"[wa+]/);
      }
    }
    expect(await fs.readFile(path.join(ROOT, "src/read/dataFiles.ts"), "utf8")).toMatch(/fs\.open\(real, fsConstants\.O_RDONLY \| fsConstants\.O_NOFOLLOW/);
  });
});

describe("deterministic output", () => {
  it("two builds from two copies at different paths, at different times, differ only in the footer stamp", async () => {
    await twoBuilds();
    const ha = await hashTree(path.join(tmp, "det-site-a"));
    const hb = await hashTree(path.join(tmp, "det-site-b"));
    expect([...hb.keys()]).toEqual([...ha.keys()]);
    const stamp = /<p>Built [0-9TZ:-]+ by waferbook/g;
    const differing: string[] = [];
    for (const [f, h] of ha) {
      if (hb.get(f) === h) continue;
      const ta = (await fs.readFile(path.join(tmp, "det-site-a", f), "utf8")).replace(stamp, "<p>Built STAMP by waferbook");
      const tb = (await fs.readFile(path.join(tmp, "det-site-b", f), "utf8")).replace(stamp, "<p>Built STAMP by waferbook");
      if (ta !== tb) differing.push(f);
      else expect(f).toMatch(/\.html$/);
    }
    expect(differing).toEqual([]);
    // Neither absolute path of the data folders leaks into the site.
    for (const f of ha.keys()) {
      if (!/\.(html|json|csv|txt)$/.test(f)) continue;
      const text = await fs.readFile(path.join(tmp, "det-site-a", f), "utf8");
      expect(text.includes(tmp), f).toBe(false);
    }
  }, 600_000);
});

/**
 * The lock tests: what they check does not depend on the data, so one demo wafer with transport, X-ray and depth
 * profiles but no micrograph (the image analysis is the costly part of a small build).
 */
const LOCK_WAFER = "TQ-2502";

describe("the output lock", () => {
  it("refuses a build while another live process holds the lock, with a clear message; a stale lock is taken over", async () => {
    const data = await demoCopy("lock", [LOCK_WAFER]);
    const out = path.join(tmp, "lock-site");
    const holder = spawn("sleep", ["30"]);
    try {
      await fs.writeFile(`${out}.lock`, `${holder.pid}\n`);
      const err = await build(opts(data, out), io).catch((e) => e);
      expect(err).toBeInstanceOf(BuildLockedError);
      expect(err.message).toBe(`another build (process ${holder.pid}) is writing ${out}; wait for it to finish, or delete ${out}.lock if that process is gone`);
      const r = await run(process.execPath, [BIN, "build", "--data", data, "--out", out], { env: { ...process.env, CI: "true" } }).catch((e) => e);
      expect(r.code).toBe(1);
      expect(r.stderr).toContain(`waferbook: another build (process ${holder.pid}) is writing`);
      expect(r.stderr).not.toMatch(/\n\s+at /);
      await expect(fs.stat(out)).rejects.toThrow();
    } finally {
      holder.kill("SIGKILL");
    }
    await new Promise((r) => holder.once("exit", r));
    // The holder is gone: its lock is stale and the next build takes it over and removes it afterwards.
    const r = await build(opts(data, out), io);
    expect(r.ok).toBe(true);
    await expect(fs.stat(`${out}.lock`)).rejects.toThrow();
  }, 600_000);

  it("two concurrent CLI builds into one folder never interleave: each finishes alone or is refused", async () => {
    // One wafer: the two processes start together and meet at the lock after start-up, whatever the data.
    const data = await demoCopy("conc", [LOCK_WAFER]);
    const out = path.join(tmp, "conc-site");
    const go = () =>
      run(process.execPath, [BIN, "build", "--data", data, "--out", out], { env: { ...process.env, CI: "true" } }).then(
        (r) => ({ code: 0, ...r }),
        (e) => e,
      );
    const results = await Promise.all([go(), go()]);
    expect(results.some((r) => r.code === 0)).toBe(true);
    for (const r of results) if (r.code !== 0) expect(r.stderr).toMatch(/another build \(process \d+\) is writing/);
    const reference = path.join(tmp, "conc-ref");
    await build(opts(data, reference), io);
    const stamp = /<p>Built [0-9TZ:-]+ by/g;
    const h = await hashTree(out);
    expect([...h.keys()]).toEqual([...(await hashTree(reference)).keys()]);
    const page = (await fs.readFile(path.join(out, `wafers/${LOCK_WAFER}/index.html`), "utf8")).replace(stamp, "");
    expect(page).toBe((await fs.readFile(path.join(reference, `wafers/${LOCK_WAFER}/index.html`), "utf8")).replace(stamp, ""));
  }, 600_000);
});

/**
 * The moments of a build at which the SIGKILL test stops one, each told by what the build has written so far
 * (src/cli/build.ts, outputFolder.ts, siteLayout.ts), not by a delay: so each phase is hit however fast or busy the
 * machine is. `building` is the build's working folder beside the output (`.<name>-building-<pid>`).
 */
const KILL_MOMENTS: { phase: string; reached: (out: string, building: string, pid: number) => boolean; thenWaitMs?: number }[] = [
  // Node and the command's code loading: nothing written yet.
  { phase: "start-up", reached: () => true, thenWaitMs: 150 },
  // The lock (naming this process: a killed build's stale lock stays behind) is taken first thing; then the site
  // inputs are read and the wafers looked up in the cache, and the changed wafer is analysed.
  { phase: "reading the inputs", reached: (out, _b, pid) => readFileSync(`${out}.lock`, "utf8").startsWith(`${pid}@`) },
  { phase: "analysing", reached: (out, _b, pid) => readFileSync(`${out}.lock`, "utf8").startsWith(`${pid}@`), thenWaitMs: 300 },
  // The changed wafer's page is drawn (its model waits in the "-pages" folder for rendering); history, site model.
  { phase: "after drawing", reached: (_out, building) => existsSync(`${building}-pages`) },
  // Eleventy has written its first page (before it, only the drawn pages' pictures are in the working folder).
  { phase: "rendering", reached: (_out, building) => readdirSync(building).some((n) => n !== "wafers") },
  // results.json files, raw copies and exports, then the search index.
  { phase: "writing the files beside the pages", reached: (_out, building) => existsSync(path.join(building, "results.csv")) },
];
/** Whether the build has reached a moment (a file read while it is being replaced counts as not yet). */
function hasReached(moment: (typeof KILL_MOMENTS)[number], out: string, building: string, pid: number): boolean {
  try {
    return moment.reached(out, building, pid);
  } catch {
    return false;
  }
}

describe("a killed build loses nothing", () => {
  it("SIGKILL at several moments leaves the previous site byte-identical", async () => {
    // Two wafers: micrographs (TQ-2406, an incoherent well) and an input error (TQ-2404). Before each killed build one
    // line is added to TQ-2404's notes, so a build that completed would be visible; the killed builds analyse that
    // wafer (no micrograph, so its analysis is short) and take the other from the cache.
    const data = await demoCopy("kill", ["TQ-2404", "TQ-2406"]);
    const out = path.join(tmp, "kill-site");
    await build(opts(data, out), io);
    const notes = path.join(data, "wafers/TQ-2404/wafer.md");
    const page = path.join(out, "wafers/TQ-2404/index.html");
    let killed = 0;
    for (const [k, moment] of KILL_MOMENTS.entries()) {
      const before = await hashTree(out);
      expect(before.size).toBeGreaterThan(20);
      const line = `Extra line of notes number ${k}.`;
      await fs.appendFile(notes, `\n${line}\n`);
      const child = spawn(process.execPath, [BIN, "build", "--data", data, "--out", out], { env: { ...process.env, CI: "true" }, stdio: "ignore" });
      const exited = new Promise<number | null>((r) => child.once("exit", (code) => r(code)));
      const building = path.join(tmp, `.kill-site-building-${child.pid}`);
      // Polled every few milliseconds: the kill lands just after the phase has begun (or the wait after it).
      while (child.exitCode === null && !hasReached(moment, out, building, child.pid!)) await new Promise((r) => setTimeout(r, 3));
      if (moment.thenWaitMs) await new Promise((r) => setTimeout(r, moment.thenWaitMs));
      const wasKilled = child.exitCode === null && child.kill("SIGKILL");
      await exited;
      const now = await hashTree(out);
      if (wasKilled && isDeepStrictEqual(now, before)) {
        killed++;
        continue;
      }
      // Finished, or killed after it had published (the link already pointed at the new build, the process not yet
      // gone): then the site is the new one, complete — never a mixture.
      expect(await fs.readFile(page, "utf8"), `${moment.phase}: the site changed, so it must be the new one`).toContain(line);
      expect(now.has(".waferbook-site")).toBe(true);
    }
    // Every moment but possibly the last (whose phase may be over before the kill lands) stopped a build.
    expect(killed).toBeGreaterThanOrEqual(KILL_MOMENTS.length - 1);
    // The next build cleans up after the killed ones and succeeds.
    const r = await build(opts(data, out), io);
    expect(r.ok).toBe(true);
    const left = (await fs.readdir(tmp)).filter((n) => n.startsWith(".kill-site-building-"));
    expect(left).toEqual([]);
    expect(await fs.readFile(page, "utf8")).toContain(`Extra line of notes number ${KILL_MOMENTS.length - 1}.`);
  }, 600_000);
});

describe("no NaN or Infinity is published", () => {
  it("a build on a mutated demo wafer writes none into results.json or any page", async () => {
    const data = await demoCopy("nan", ["TQ-2401", "TQ-2402"]);
    const dir = path.join(data, "wafers/TQ-2401/transport/HB1");
    const files = (await fs.readdir(dir)).sort();
    // Valid but hostile values: huge and tiny resistances, a zero Rxx column, a sign flip.
    const edits: ((cells: string[], i: number) => void)[] = [
      (c) => {
        c[1] = String(Number(c[1]) * 1e250);
      },
      (c) => {
        c[2] = String(Number(c[2]) * 1e-300);
      },
      (c) => {
        c[1] = "0";
      },
      (c) => {
        c[2] = String(-Number(c[2]));
      },
      (c, i) => {
        if (i % 2) c[1] = "1e300";
      },
    ];
    for (const [k, f] of files.entries()) {
      const lines = (await fs.readFile(path.join(dir, f), "utf8")).split("\n");
      let row = 0;
      const edit = edits[k % edits.length];
      const next = lines.map((l) => {
        if (!/^-?\d/.test(l)) return l;
        const c = l.split(",");
        edit(c, row++);
        return c.join(",");
      });
      await fs.writeFile(path.join(dir, f), next.join("\n"));
    }
    const out = path.join(tmp, "nan-site");
    const r = await build(opts(data, out), io);
    expect(r.ok).toBe(true);
    for (const [f] of await hashTree(out)) {
      if (!/\.(html|json|csv)$/.test(f)) continue;
      const text = await fs.readFile(path.join(out, f), "utf8");
      expect(text.match(/\bNaN\b|\bInfinity\b|\bundefined\b/)?.[0], f).toBeUndefined();
    }
  }, 600_000);
});
