/**
 * A forged drawn page in a merged cache folder (docs/scaling.md, "Trust"):
 * `--shard 1/1` fills a cache from a one-wafer fixture; a page in it is then
 * rewritten with each trick a forger could use to run script on the site's
 * origin, sealed again with a valid checksum (the checksum detects damage,
 * not authorship). The assembling build must refuse the page with a warning
 * naming the cache file and what it held, analyse the wafer again from its
 * raw files — not from its (also forged) cache entry — and write the same
 * site as a build without any cache, byte for byte (SOURCE_DATE_EPOCH fixes
 * the footer's time).
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import v8 from "node:v8";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { useTempDir } from "../helpers/tempDir.ts";
import { PACKAGE_ROOT } from "../../src/cli/build.ts";
import { buildInProcess, siteFiles } from "../helpers/inProcessBuild.ts";
import { seal, unseal } from "../../src/cli/cache.ts";

const tempDir = useTempDir("forged");
const WAFER = "OK-1";

/** Cache files whose name ends in `suffix` (".page.v8", ".slim.v8", or ".v8" for the full entry alone). */
async function cacheFiles(cache: string, suffix: string): Promise<string[]> {
  const all = [...(await siteFiles(cache)).keys()].filter((f) => f.endsWith(suffix) && (suffix !== ".v8" || !/\.(page|slim)\.v8$/.test(f)));
  return all.map((f) => path.join(cache, f));
}

/** Rewrites a sealed v8 file through `change`, sealing it again as waferbook would. */
async function reseal<T>(file: string, change: (value: T) => void): Promise<void> {
  const payload = unseal(await fs.readFile(file));
  if (typeof payload === "string") throw new Error(payload);
  const value = v8.deserialize(payload) as T;
  change(value);
  await fs.writeFile(file, seal(v8.serialize(value)));
}

interface Page {
  folder: string;
  model: Uint8Array;
  files: { path: string; bytes: Uint8Array }[];
}

/** Changes the page model of a drawn page. */
const inModel = (change: (m: Record<string, unknown>) => void) => (p: Page) => {
  const m = v8.deserialize(p.model) as Record<string, unknown>;
  change(m);
  p.model = v8.serialize(m);
};

const TRICKS: { name: string; forge: (p: Page) => void; found: RegExp }[] = [
  {
    name: "a script element in the notes, with the script as a file of the page",
    forge: (p) => {
      inModel((m) => (m.notesHtml = `${m.notesHtml as string}<script src="evil.js"></script>`))(p);
      p.files.push({ path: `wafers/${WAFER}/evil.js`, bytes: Buffer.from("alert(document.domain)") });
    },
    found: /wafers\/OK-1\/evil\.js, which waferbook never draws/,
  },
  {
    name: "an event handler in the notes",
    forge: inModel((m) => (m.notesHtml = `<p onmouseover="alert(1)">x</p>`)),
    found: /notesHtml: the attribute onmouseover/,
  },
  {
    name: "a javascript: link among the raw files",
    forge: inModel((m) => ((m.files as { href: string }[])[0].href = "javascript:alert(1)")),
    found: /files\.0\.href: the link "javascript:alert\(1\)" uses the scheme "javascript:"/,
  },
  {
    name: "markup in a Set, which Nunjucks iterates like a list",
    forge: inModel(
      (m) =>
        (m.uniformity = {
          maps: new Set([{ key: "u", label: "U", svg: '<meta http-equiv="refresh" content="0;url=https://evil.example/">', figures: [], note: "", rows: [] }]),
        }),
    ),
    found: /uniformity\.maps is a Set, which waferbook's drawing never writes/,
  },
  {
    name: "fields the templates print left out (the render would fail the whole build)",
    forge: inModel((m) => {
      delete m.toc;
      delete m.metrics;
      delete m.verdict;
    }),
    found: /the page model has no field toc/,
  },
  {
    name: "script appended to the comparison data",
    forge: (p) => {
      const f = p.files.find((x) => x.path.endsWith("/compare.js"))!;
      f.bytes = Buffer.from(Buffer.from(f.bytes).toString("utf8").replace(/;\n$/, ";alert(1);\n"));
    },
    found: /compare\.js holds more than one JSON value/,
  },
  {
    name: "an HTML page beside the wafer page",
    forge: (p) =>
      p.files.push({
        path: `wafers/${WAFER}/images/a.png`,
        bytes: Buffer.from('<!doctype html><meta http-equiv="refresh" content="0"><script>alert(1)</script>'),
      }),
    found: /images\/a\.png is not a PNG picture/,
  },
];

