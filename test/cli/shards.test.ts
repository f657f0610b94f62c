/**
 * Sharded builds (src/cli/shard.ts, shardBuild.ts, drawnPages.ts): three
 * `--shard K/3` builds write cache folders, which are merged by plain copying
 * (`cp -r shard/. merged/`), and a plain build over the merged cache must
 * analyse and draw nothing and write a site byte-identical to a
 * single-machine build (SOURCE_DATE_EPOCH fixes the footer's time, so every
 * byte is compared). Five demo wafers keep it lean: every kind of page
 * (images, structure, an input error, an incoherent well, a waiver, a
 * one-sign sweep).
 * Expected values: the partition rule is written out here from its
 * published form (longest processing time first, Graham 1969), not taken
 * from the code; the rest is this program's own documented interface
 * (README "Command line", docs/scaling.md).
 */
import { waferPageModel } from "../../src/publish/waferPage.ts";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";
import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { commitAll } from "../helpers/gitRepo.ts";
import { useTempDir } from "../helpers/tempDir.ts";
import { PACKAGE_ROOT } from "../../src/cli/build.ts";
import { parseArgs } from "../../src/cli/args.ts";
import { buildInProcess, siteFiles } from "../helpers/inProcessBuild.ts";
import { parseShard, partition } from "../../src/cli/shard.ts";
import { drawnPagePath, restoreDrawnPage, storeDrawnPage } from "../../src/cli/drawnPages.ts";
import { parkedPath } from "../../src/cli/render.ts";
import { compareScriptFrame } from "../../src/publish/compareData.ts";
import v8 from "node:v8";
import { PNG } from "pngjs";

const _git = promisify(execFile);
const WAFERS = ["TQ-2401", "TQ-2404", "TQ-2406", "TQ-2408", "TQ-2501"];
const tempDir = useTempDir("shards");

describe("--shard K/N: the argument", () => {
  it("accepts K/N with 1 ≤ K ≤ N and refuses the rest with what was expected (exit 2)", () => {
    expect(parseShard("2/3")).toEqual({ index: 2, count: 3 });
    expect(parseShard("1/1")).toEqual({ index: 1, count: 1 });
    for (const bad of ["0/3", "4/3", "3", "a/b", "-1/3", "1/0", "2/3/4", ""])
      expect(parseShard(bad)).toHaveProperty("error", expect.stringMatching(/--shard K\/N .*1 ≤ K ≤ N.*found/));
    const r = parseArgs(["build", "--shard", "4/3"]);
    expect(r).toMatchObject({ command: "usage-error", message: expect.stringMatching(/shard 4 of 3/) });
    expect(parseArgs(["build", "--shard", "1/2", "--no-cache"])).toMatchObject({
      command: "usage-error",
      message: expect.stringMatching(/cannot run with --no-cache/),
    });
    expect(parseArgs(["build", "--shard", "2/2"])).toMatchObject({ command: "build", options: { shard: { index: 2, count: 2 } } });
  });
});

describe("the partition", () => {
  it("longest first, each to the lightest shard (lowest number on a tie): a hand-worked case", () => {
    // LPT by hand: 10→1, 9→2, 8→3, 7→3 (8 lightest), 6→2 (9), 5→1 (10): loads 15, 15, 15.
    const p = partition(
      ["a", "b", "c", "d", "e", "f"].map((id, i) => ({ id, bytes: 10 - i })),
      3,
    );
    expect(Object.fromEntries(p)).toEqual({ a: 1, b: 2, c: 3, d: 3, e: 2, f: 1 });
  });
  it("equal sizes go in the order of the SHA-256 of the id, whatever order they are given in", () => {
    const ids = ["TQ-1", "TQ-2", "TQ-3", "TQ-4", "TQ-5"];
    const byHash = [...ids].sort((a, b) => (createHash("sha256").update(a).digest("hex") < createHash("sha256").update(b).digest("hex") ? -1 : 1));
    // Five equal wafers over two shards, by hand: shards 1, 2, 1, 2, 1 in hash order.
    const expected = Object.fromEntries(byHash.map((id, i) => [id, (i % 2) + 1]));
    expect(
      Object.fromEntries(
        partition(
          ids.map((id) => ({ id, bytes: 7 })),
          2,
        ),
      ),
    ).toEqual(expected);
    expect(
      Object.fromEntries(
        partition(
          [...ids].reverse().map((id) => ({ id, bytes: 7 })),
          2,
        ),
      ),
    ).toEqual(expected);
  });
  it("every wafer in exactly one shard; more shards than wafers leaves some empty", () => {
    const p = partition(
      [
        { id: "x", bytes: 3 },
        { id: "y", bytes: 1 },
      ],
      4,
    );
    expect([...p.values()].sort()).toEqual([1, 2]);
  });
});

