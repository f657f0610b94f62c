/**
 * Incremental builds: a wafer page reused from the previous output (same page
 * fingerprint) must be byte-for-byte the page a fresh build writes, and every
 * other file too. Each scenario builds incrementally into one folder and
 * fresh (--no-cache, nothing reused) into another, then compares the two
 * trees file by file, ignoring only the site-wide "Built …" stamp.
 */
import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { commitAll } from "../helpers/gitRepo.ts";
import { useTempDir } from "../helpers/tempDir.ts";
import { build, PACKAGE_ROOT, type BuildIO } from "../../src/cli/build.ts";

const git = promisify(execFile);
// Three wafers cover every kind of page: TQ-2401 micrographs and structure, TQ-2404 structure and an input error,
// TQ-2406 micrographs without structure (an incoherent well). A cold build stays cheap.
const WAFERS = ["TQ-2401", "TQ-2404", "TQ-2406"];
const io: BuildIO = { log: () => {}, today: () => "2026-06-01", now: () => "2026-06-01T00:00:00Z" };
const tempDir = useTempDir("incr");

async function demoCopy(name: string): Promise<string> {
  const data = path.join(tempDir(), name);
  const sep = path.sep;
  await fs.cp(path.join(PACKAGE_ROOT, "data"), data, {
    recursive: true,
    filter: (src) => !src.includes(`${sep}wafers${sep}`) || WAFERS.some((w) => src.includes(`${sep}wafers${sep}${w}`)),
  });
  return data;
}