describe("a forged drawn page in the cache", () => {
  const saved = process.env.SOURCE_DATE_EPOCH;
  let root = "";
  let data = "";
  let clean: Map<string, Buffer>;
  beforeAll(async () => {
    process.env.SOURCE_DATE_EPOCH = "1780000000";
    root = tempDir();
    data = path.join(root, "data");
    await fs.cp(path.join(PACKAGE_ROOT, "test", "fixtures", "healthy"), data, { recursive: true });
    const r = await buildInProcess(["--data", data, "--out", path.join(root, "clean"), "--no-cache"]);
    expect(r.code, r.err.join("\n")).toBe(0);
    clean = await siteFiles(path.join(root, "clean"));
  }, 120_000);
  afterAll(() => {
    if (saved === undefined) delete process.env.SOURCE_DATE_EPOCH;
    else process.env.SOURCE_DATE_EPOCH = saved;
  });

  for (const [k, trick] of TRICKS.entries()) {
    it(`${trick.name}: refused, named, and the site built from the raw files`, async () => {
      const cache = path.join(root, `cache-${k}`);
      const out = path.join(root, `site-${k}`);
      const shard = () => buildInProcess(["--data", data, "--out", path.join(root, "never"), "--cache", cache, "--shard", "1/1"]);
      expect((await shard()).code).toBe(0);
      if (k === 0) {
        // The forger also rewrote the wafer's analysis entry (full and slim), then had a shard draw its page from it:
        // the page's key then matches the forged outcome, as a careful forger would make it.
        for (const f of [...(await cacheFiles(cache, ".slim.v8")), ...(await cacheFiles(cache, ".v8"))]) {
          await reseal<{ record: { notes: string } }>(f, (e) => (e.record.notes = "FORGED NOTE: this wafer passed every check."));
        }
        for (const f of await cacheFiles(cache, ".page.v8")) await fs.rm(f);
        expect((await shard()).code).toBe(0);
      }
      const [page] = await cacheFiles(cache, ".page.v8");
      expect(page).toBeDefined();
      if (k === 0) expect(Buffer.from((v8.deserialize(unseal(await fs.readFile(page)) as Buffer) as Page).model).toString("latin1")).toContain("FORGED NOTE");
      await reseal<Page>(page, trick.forge);

      const r = await buildInProcess(["--data", data, "--out", out, "--cache", cache]);
      expect(r.code, r.err.join("\n")).toBe(0);
      const warning = r.err.find((l) => l.includes("was refused"));
      expect(warning, r.err.join("\n")).toBeDefined();
      expect(warning).toContain(`wafers/${WAFER}/wafer.md: warning: the drawn page ${page} in the cache was refused and deleted`);
      expect(warning).toMatch(/analysed again from its raw files/);
      expect(warning).toMatch(trick.found);
      expect(r.out.join("\n")).toMatch(/analysed 1 wafer.* \(0 from the cache\); drew 1 page.* \(0 from the cache/);
      // The refused page is gone; the analysis entry is the raw files' again.
      await expect(fs.access(page)).rejects.toThrow();
      for (const f of await cacheFiles(cache, ".v8")) expect((await fs.readFile(f)).includes("FORGED")).toBe(false);

      const built = await siteFiles(out);
      expect([...built.keys()].sort()).toEqual([...clean.keys()].sort());
      expect([...built].filter(([f, bytes]) => !bytes.equals(clean.get(f)!)).map(([f]) => f)).toEqual([]);
    }, 120_000);
  }
});
