/**
 * The benchmark's synthetic data set: `wafers` wafers of `devices` Hall bars,
 * each with `sweeps` field sweeps of `points` points at rising gate voltage,
 * a zero-field gate sweep (up and down), XRD maps and a depth profile, and
 * optionally a lattice image. Reuses the demo generator's models
 * (scripts/generate-demo.ts, scripts/demo/*, src/synth/*); wafer properties
 * scatter around the demo's baseline with a fixed seed, so every run writes
 * the same bytes. Fictional wafers only.
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { formatSweep, hallSweepRows } from "../src/synth/hallSweep.ts";
import { seededUniform } from "../src/synth/random.ts";
import { mobilityAt, RUNS, waferMd, type DemoWafer } from "../scripts/generate-demo.ts";
import { demoGateSweeps, oscillationHook } from "../scripts/demo/transportDepth.ts";
import { structureDemo } from "../scripts/demo/structure.ts";
import { imagesDemo } from "../scripts/demo/images.ts";

export interface BenchSize {
  wafers: number;
  devices: number;
  sweeps: number;
  points: number;
  images: boolean;
}

export const DEFAULT_SIZE: BenchSize = { wafers: 200, devices: 4, sweeps: 12, points: 1601, images: false };

/** The demo wafer whose lattice image the benchmark's wafers borrow (--images). */
const IMAGE_SOURCE = "TQ-2401";

export function benchWaferId(i: number): string {
  return `BW-${String(i + 1).padStart(4, "0")}`;
}

function benchWafer(i: number, rand: () => number): DemoWafer {
  const runs = Object.keys(RUNS);
  const run = runs[i % runs.length];
  const day = new Date(Date.UTC(2023, 0, 1) + i * 86400000).toISOString().slice(0, 10);
  return {
    id: benchWaferId(i),
    run,
    grown: day,
    peakMobility: 1.2e5 * (1 + 0.3 * (rand() - 0.5)),
    peakDensity: 3.0e11 * (1 + 0.2 * (rand() - 0.5)),
    gateSlope: 5.5e11 * (1 + 0.1 * (rand() - 0.5)),
    turnOn: 0.3 + 0.2 * rand(),
    notes: "Synthetic benchmark wafer.",
  };
}

/** Writes one wafer's files; returns nothing. `seed` makes it reproducible; `revision` > 0 alters its notes (a changed wafer.md). */
export async function writeBenchWafer(dataDir: string, i: number, size: BenchSize, revision = 0): Promise<void> {
  const rand = seededUniform(1000 + i);
  const w = benchWafer(i, rand);
  if (revision > 0) w.notes += ` Revised (${revision}).`;
  const write = async (rel: string, text: string | Buffer) => {
    const abs = path.join(dataDir, rel);
    await fs.mkdir(path.dirname(abs), { recursive: true });
    await fs.writeFile(abs, text);
  };
  const devices = Array.from({ length: size.devices }, (_, k) => ({
    id: `HB${k + 1}`,
    geometry: "hall-bar" as const,
    at: [-30 + 15 * (k % 5), -20 + 10 * Math.floor(k / 5)] as [number, number],
  }));
  let seed = 10000 * (i + 1);
  for (const [di, d] of devices.entries()) {
    const spread = 1 + 0.04 * (rand() - 0.5);
    for (let s = 0; s < size.sweeps; s++) {
      const vg = w.turnOn + 0.2 + (0.9 * s) / Math.max(1, size.sweeps - 1);
      const nCm2 = w.gateSlope * (vg - w.turnOn);
      const mu = mobilityAt(nCm2, w) * spread;
      const rows = hallSweepRows({
        density: nCm2 * 1e4,
        mobility: mu * 1e-4,
        geometry: d.geometry,
        length_um: 100,
        width_um: 20,
        maxField: 2,
        points: size.points,
        misalignment: 0.01 + 0.02 * rand(),
        noise: 2e-4,
        seed: seed++,
        oscillation: oscillationHook(w, nCm2 * 1e4),
      });
      const text = formatSweep({ gate: `${vg.toFixed(3)} V`, temperature: "1.6 K", current: "10 nA", device: d.id }, rows);
      await write(`wafers/${w.id}/transport/${d.id}/vg_${String(s).padStart(2, "0")}.csv`, text);
    }
    for (const [name, text] of Object.entries(demoGateSweeps(w, d.id, spread, 70000 + seed + di)))
      await write(`wafers/${w.id}/transport/${d.id}/${name}`, text);
  }
  const extra = [await structureDemo(w, { write, seed: seed++ })];
  if (size.images) {
    // Borrow the demo image model of one demo wafer, written under this wafer's name.
    const rename = (t: string) => t.replaceAll(IMAGE_SOURCE, w.id);
    extra.push(rename(await imagesDemo({ ...w, id: IMAGE_SOURCE }, { write: (rel, t) => write(rename(rel), t), seed: seed++ })));
  }
  await write(`wafers/${w.id}/wafer.md`, waferMd(w, devices, extra.filter(Boolean).join("\n")));
}

/** Writes the whole data set into dataDir (replacing it): targets and settings from the demo, runs, wafers. */
export async function generateBenchData(dataDir: string, size: BenchSize, demoDataDir: string): Promise<void> {
  await fs.rm(dataDir, { recursive: true, force: true });
  await fs.mkdir(dataDir, { recursive: true });
  for (const f of ["targets.yaml", "analysis.yaml"]) await fs.copyFile(path.join(demoDataDir, f), path.join(dataDir, f));
  await fs.cp(path.join(demoDataDir, "runs"), path.join(dataDir, "runs"), { recursive: true });
  for (let i = 0; i < size.wafers; i++) await writeBenchWafer(dataDir, i, size);
}
