/**
 * Micro-benchmark of the sweep-table parse step (`npx tsx bench/parse.ts
 * [--wafers N] [--dir DIR] [--repeats N]`): generates the benchmark data set
 * (bench/generate.ts) into DIR/data unless it is already there, loads every
 * transport table into memory, then times readTable + numericColumn (every
 * column) over all of them. Prints MB/s of raw sweep text per repeat and the
 * median. A second figure times readDataBytes (the safety checks and the read)
 * over the same files, in ms per file.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { DEFAULT_SIZE, generateBenchData } from "./generate.ts";
import { listFiles, readDataBytes } from "../src/read/dataFiles.ts";
import { numericColumn, readTable } from "../src/read/table.ts";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");

function option(name: string, fallback: string): string {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : fallback;
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** Runs f once; returns [wall s, CPU s (user + system, every thread of the process)]. */
async function timed(f: () => Promise<void>): Promise<[number, number]> {
  const c0 = process.cpuUsage();
  const t0 = process.hrtime.bigint();
  await f();
  const wall = Number(process.hrtime.bigint() - t0) / 1e9;
  const c = process.cpuUsage(c0);
  return [wall, (c.user + c.system) / 1e6];
}

async function main(): Promise<void> {
  const wafers = Number(option("--wafers", "4"));
  const dir = option("--dir", "/tmp/perf-parse-bench");
  const repeats = Number(option("--repeats", "7"));
  const dataDir = path.join(dir, "data");
  const exists = await fs.stat(path.join(dataDir, "wafers")).then(
    () => true,
    () => false,
  );
  if (!exists) await generateBenchData(dataDir, { ...DEFAULT_SIZE, wafers }, path.join(ROOT, "data"));
  const rels = (await listFiles(dataDir)).filter((r) => r.includes("/transport/") && r.endsWith(".csv"));
  const texts = await Promise.all(rels.map((r) => fs.readFile(path.join(dataDir, r), "utf8")));
  const bytes = texts.reduce((a, t) => a + Buffer.byteLength(t), 0);
  console.log(`${rels.length} transport tables, ${(bytes / 1e6).toFixed(1)} MB`);

  let sink = 0;
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const [w, c] = await timed(async () => {
      for (let i = 0; i < texts.length; i++) {
        const t = readTable(texts[i], rels[i]);
        for (const col of t.columns) sink += numericColumn(t, col)[0];
      }
    });
    wall.push(bytes / 1e6 / w);
    cpu.push(bytes / 1e6 / c);
  }
  console.log(`readTable+numericColumn: wall ${wall.map((x) => x.toFixed(0)).join(" ")} MB/s`);
  console.log(`  median ${median(wall).toFixed(0)} MB/s wall, ${median(cpu).toFixed(0)} MB/s CPU`);

  const perFile: number[] = [];
  const perFileCpu: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const [w, c] = await timed(async () => {
      for (const rel of rels) sink += (await readDataBytes(dataDir, path.join(dataDir, rel))).bytes.length;
    });
    perFile.push((w * 1e3) / rels.length);
    perFileCpu.push((c * 1e3) / rels.length);
  }
  console.log(`readDataBytes: wall ${perFile.map((x) => x.toFixed(3)).join(" ")} ms/file`);
  console.log(`  median ${median(perFile).toFixed(3)} ms/file wall, ${median(perFileCpu).toFixed(3)} ms/file CPU`);
  // The work checkInside no longer repeats per file: resolving the data folder itself.
  const root: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const [w] = await timed(async () => {
      for (let i = 0; i < rels.length; i++) sink += (await fs.realpath(dataDir)).length;
    });
    root.push((w * 1e3) / rels.length);
  }
  console.log(`fs.realpath(dataDir), once per file before memoising: median ${median(root).toFixed(3)} ms/call`);
  if (sink === 42) console.log("");
}

await main();
