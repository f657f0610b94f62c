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

async function main(): Promise<void> {
  const wafers = Number(option("--wafers", "4"));
  const dir = option("--dir", "/tmp/perf-parse-bench");
  const repeats = Number(option("--repeats", "7"));
  const dataDir = path.join(dir, "data");
  const exists = await fs.stat(path.join(dataDir, "wafers")).then(() => true, () => false);
  if (!exists) await generateBenchData(dataDir, { ...DEFAULT_SIZE, wafers }, path.join(ROOT, "data"));
  const rels = (await listFiles(dataDir)).filter((r) => r.includes("/transport/") && r.endsWith(".csv"));
  const texts = await Promise.all(rels.map((r) => fs.readFile(path.join(dataDir, r), "utf8")));
  const bytes = texts.reduce((a, t) => a + Buffer.byteLength(t), 0);
  console.log(`${rels.length} transport tables, ${(bytes / 1e6).toFixed(1)} MB`);

  let sink = 0;
  const rates: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = process.hrtime.bigint();
    for (let i = 0; i < texts.length; i++) {
      const t = readTable(texts[i], rels[i]);
      for (const c of t.columns) sink += numericColumn(t, c)[0];
    }
    const s = Number(process.hrtime.bigint() - t0) / 1e9;
    rates.push(bytes / 1e6 / s);
  }
  console.log(`readTable+numericColumn: ${rates.map((x) => x.toFixed(0)).join(" ")} MB/s; median ${median(rates).toFixed(0)} MB/s`);

  const perFile: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = process.hrtime.bigint();
    for (const rel of rels) sink += (await readDataBytes(dataDir, path.join(dataDir, rel))).bytes.length;
    perFile.push(Number(process.hrtime.bigint() - t0) / 1e6 / rels.length);
  }
  console.log(`readDataBytes: ${perFile.map((x) => x.toFixed(3)).join(" ")} ms/file; median ${median(perFile).toFixed(3)} ms/file`);
  if (sink === 42) console.log("");
}

await main();
