/**
 * Analysis benchmark, one thread: `npx tsx bench/analysis.ts [--wafers N]
 * [--repeats N] [--dir DIR] [--no-profile]`.
 *
 * Generates the bench data set (bench/generate.ts) into DIR/data unless it
 * already holds N wafers, loads every wafer once (loadWafer, as a worker does),
 * then runs analyseWafer on all of them `repeats` times and prints the median
 * ms per wafer and MB/s of raw sweep data. A final pass runs under the V8
 * sampling profiler (node:inspector) and prints the top-10 functions by self
 * time. A digest of the analysis results (every number, 12 significant digits)
 * is printed (and with --dump written to FILE) so a change can be checked
 * for identical output.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import { Session } from "node:inspector/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { analyseWafer } from "../src/analyse/wafer.ts";
import { loadWafer, type LoadedWafer } from "../src/read/wafer.ts";
import { loadSiteInputs } from "../src/read/site.ts";
import { DEFAULT_SIZE, generateBenchData } from "./generate.ts";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");

function parse(argv: string[]) {
  const o = { wafers: 10, repeats: 5, dir: "/tmp/wb-analysis-bench", profile: true, dump: "" };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === "--wafers") o.wafers = Number(argv[++i]);
    else if (a === "--repeats") o.repeats = Number(argv[++i]);
    else if (a === "--dir") o.dir = argv[++i];
    else if (a === "--no-profile") o.profile = false;
    else if (a === "--dump") o.dump = argv[++i];
    else throw new Error(`unknown option ${a}; options: --wafers N --repeats N --dir DIR --no-profile --dump FILE`);
  }
  return o;
}

async function sweepBytes(dir: string): Promise<number> {
  let total = 0;
  for (const e of await fs.readdir(dir, { withFileTypes: true, recursive: true })) {
    if (e.isFile() && /\.(csv|tsv|txt|dat)$/i.test(e.name) && !/images?/i.test(e.parentPath)) total += (await fs.stat(path.join(e.parentPath, e.name))).size;
  }
  return total;
}

function analyseAll(loaded: LoadedWafer[]) {
  return loaded.map((w) => {
    const r = w.record!;
    const inputs = r.devices.map((spec) => ({ spec, sweeps: w.devices.find((d) => d.id === spec.id)?.sweeps ?? [] }));
    return analyseWafer({ devices: inputs, structure: w.structure, images: w.images, stack: r.stack }, r.settings);
  });
}

/** Every number at 12 significant digits, typed arrays as lists, indented (so two dumps can be diffed). */
function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_k, v) => {
    if (ArrayBuffer.isView(v)) return Array.from(v as Float64Array, (x) => Number(x.toPrecision(12)));
    if (typeof v === "number") return Number.isFinite(v) ? Number(v.toPrecision(12)) : String(v);
    return v;
  }, 1);
}

interface ProfileNode { id: number; callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number }; children?: number[] }

function topSelfTime(profile: { nodes: ProfileNode[]; samples: number[]; timeDeltas: number[] }, n: number): string[] {
  const byId = new Map(profile.nodes.map((p) => [p.id, p]));
  const self = new Map<string, number>();
  profile.samples.forEach((id, i) => {
    const f = byId.get(id)!.callFrame;
    // The profiler's own stop call and idle time are not analysis.
    if ((f.functionName === "dispatch" && !f.url) || f.functionName === "(idle)") return;
    const where = f.url ? `${f.url.replace(/^.*\//, "")}:${f.lineNumber + 1}:${f.columnNumber + 1}` : "(native)";
    const key = `${f.functionName || "(anonymous)"} ${where}`.trim();
    self.set(key, (self.get(key) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
  });
  const total = [...self.values()].reduce((s, v) => s + v, 0);
  return [...self.entries()]
    .sort((a, b) => b[1] - a[1])
    .slice(0, n)
    .map(([k, ms]) => `${ms.toFixed(0).padStart(7)} ms ${((100 * ms) / total).toFixed(1).padStart(5)} %  ${k}`);
}

async function main() {
  const o = parse(process.argv.slice(2));
  const dataDir = path.join(o.dir, "data");
  const have = await fs.readdir(path.join(dataDir, "wafers")).then((l) => l.length, () => 0);
  if (have !== o.wafers) {
    console.log(`generating ${o.wafers} bench wafers in ${dataDir} ...`);
    await generateBenchData(dataDir, { ...DEFAULT_SIZE, wafers: o.wafers }, path.join(ROOT, "data"));
  }
  const site = await loadSiteInputs(dataDir);
  const ctx = { dataDir, today: "2030-01-01", siteSettings: site.settings };
  const t0 = performance.now();
  const loaded: LoadedWafer[] = [];
  for (const folder of site.waferFolders) loaded.push(await loadWafer(folder, ctx));
  const loadMs = performance.now() - t0;
  const ok = loaded.filter((w) => w.record);
  const mb = (await sweepBytes(path.join(dataDir, "wafers"))) / 1e6;
  console.log(`${ok.length} wafers, ${mb.toFixed(1)} MB raw sweep data; load (read + validate) ${(loadMs / ok.length).toFixed(0)} ms/wafer`);

  const times: number[] = [];
  let result: unknown;
  for (let r = 0; r < o.repeats; r++) {
    const t = performance.now();
    result = analyseAll(ok);
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  const med = times[Math.floor(times.length / 2)];
  console.log(`analyse: median ${(med / ok.length).toFixed(1)} ms/wafer over ${o.repeats} repeats (min ${(times[0] / ok.length).toFixed(1)}, max ${(times.at(-1)! / ok.length).toFixed(1)}), ${(mb / (med / 1000)).toFixed(1)} MB/s of sweep data`);
  const json = canonicalJson(result);
  console.log(`results digest ${createHash("sha256").update(json).digest("hex").slice(0, 16)}`);
  if (o.dump) await fs.writeFile(o.dump, json);

  if (o.profile) {
    const session = new Session();
    session.connect();
    await session.post("Profiler.enable");
    await session.post("Profiler.setSamplingInterval", { interval: 200 });
    await session.post("Profiler.start");
    analyseAll(ok);
    const { profile } = await session.post("Profiler.stop");
    session.disconnect();
    console.log("top-10 self time (one profiled pass):");
    for (const line of topSelfTime(profile as never, 10)) console.log(line);
  }
}

await main();