async function tree(dir: string, sub = "", out = new Map<string, string>()): Promise<Map<string, string>> {
  for (const e of (await fs.readdir(path.join(dir, sub), { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
    const rel = sub ? `${sub}/${e.name}` : e.name;
    if (e.isDirectory()) await tree(dir, rel, out);
    else
      out.set(
        rel,
        createHash("sha256")
          .update((await fs.readFile(path.join(dir, rel), "utf8")).replace(/<p>Built [0-9TZ:-]+ by/g, "<p>Built STAMP by"))
          .digest("hex"),
      );
  }
  return out;
}

async function expectSameSite(incremental: string, fresh: string): Promise<void> {
  const a = await tree(incremental);
  const b = await tree(fresh);
  expect([...a.keys()]).toEqual([...b.keys()]);
  const differing = [...a].filter(([f, h]) => b.get(f) !== h).map(([f]) => f);
  if (differing.length > 0) {
    // The first line that differs, so that a failure says why.
    const x = (await fs.readFile(path.join(incremental, differing[0]), "utf8")).split("\n");
    const y = (await fs.readFile(path.join(fresh, differing[0]), "utf8")).split("\n");
    const i = x.findIndex((line, k) => line !== y[k]);
    expect(differing, `${differing[0]}:${i + 1}: ${x[i]?.slice(0, 400)} ≠ ${y[i]?.slice(0, 400)}`).toEqual([]);
  }
}

const at = (data: string, out: string, fresh = false) => ({
  data,
  out,
  strict: false,
  basePath: "",
  quiet: true,
  cache: fresh ? null : path.join(tempDir(), `${path.basename(out)}-cache`),
});

describe("incremental builds reuse unchanged wafer pages and match a fresh build", () => {
  /**
   * One copy of the demo wafers (one commit), analysed once from its raw files into a cache of its own, every
   * page drawn and rendered in one Eleventy run; read, never changed, by the batches test and the hand-edit test.
   */
  let once: Promise<{ data: string; one: string; cache: string; first: Awaited<ReturnType<typeof build>> }> | undefined;
  const analysedOnce = () =>
    (once ??= (async () => {
      const data = await demoCopy("data-once");
      // A repository of its own: the footer's data commit is then this folder's, never that of a repository some
      // other process may have made above the temporary folder (two builds compared here run minutes apart).
      await commitAll(data, "Demo data", { init: true });
      const one = path.join(tempDir(), "site-one-run");
      const cache = path.join(tempDir(), "once-cache");
      return { data, one, cache, first: await build({ ...at(data, one, true), cache }, io) };
    })());

  it("unchanged, one wafer changed, targets changed, and a commit touching another wafer", async () => {
    const data = await demoCopy("data");
    await commitAll(data, "Demo data", { init: true });
    const out = path.join(tempDir(), "site");
    const fresh = path.join(tempDir(), "fresh");

    const cold = await build(at(data, out), io);
    expect(cold.stats).toMatchObject({ analysed: WAFERS.length, pagesReused: 0 });
    const warm = await build(at(data, out), io);
    expect(warm.stats).toMatchObject({ cacheHits: WAFERS.length, analysed: 0, pagesReused: WAFERS.length });
    const freshRun = await build(at(data, fresh, true), io);
    expect(freshRun.stats).toMatchObject({ pagesReused: 0 });
    await expectSameSite(out, fresh);

    // One wafer's notes change, committed: its page is drawn again; the others are reused, history and all.
    const md = path.join(data, "wafers", "TQ-2401", "wafer.md");
    await fs.appendFile(md, "\nRe-measured the Hall bar after re-bonding.\n");
    await commitAll(data, "TQ-2401: note on re-bonding");
    const one = await build(at(data, out), io);
    expect(one.stats).toMatchObject({ analysed: 1, pagesReused: WAFERS.length - 1 });
    await build(at(data, fresh, true), io);
    await expectSameSite(out, fresh);

    // Targets change: nothing is analysed again; pages whose verdicts or history change are drawn again.
    const targets = path.join(data, "targets.yaml");
    const text = await fs.readFile(targets, "utf8");
    const tightened = text.replace(/min: "1\.0e5 cm\^2\/\(V s\)"/, 'min: "1.5e5 cm^2/(V s)"');
    expect(tightened).not.toBe(text);
    await fs.writeFile(targets, tightened);
    await commitAll(data, "Tighter mobility target");
    const t = await build(at(data, out), io);
    expect(t.stats).toMatchObject({ analysed: 0, cacheHits: WAFERS.length });
    // Pages list the verdicts under each targets.yaml commit, so a new targets commit draws them again
    // (a wafer with input errors has no verdicts over time, and its page may stay as it was).
    expect(t.stats!.pagesReused).toBeLessThanOrEqual(1);
    await build(at(data, fresh, true), io);
    await expectSameSite(out, fresh);
  }, 600_000);

  it("wafer pages rendered in batches (several Eleventy runs) equal pages rendered with the site-wide pages in one run", async () => {
    const { data, cache, first } = await analysedOnce();
    // Analysed from the raw files into the shared cache (what is compared here is rendering, not analysis).
    expect(first.stats).toMatchObject({ analysed: WAFERS.length, pagesReused: 0 });
    // Both builds run the CLI in a child process, alike but for the batch size (read when the module loads): 3 wafers
    // in batches of 2 (two runs, the last one short) against the default (every page in one run with the site-wide
    // pages). Each takes the analyses from the cache and, writing into a new folder, draws every page again.
    const cli = async (out: string, env: Record<string, string>) => {
      const r = await git(
        process.execPath,
        [path.join(PACKAGE_ROOT, "bin", "waferbook.js"), "build", "--data", data, "--out", out, "--cache", cache, "--quiet"],
        { env: { ...process.env, CI: "true", SOURCE_DATE_EPOCH: "1780000000", ...env } },
      );
      expect(r.stdout).toContain(
        `analysed 0 wafers (${WAFERS.length} from the cache); drew ${WAFERS.length} pages (0 from the cache, 0 reused from the previous site)`,
      );
    };
    const batched = path.join(tempDir(), "site-batched");
    const single = path.join(tempDir(), "site-single");
    await cli(batched, { WAFERBOOK_PAGES_PER_RENDER: "2" });
    await cli(single, {});
    await expectSameSite(batched, single);
  }, 600_000);

  it("a page whose previous copy was edited by hand or has no fingerprint is drawn again", async () => {
    // The analyses come from the cache of the build above (what is tested here is page reuse, not analysis).
    const { data, cache } = await analysedOnce();
    const out = path.join(tempDir(), "site-edit");
    const drawn = await build({ ...at(data, out), cache }, io);
    expect(drawn.stats).toMatchObject({ analysed: 0, cacheHits: WAFERS.length, pagesReused: 0 });
    const page = path.join(out, "wafers", "TQ-2401", "index.html");
    const original = await fs.readFile(page, "utf8");
    await fs.writeFile(page, original.replace(/<meta name="waferbook-page" content="[0-9a-f]+">/, ""));
    const r = await build({ ...at(data, out), cache }, io);
    expect(r.stats).toMatchObject({ pagesReused: WAFERS.length - 1 });
    expect(await fs.readFile(page, "utf8")).toBe(original);
  }, 600_000);
});