describe("drawn pages in the cache are checked on reading", () => {
  it("a page whose bytes changed is discarded with a warning, never restored", async () => {
    const root = path.join(tempDir(), "drawn");
    const [out, scratch, cache] = ["out", "scratch", "cache"].map((d) => path.join(root, d));
    await fs.mkdir(path.join(out, "wafers", "W-1", "images"), { recursive: true });
    // A tiny real PNG and the comparison data as waferbook writes them (a drawn page holds nothing else: drawnPageCheck.ts).
    const png = PNG.sync.write(Object.assign(new PNG({ width: 1, height: 1 }), { data: Buffer.from([10, 20, 30, 255]) }));
    await fs.writeFile(path.join(out, "wafers", "W-1", "images", "map.png"), png);
    const compare = `${compareScriptFrame("W-1").before}{"id":"W-1"}${compareScriptFrame("W-1").after}`;
    await fs.writeFile(path.join(out, "wafers", "W-1", "compare.js"), compare);
    await fs.mkdir(scratch, { recursive: true });
    // A whole page model as the drawing writes it (a model without its printed fields is refused: drawnPageCheck.ts).
    const targets = targetsFrom('default_grade: test\ngrades:\n  test:\n    peak_mobility: { min: "1e4 cm^2/(V s)" }\n');
    const drawn = waferPageModel(makeOutcome({ id: "W-1", devices: { d1: { peak_mobility: 2e4 } } } as never, targets));
    const model = v8.serialize({ ...drawn, notesHtml: "<p>model</p>" });
    await fs.writeFile(parkedPath(scratch, "W-1"), model);
    const key = "ab".repeat(32);
    await storeDrawnPage(cache, key, "W-1", out, scratch);
    const back = path.join(root, "back");
    expect(await restoreDrawnPage(cache, key, "W-1", back, path.join(back, "s"), () => {})).toBe("restored");
    expect(await fs.readFile(path.join(back, "wafers", "W-1", "images", "map.png"))).toEqual(png);
    expect(await fs.readFile(parkedPath(path.join(back, "s"), "W-1"))).toEqual(model);
    // Another wafer's key never restores into this one.
    const damaged: string[] = [];
    expect(await restoreDrawnPage(cache, key, "W-2", back, path.join(back, "s"), (_f, r) => damaged.push(r))).toBe("damaged");
    expect(damaged).toEqual(["it does not hold this wafer's page"]);
    // One flipped byte: checksum mismatch, file deleted.
    await storeDrawnPage(cache, key, "W-1", out, scratch);
    const file = drawnPagePath(cache, key);
    const bytes = await fs.readFile(file);
    bytes[bytes.length - 3] ^= 1;
    await fs.writeFile(file, bytes);
    expect(await restoreDrawnPage(cache, key, "W-1", back, path.join(back, "s"), (_f, r) => damaged.push(r))).toBe("damaged");
    expect(damaged.at(-1)).toMatch(/checksum/);
    await expect(fs.access(file)).rejects.toThrow();
  });
});

describe("three shards, merged by copying, assemble the single-machine site byte for byte", () => {
  const saved = process.env.SOURCE_DATE_EPOCH;
  beforeAll(() => {
    process.env.SOURCE_DATE_EPOCH = "1780000000";
  });
  afterAll(() => {
    if (saved === undefined) delete process.env.SOURCE_DATE_EPOCH;
    else process.env.SOURCE_DATE_EPOCH = saved;
  });

  it("shards write only their cache; the assembly analyses and draws nothing; every file's bytes match", async () => {
    const root = tempDir();
    const data = path.join(root, "data");
    const sep = path.sep;
    await fs.cp(path.join(PACKAGE_ROOT, "data"), data, {
      recursive: true,
      filter: (src) => !src.includes(`${sep}wafers${sep}`) || WAFERS.some((w) => src.includes(`${sep}wafers${sep}${w}`)),
    });
    await commitAll(data, "Demo data", { init: true });

    const shardWafers: number[] = [];
    for (const k of [1, 2, 3]) {
      const r = await buildInProcess(["--data", data, "--out", path.join(root, `never-${k}`), "--cache", path.join(root, `cache-${k}`), "--shard", `${k}/3`]);
      expect(r.code, r.err.join("\n")).toBe(0);
      const line = r.out.find((l) => l.startsWith(`shard ${k}/3: `));
      expect(line).toMatch(/no site written/);
      shardWafers.push(Number(new RegExp(`: (\\d+) of ${WAFERS.length} wafers`).exec(line!)![1]));
      // --out is not touched: no site, no lock, no generation folder beside it.
      expect((await fs.readdir(root)).filter((n) => n.includes(`never-${k}`))).toEqual([]);
    }
    expect(shardWafers.reduce((a, b) => a + b, 0)).toBe(WAFERS.length);
    expect(Math.max(...shardWafers)).toBeLessThanOrEqual(3);

    // The merge is a plain copy of each shard's folder into one.
    const merged = path.join(root, "merged");
    await fs.mkdir(merged);
    for (const k of [1, 2, 3]) await fs.cp(path.join(root, `cache-${k}`), merged, { recursive: true, force: true });

    const assembled = await buildInProcess(["--data", data, "--out", path.join(root, "assembled"), "--cache", merged]);
    expect(assembled.code, assembled.err.join("\n")).toBe(0);
    expect(assembled.out).toContain(
      `analysed 0 wafers (${WAFERS.length} from the cache); drew 0 pages (${WAFERS.length} from the cache, 0 reused from the previous site)`,
    );

    const single = await buildInProcess(["--data", data, "--out", path.join(root, "single"), "--no-cache"]);
    expect(single.code, single.err.join("\n")).toBe(0);
    expect(single.out).toContain(
      `analysed ${WAFERS.length} wafers (0 from the cache); drew ${WAFERS.length} pages (0 from the cache, 0 reused from the previous site)`,
    );
    // The same problems, in the same order, from either way of building.
    expect(assembled.err).toEqual(single.err);

    const a = await siteFiles(path.join(root, "assembled"));
    const b = await siteFiles(path.join(root, "single"));
    expect([...a.keys()].sort()).toEqual([...b.keys()].sort());
    expect([...a.keys()].some((f) => f.endsWith(".png"))).toBe(true);
    expect([...a].filter(([f, bytes]) => !bytes.equals(b.get(f)!)).map(([f]) => f)).toEqual([]);
  }, 300_000);
});
