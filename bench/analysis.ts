/**
 * Analysis benchmark, one thread: `npx tsx bench/analysis.ts [--wafers N]
 * [--repeats N] [--dir DIR] [--no-profile]`.
 *
 * Generates the bench data set (bench/generate.ts) into DIR/data unless it
 * already holds N wafers, loads every wafer once (loadWafer, as a worker does),
 * then runs analyseWafer on all of them `repeats` times and prints the median
 * ms per wafer and MB/s of raw sweep data. A final pass runs under the V8
 * sampling profiler (node:inspector) and prints the top-10 functions by self
 * time. The oscillation step (1/B spectrum + least-squares Lifshitz–Kosevich
 * fit, per field sweep) is also timed on its own: median and 90th-percentile
 * ms per sweep over every field sweep, wall clock and CPU time of this
 * thread (budget: median ≤ 5 ms on one core; on a busy machine the CPU time
 * is the fairer figure). The valley-splitting prediction is timed on its own
 * too, per wafer with an analysed depth profile (budget: < 20 ms on one core).
 * A digest of the analysis results (every number, 12 significant digits)
 * is printed (and with --dump written to FILE) so a change can be checked
 * for identical output.
 */
import { createHash } from "node:crypto";
import { promises as fs } from "node:fs";
import { Session } from "node:inspector/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { analyseWafer } from "../src/analyse/wafer.ts";
import { analyseFieldSweep, type TransportPoint } from "../src/analyse/transport/fieldSweep.ts";
import { fitOscillations } from "../src/analyse/transport/oscillationFit.ts";
import { shubnikovDeHaas } from "../src/analyse/transport/shubnikovDeHaas.ts";
import { analyseDepthProfile } from "../src/analyse/structure/depthProfile.ts";
import { predictValleySplitting } from "../src/analyse/structure/valleySplitting.ts";
import type { AnalysisSettings } from "../src/validate/settings.ts";
import { loadWafer, type LoadedWafer } from "../src/validate/load/wafer.ts";
import { loadSiteInputs } from "../src/validate/load/site.ts";
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

/** Median and 90th percentile (ms per sweep) of the oscillation step alone, over every field sweep, `repeats` times. */
function oscillationStep(loaded: LoadedWafer[], repeats: number): { median: number; p90: number; cpuMedian: number; sweeps: number; fitted: number } {
  const jobs: { point: TransportPoint; settings: AnalysisSettings }[] = [];
  for (const w of loaded) {
    const r = w.record!;
    for (const spec of r.devices) {
      for (const sweep of w.devices.find((d) => d.id === spec.id)?.sweeps ?? []) {
        if (sweep.kind !== "field") continue;
        const f = analyseFieldSweep(sweep, spec, r.settings);
        if (f.ok) jobs.push({ point: f.point, settings: r.settings });
      }
    }
  }
  const times: number[] = [];
  const cpu: number[] = [];
  let fitted = 0;
  for (let k = 0; k < repeats; k++) {
    for (const { point: p, settings: s } of jobs) {
      const c = process.cpuUsage();
      const t = performance.now();
      const window = { minField: s.sdh_min_field, maxField: s.sdh_max_field, degeneracy: s.degeneracy, backgroundOrder: s.sdh_background_order };
      const sdh = shubnikovDeHaas(p.trace.b, p.trace.rhoxx, window);
      const fit = sdh.ok
        ? fitOscillations(p.trace.b, p.trace.rhoxx, p.temperature_K, sdh.frequency, {
            ...window,
            massRatio: s.effective_mass,
            minR2: s.sdh_min_r2,
            maxLifetimeError: s.sdh_max_lifetime_error / 100,
            amplitudeFactor: s.sdh_amplitude_factor,
          })
        : undefined;
      times.push(performance.now() - t);
      cpu.push(process.cpuUsage(c).user / 1000);
      if (k === 0 && fit?.ok) fitted++;
    }
  }
  times.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  return {
    median: times[Math.floor(times.length / 2)] ?? 0,
    p90: times[Math.floor(times.length * 0.9)] ?? 0,
    cpuMedian: cpu[Math.floor(cpu.length / 2)] ?? 0,
    sweeps: jobs.length,
    fitted,
  };
}

/** Median and largest ms per wafer of the valley-splitting prediction alone (predictValleySplitting), over every wafer with an analysed profile, `repeats` times. */
function valleyStep(loaded: LoadedWafer[], repeats: number): { median: number; max: number; cpuMedian: number; wafers: number } {
  const jobs: { input: Parameters<typeof predictValleySplitting>[0]; settings: AnalysisSettings }[] = [];
  for (const w of loaded) {
    for (const p of w.structure.profiles ?? []) {
      const r = analyseDepthProfile({ depth: p.depth, ge: p.ge });
      if (r.ok) jobs.push({ input: { depth: p.depth, ge: p.ge, top: r.top, bottom: r.bottom }, settings: w.record!.settings });
    }
  }
  const times: number[] = [];
  const cpu: number[] = [];
  for (let k = 0; k < repeats; k++) {
    for (const { input, settings: s } of jobs) {
      const c = process.cpuUsage();
      const t = performance.now();
      predictValleySplitting(input, {
        field: s.valley_field,
        orbitalEnergy: s.valley_dot_orbital_energy,
        bandOffset: s.valley_band_offset_per_ge,
        threshold: s.valley_splitting_threshold,
      });
      times.push(performance.now() - t);
      cpu.push(process.cpuUsage(c).user / 1000);
    }
  }
  times.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  return { median: times[Math.floor(times.length / 2)] ?? 0, max: times.at(-1) ?? 0, cpuMedian: cpu[Math.floor(cpu.length / 2)] ?? 0, wafers: jobs.length };
}

/** Every number at 12 significant digits, typed arrays as lists, indented (so two dumps can be diffed). */
function canonicalJson(value: unknown): string {
  return JSON.stringify(
    value,
    (_k, v) => {
      if (ArrayBuffer.isView(v)) return Array.from(v as Float64Array, (x) => Number(x.toPrecision(12)));
      if (typeof v === "number") return Number.isFinite(v) ? Number(v.toPrecision(12)) : String(v);
      return v;
    },
    1,
  );
}

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
  children?: number[];
}

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
  const have = await fs.readdir(path.join(dataDir, "wafers")).then(
    (l) => l.length,
    () => 0,
  );
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
  console.log(
    `analyse: median ${(med / ok.length).toFixed(1)} ms/wafer over ${o.repeats} repeats (min ${(times[0] / ok.length).toFixed(1)}, max ${(times.at(-1)! / ok.length).toFixed(1)}), ${(mb / (med / 1000)).toFixed(1)} MB/s of sweep data`,
  );
  const osc = oscillationStep(ok, o.repeats);
  console.log(
    `oscillation step (spectrum + Lifshitz–Kosevich fit): median ${osc.median.toFixed(2)} ms/sweep, 90th percentile ${osc.p90.toFixed(2)} ms (CPU time: median ${osc.cpuMedian.toFixed(2)} ms), over ${osc.sweeps} field sweeps (${osc.fitted} fitted)`,
  );
  const valley = valleyStep(ok, o.repeats);
  console.log(
    `valley-splitting prediction (layers + Schrödinger + Rician): median ${valley.median.toFixed(2)} ms/wafer, max ${valley.max.toFixed(2)} ms (CPU time: median ${valley.cpuMedian.toFixed(2)} ms; budget < 20 ms on one core), over ${valley.wafers} wafers with an analysed profile`,
  );
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
