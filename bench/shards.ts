/**
 * The sharded benchmark (`npm run bench -- --shards N [size options]`): on
 * the synthetic archive, a cold single-process build, then N `build --shard
 * K/N` processes started together sharing one empty cache folder, then the
 * assembling build over that cache. Reports each shard's wall time, wafers
 * and peak RSS, the assembly's time, and the speed-up of (slowest shard +
 * assembly) over the single process.
 *
 * On one machine the N shards share its cores, so each shard gets
 * floor(cores / N) worker threads (WAFERBOOK_WORKERS; 0 = its main thread),
 * as a runner of a CI with N jobs would have its own. The speed-up measured
 * here is therefore bounded by the machine's cores; docs/scaling.md projects
 * it to runners with cores of their own from the per-wafer times.
 */
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { BuildRun, runBuild as RunBuild } from "./run.ts";

export interface ShardBench {
  shards: number;
  workersPerShard: number;
  cores: number;
  raw_MB: number;
  single: BuildRun;
  shardRuns: (BuildRun & { shard: string })[];
  assembly: BuildRun;
  /** Slowest shard + assembly, s (the shards run at the same time). */
  sharded_s: number;
  speedUp: number;
}

const round = (x: number, d: number) => Number(x.toFixed(d));

/** Runs the single build, the N shards and the assembly on dataDir (already generated) under dir; `runBuild` is run.ts's (passed in: run.ts loads this module). */
export async function benchShards(
  runBuild: typeof RunBuild,
  dataDir: string,
  dir: string,
  shards: number,
  raw_MB: number,
  log: (s: string) => void = console.log,
): Promise<ShardBench> {
  const cores = os.availableParallelism();
  const workersPerShard = Math.floor(cores / shards);
  log("single-process cold build …");
  const single = await runBuild(dataDir, path.join(dir, "site-single"), ["--cache", path.join(dir, "cache-single")], { tag: "-single" });
  const cache = path.join(dir, "cache-shared");
  await fs.rm(cache, { recursive: true, force: true });
  log(`${shards} shard processes at once (${workersPerShard} worker thread${workersPerShard === 1 ? "" : "s"} each) …`);
  const shardRuns = await Promise.all(
    Array.from({ length: shards }, async (_, k) => {
      const run = await runBuild(dataDir, path.join(dir, `unused-${k + 1}`), ["--cache", cache, "--shard", `${k + 1}/${shards}`], {
        tag: `-shard${k + 1}`,
        env: { WAFERBOOK_WORKERS: String(workersPerShard) },
      });
      return { ...run, shard: `${k + 1}/${shards}` };
    }),
  );
  log("assembling build …");
  const assembly = await runBuild(dataDir, path.join(dir, "site-assembled"), ["--cache", cache], { tag: "-assembly" });
  const sharded = Math.max(...shardRuns.map((r) => r.wall_s)) + assembly.wall_s;
  return { shards, workersPerShard, cores, raw_MB, single, shardRuns, assembly, sharded_s: round(sharded, 2), speedUp: round(single.wall_s / sharded, 2) };
}

export function shardTable(r: ShardBench): string {
  const phases = (b: BuildRun) =>
    Object.entries(b.phases_ms)
      .map(([k, v]) => `${k} ${(v / 1000).toFixed(1)}`)
      .join(", ");
  const rows: [string, string][] = [
    ["machine", `${r.cores} cores; ${r.shards} shards, ${r.workersPerShard} worker thread(s) each`],
    [
      "single process",
      `${r.single.wall_s} s (CPU ${r.single.cpu_s} s), ${round(r.raw_MB / r.single.wall_s, 2)} MB/s (${round(r.raw_MB / r.single.wall_s / r.cores, 2)} MB/s per core), peak RSS ${r.single.maxRSS_MB} MB (${phases(r.single)} s)`,
    ],
    ...r.shardRuns.map((s): [string, string] => [
      `shard ${s.shard}`,
      `${s.wall_s} s (CPU ${s.cpu_s} s), analysed ${s.analysed}, peak RSS ${s.maxRSS_MB} MB (${phases(s)} s)`,
    ]),
    [
      "assembly",
      `${r.assembly.wall_s} s (CPU ${r.assembly.cpu_s} s), analysed ${r.assembly.analysed}, from the cache ${r.assembly.cacheHits}, peak RSS ${r.assembly.maxRSS_MB} MB (${phases(r.assembly)} s)`,
    ],
    ["sharded total", `${r.sharded_s} s (slowest shard + assembly), ${round(r.raw_MB / r.sharded_s, 2)} MB/s`],
    ["speed-up", `${r.speedUp}× over one process`],
  ];
  const w = Math.max(...rows.map(([k]) => k.length));
  return rows.map(([k, v]) => `${k.padEnd(w)}  ${v}`).join("\n");
}
