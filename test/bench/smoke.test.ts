/**
 * Keeps the benchmark from rotting: generates a tiny benchmark data set with
 * bench/generate.ts, builds it twice in-process through the analysis cache,
 * and measures page weights with bench/run.ts's helper.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { benchWaferId, generateBenchData, writeBenchWafer, type BenchSize } from "../../bench/generate.ts";
import { pageWeights } from "../../bench/run.ts";
import { build, PACKAGE_ROOT, type BuildIO } from "../../src/cli/build.ts";

const SIZE: BenchSize = { wafers: 3, devices: 1, sweeps: 2, points: 101, images: false };
const io: BuildIO = { log: () => {}, today: () => "2026-01-01", now: () => "2026-01-01T00:00:00Z" };
let tmp = "";

afterAll(async () => {
  if (tmp) await fs.rm(tmp, { recursive: true, force: true });
});

describe("benchmark smoke test (3 tiny wafers)", () => {
  it("generates, builds cold, rebuilds from the cache, and re-analyses only a changed wafer", async () => {
    tmp = await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-bench-smoke-"));
    const data = path.join(tmp, "data");
    const out = path.join(tmp, "site");
    const cache = path.join(tmp, "cache");
    await generateBenchData(data, SIZE, path.join(PACKAGE_ROOT, "data"));
    expect((await fs.readdir(path.join(data, "wafers"))).sort()).toEqual([0, 1, 2].map(benchWaferId));
    const opts = { data, out, strict: false, basePath: "/", quiet: true, cache };
    const cold = await build(opts, io);
    expect(cold.ok).toBe(true);
    expect(cold.stats).toMatchObject({ cacheHits: 0, analysed: 3 });
    expect(cold.outcomes.every((o) => o.analysis && o.analysis.devices.length === 1)).toBe(true);
    const coldPage = await fs.readFile(path.join(out, "wafers", benchWaferId(1), "index.html"), "utf8");
    await writeBenchWafer(data, 0, SIZE, 1);
    const warm = await build(opts, io);
    expect(warm.stats).toMatchObject({ cacheHits: 2, analysed: 1 });
    // A page served from the cache is byte-identical to the one analysed from raw files.
    expect(await fs.readFile(path.join(out, "wafers", benchWaferId(1), "index.html"), "utf8")).toBe(coldPage);
    const weights = await pageWeights(out);
    expect(weights).toHaveLength(3);
    expect(weights.every((w) => w.kB > 5 && w.kB < 300)).toBe(true);
  }, 60_000);
});
