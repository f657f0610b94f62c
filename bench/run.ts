/**
 * The build benchmark (`npm run bench -- [--wafers N] [--devices N]
 * [--sweeps N] [--points N] [--images] [--keep] [--dir DIR]`): generates the
 * synthetic data set (bench/generate.ts) into a temporary folder and measures,
 * each build run as a child process (`bin/waferbook.js build`):
 *   - raw MB (all files) and raw sweep MB (transport tables);
 *   - cold build wall time (empty cache) and throughput in MB/s of raw data,
 *     in all and per core, and MB per CPU-second of the build (user + system
 *     time of all its threads: comparable between machines and loads);
 *   - warm rebuild after one wafer's wafer.md changed;
 *   - warm rebuild after only targets.yaml changed (and how many wafers were
 *     re-analysed: should be none);
 *   - peak RSS of the build process and its worker threads (GNU time's %M
 *     when /usr/bin/time exists, else process.resourceUsage().maxRSS reported
 *     by the child through WAFERBOOK_STATS);
 *   - largest and median wafer page weight: the page's HTML (charts' data
 *     and SVG maps are embedded in it) plus its PNG pictures.
 * Prints a table and writes bench/results/<date>-<size>.json (git-ignored).
 * With `--shards N`, measures a sharded build instead (bench/shards.ts): a
 * cold single-process build, N `--shard K/N` processes sharing one cache
 * folder, then the assembly; each shard's time, the assembly's, the speed-up.
 */
import { execFile } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { promisify } from "node:util";
import { DEFAULT_SIZE, generateBenchData, writeBenchWafer, type BenchSize } from "./generate.ts";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");

export interface BuildRun {
  wall_s: number;
  maxRSS_MB: number;
  /** CPU time of the build process, all its threads (user + system), s: less sensitive to a busy machine than wall time. */
  cpu_s: number;
  cacheHits: number;
  /** Wafer pages reused unchanged from the previous output. */
  pagesReused: number;
  analysed: number;
  phases_ms: Record<string, number>;
}

export interface BenchResult {
  size: BenchSize;
  cores: number;
  raw_MB: number;
  sweep_MB: number;
  cold: BuildRun;
  throughput_MBps: number;
  /** Raw MB per second of CPU time of the cold build (all threads): what one core gets through, whatever the machine's load. */
  cpu_throughput_MBps: number;
  sweep_throughput_MBps: number;
  warmOneWafer: BuildRun;
  warmTargets: BuildRun;
  pageWeight_kB: { largest: number; median: number; largestId: string };
}

async function sizeOf(dir: string, filter: (rel: string) => boolean = () => true, rel = ""): Promise<number> {
  let total = 0;
  for (const e of await fs.readdir(path.join(dir, rel), { withFileTypes: true })) {
    const r = rel ? `${rel}/${e.name}` : e.name;
    if (e.isDirectory()) total += await sizeOf(dir, filter, r);
    else if (filter(r)) total += (await fs.stat(path.join(dir, r))).size;
  }
  return total;
}

/**
 * Runs one build as a child process and returns its measurements. `tag`
 * names its stats files (builds run at the same time need different tags);
 * `env` is added to the child's environment.
 */
export async function runBuild(
  dataDir: string,
  outDir: string,
  extraArgs: string[] = [],
  { tag = "", env = {} }: { tag?: string; env?: Record<string, string> } = {},
): Promise<BuildRun> {
  const statsFile = path.join(path.dirname(outDir), `stats-${process.pid}${tag}.json`);
  const rssFile = path.join(path.dirname(outDir), `rss-${process.pid}${tag}.txt`);
  await fs.rm(statsFile, { force: true });
  // BENCH_WAFERBOOK_BIN: another checkout's bin/waferbook.js, to measure a "before".
  const bin = process.env.BENCH_WAFERBOOK_BIN ?? path.join(ROOT, "bin", "waferbook.js");
  const args = [bin, "build", "--data", dataDir, "--out", outDir, "--quiet", ...extraArgs];
  const timeBin = await fs.access("/usr/bin/time").then(
    () => true,
    () => false,
  );
  const t = performance.now();
  const [cmd, argv] = timeBin ? ["/usr/bin/time", ["-f", "%M", "-o", rssFile, process.execPath, ...args]] : [process.execPath, args];
  await promisify(execFile)(cmd, argv, { env: { ...process.env, ...env, WAFERBOOK_STATS: statsFile }, maxBuffer: 64 * 1024 * 1024 });
  const wall = (performance.now() - t) / 1000;
  const s = JSON.parse(await fs.readFile(statsFile, "utf8").catch(() => "{}")) as {
    cacheHits?: number;
    analysed?: number;
    pagesReused?: number;
    phases?: Record<string, number>;
    maxRSS_kB?: number;
    cpu_ms?: number;
  };
  const rss = timeBin ? Number((await fs.readFile(rssFile, "utf8")).trim().split("\n").at(-1)) : (s.maxRSS_kB ?? 0);
  return {
    wall_s: round(wall, 2),
    maxRSS_MB: round(rss / 1024, 0),
    cpu_s: round((s.cpu_ms ?? 0) / 1000, 2),
    cacheHits: s.cacheHits ?? 0,
    analysed: s.analysed ?? -1,
    pagesReused: s.pagesReused ?? 0,
    phases_ms: s.phases ?? {},
  };
}

/** Page weight of every wafer page: index.html plus the PNGs beside it, kB. */
export async function pageWeights(outDir: string): Promise<{ id: string; kB: number }[]> {
  const out: { id: string; kB: number }[] = [];
  for (const id of await fs.readdir(path.join(outDir, "wafers"))) {
    const dir = path.join(outDir, "wafers", id);
    const html = await fs.stat(path.join(dir, "index.html")).catch(() => undefined);
    if (!html) continue;
    const pngs = await sizeOf(dir, (r) => r.endsWith(".png") && !r.startsWith("raw/"));
    out.push({ id, kB: round((html.size + pngs) / 1024, 1) });
  }
  return out.sort((a, b) => a.kB - b.kB);
}

const round = (x: number, d: number) => Number(x.toFixed(d));

export async function bench(size: BenchSize, dir: string, log: (s: string) => void = console.log): Promise<BenchResult> {
  const dataDir = path.join(dir, "data");
  const outDir = path.join(dir, "site");
  log(
    `generating ${size.wafers} wafers × ${size.devices} devices × ${size.sweeps} sweeps × ${size.points} points${size.images ? " + images" : ""} into ${dir}`,
  );
  await generateBenchData(dataDir, size, path.join(ROOT, "data"));
  await fs.rm(path.join(dir, ".waferbook-cache"), { recursive: true, force: true });
  const raw = await sizeOf(dataDir);
  const sweeps = await sizeOf(dataDir, (r) => r.includes("/transport/"));
  log("cold build …");
  const cold = await runBuild(dataDir, outDir);
  log("warm rebuild after one wafer changed …");
  await writeBenchWafer(dataDir, Math.floor(size.wafers / 2), size, 1);
  const warmOneWafer = await runBuild(dataDir, outDir);
  log("warm rebuild after targets.yaml changed …");
  const targets = path.join(dataDir, "targets.yaml");
  await fs.writeFile(targets, (await fs.readFile(targets, "utf8")).replace('min: "1.0e5 cm^2/(V s)"', 'min: "1.05e5 cm^2/(V s)"'));
  const warmTargets = await runBuild(dataDir, outDir);
  const weights = await pageWeights(outDir);
  const MB = 1024 * 1024;
  return {
    size,
    cores: os.availableParallelism(),
    raw_MB: round(raw / MB, 1),
    sweep_MB: round(sweeps / MB, 1),
    cold,
    throughput_MBps: round(raw / MB / cold.wall_s, 2),
    cpu_throughput_MBps: cold.cpu_s > 0 ? round(raw / MB / cold.cpu_s, 2) : 0,
    sweep_throughput_MBps: round(sweeps / MB / cold.wall_s, 2),
    warmOneWafer,
    warmTargets,
    pageWeight_kB: { largest: weights.at(-1)?.kB ?? 0, median: weights[Math.floor(weights.length / 2)]?.kB ?? 0, largestId: weights.at(-1)?.id ?? "" },
  };
}

export function table(r: BenchResult): string {
  const run = (b: BuildRun) =>
    `${b.wall_s} s (re-analysed ${b.analysed}, cached ${b.cacheHits}, pages reused ${b.pagesReused}; ${Object.entries(b.phases_ms)
      .map(([k, v]) => `${k} ${(v / 1000).toFixed(1)}`)
      .join(", ")} s)`;
  const rows: [string, string][] = [
    [
      "size",
      `${r.size.wafers} wafers × ${r.size.devices} devices × ${r.size.sweeps} sweeps × ${r.size.points} points${r.size.images ? " + images" : ""}; ${r.cores} cores`,
    ],
    ["raw data", `${r.raw_MB} MB (sweeps ${r.sweep_MB} MB)`],
    ["cold build", run(r.cold)],
    [
      "throughput",
      `${r.throughput_MBps} MB/s raw (${round(r.throughput_MBps / r.cores, 2)} MB/s per core on ${r.cores} cores; ${r.cpu_throughput_MBps} MB per CPU-second, ${r.cold.cpu_s} s CPU), ${r.sweep_throughput_MBps} MB/s sweeps (goal ≥ 50)`,
    ],
    ["warm, one wafer changed", `${run(r.warmOneWafer)} = ${Math.round((100 * r.warmOneWafer.wall_s) / r.cold.wall_s)} % of cold (goal ≤ 10 %)`],
    ["warm, targets changed", `${run(r.warmTargets)} (goal: re-analysed 0)`],
    ["peak RSS", `cold ${r.cold.maxRSS_MB} MB, warm ${r.warmOneWafer.maxRSS_MB} MB (goal ≤ 1024)`],
    ["wafer page weight", `largest ${r.pageWeight_kB.largest} kB (${r.pageWeight_kB.largestId}), median ${r.pageWeight_kB.median} kB (goal ≤ 300)`],
  ];
  const w = Math.max(...rows.map(([k]) => k.length));
  return rows.map(([k, v]) => `${k.padEnd(w)}  ${v}`).join("\n");
}

function parse(argv: string[]): { size: BenchSize; keep: boolean; dir?: string; shards?: number } {
  const size = { ...DEFAULT_SIZE };
  let keep = false;
  let shards: number | undefined;
  let dir: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const num = () => {
      const v = Number(argv[++i]);
      if (!Number.isInteger(v) || v < 1) throw new Error(`${a} needs a positive whole number`);
      return v;
    };
    if (a === "--wafers") size.wafers = num();
    else if (a === "--devices") size.devices = num();
    else if (a === "--sweeps") size.sweeps = num();
    else if (a === "--points") size.points = num();
    else if (a === "--images") size.images = true;
    else if (a === "--keep") keep = true;
    else if (a === "--dir") dir = argv[++i];
    else if (a === "--shards") shards = num();
    else throw new Error(`unknown option ${a}; options: --wafers N --devices N --sweeps N --points N --images --keep --dir DIR --shards N`);
  }
  return { size, keep, dir, shards };
}

/** `--shards N`: the sharded benchmark (bench/shards.ts) on the same synthetic archive. */
async function benchSharded(size: BenchSize, dir: string, shards: number) {
  const { benchShards, shardTable } = await import("./shards.ts");
  const dataDir = path.join(dir, "data");
  console.log(
    `generating ${size.wafers} wafers × ${size.devices} devices × ${size.sweeps} sweeps × ${size.points} points${size.images ? " + images" : ""} into ${dir}`,
  );
  await generateBenchData(dataDir, size, path.join(ROOT, "data"));
  const r = { size, ...(await benchShards(runBuild, dataDir, dir, shards, round((await sizeOf(dataDir)) / (1024 * 1024), 1))) };
  console.log(shardTable(r));
  return r;
}

async function main(): Promise<void> {
  const { size, keep, dir: given, shards } = parse(process.argv.slice(2));
  const dir = given ? path.resolve(given) : await fs.mkdtemp(path.join(os.tmpdir(), "waferbook-bench-"));
  try {
    const r = shards ? await benchSharded(size, dir, shards) : await bench(size, dir);
    if (!shards) console.log(table(r as BenchResult));
    const resultsDir = path.join(ROOT, "bench", "results");
    await fs.mkdir(resultsDir, { recursive: true });
    const file = path.join(resultsDir, `${new Date().toISOString().replace(/[:.]/g, "-")}-${size.wafers}w${shards ? `-${shards}shards` : ""}.json`);
    await fs.writeFile(file, JSON.stringify(r, null, 1) + "\n");
    console.log(`results written to ${path.relative(process.cwd(), file)}`);
  } finally {
    if (!keep && !given) await fs.rm(dir, { recursive: true, force: true });
  }
}

if (import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith("bench/run.ts")) await main();
