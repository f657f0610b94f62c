/**
 * Demo structure files for one wafer: a 004 and a 224 reciprocal-space map
 * (synthReciprocalSpaceMap, coarse grid so each file stays a few thousand
 * points) and a SIMS-like depth profile (synthDepthProfile). Returns the
 * wafer.md lines that point at them. All values are invented.
 *
 * Special wafers: TQ-2503 was grown with a 20 nm well (beyond its critical
 * thickness); TQ-2403 has a broad upper interface. The TQ24-B wafers (well
 * grown cooler "to sharpen the upper interface") have a sharp upper interface
 * (logistic τ 0.07–0.10 nm) measured by atom probe with 0.05 nm bins, so the
 * valley-splitting prediction shows its deterministic part; the others are
 * SIMS profiles with 0.2 nm steps. TQ-2406 and TQ-2506 have no structure files.
 */
import type { DemoWafer } from "../generate-demo.ts";
import type { DemoWriter } from "./extras.ts";
import type { Miller } from "../../src/model/structureInputs.ts";
import { synthReciprocalSpaceMap } from "../../src/synth/reciprocalSpaceMap.ts";
import { synthDepthProfile } from "../../src/synth/depthProfile.ts";
import { seededUniform } from "../../src/synth/random.ts";

const DEG = Math.PI / 180;
const THICK_WELL = "TQ-2503";
const BROAD_INTERFACE = "TQ-2403";
const SHARP_INTERFACE_RUN = "TQ24-B";
const NO_STRUCTURE = new Set(["TQ-2406", "TQ-2506"]);

/** Design well thickness of a demo wafer, nm (used for the wafer.md stack too). */
export function wellThicknessNm(w: DemoWafer): number {
  if (w.id === THICK_WELL) return 20;
  return w.run === "TQ25-B" ? 8 : 10;
}

function mapFile(reflection: Miller, x: number, r: number, seed: number): string {
  const m = synthReciprocalSpaceMap({
    reflection,
    geFraction: x,
    relaxation: r,
    step: 0.02 * DEG,
    margin: 0.16 * DEG,
    sigmaRocking: 0.02 * DEG,
    sigmaRadial: 0.016 * DEG,
    heights: { substrate: 1e5, buffer: 8000, well: 400 },
    background: 4,
    offset: { omega: 0.012 * DEG, twoTheta: -0.006 * DEG },
    seed,
  });
  const lines = [
    `# reflection: ${reflection.join(" ")}`,
    "# wavelength: 0.154059292 nm",
    "# instrument: Tarnwick four-circle diffractometer, triple-axis analyser",
    "omega [deg],two_theta [deg],counts",
  ];
  for (const p of m.points) lines.push(`${(p.omega / DEG).toFixed(4)},${(p.twoTheta / DEG).toFixed(4)},${p.counts}`);
  return lines.join("\n") + "\n";
}

function profileFile(w: DemoWafer, wellNm: number, seed: number, rand: () => number): string {
  const broad = w.id === BROAD_INTERFACE;
  const sharp = w.run === SHARP_INTERFACE_RUN;
  const p = synthDepthProfile({
    barrierGe: 0.3 + 0.01 * (rand() - 0.5),
    capThickness: 1,
    barrierThickness: 45,
    wellThickness: wellNm,
    tauCap: 0.8,
    tauTop: broad ? 1.3 : sharp ? 0.07 + 0.03 * rand() : 0.28 + 0.08 * rand(),
    tauBottom: 0.33 + 0.08 * rand(),
    depthMax: 46 + wellNm + 34,
    step: sharp ? 0.05 : 0.2,
    noise: 0.004,
    slope: -2e-5,
    contaminants: {
      O: { depth: 46, peak: (broad ? 2.5e18 : 3e17) * (0.7 + 0.6 * rand()), width: 0.8, floor: 2e16 },
      C: { depth: 46 + wellNm, peak: 1.5e17 * (0.7 + 0.6 * rand()), width: 1, floor: 1e16 },
    },
    seed,
  });
  const head = sharp
    ? ["# method: APT", "# instrument: local-electrode atom probe, laser pulsed, 1-D concentration profile across the well (fictional)"]
    : ["# method: SIMS", "# instrument: magnetic-sector SIMS, O2+ primary beam (fictional)"];
  const lines = [...head, "depth [nm],Ge [at.%],O [cm^-3],C [cm^-3]"];
  p.depth.forEach((z, i) =>
    lines.push(`${z.toFixed(sharp ? 2 : 1)},${(p.ge[i] * 100).toFixed(3)},${p.contaminants.O[i].toPrecision(3)},${p.contaminants.C[i].toPrecision(3)}`),
  );
  return lines.join("\n") + "\n";
}

export async function structureDemo(w: DemoWafer, io: DemoWriter): Promise<string> {
  if (NO_STRUCTURE.has(w.id)) return "";
  const rand = seededUniform(io.seed * 7919 + 17);
  const x = 0.3 + 0.012 * (rand() - 0.5);
  const r = 0.74 + 0.06 * rand();
  await io.write(`wafers/${w.id}/xrd/rsm_004.csv`, mapFile([0, 0, 4], x, r, io.seed * 3 + 1));
  await io.write(`wafers/${w.id}/xrd/rsm_224.csv`, mapFile([2, 2, 4], x, r, io.seed * 3 + 2));
  await io.write(`wafers/${w.id}/profiles/${w.run === SHARP_INTERFACE_RUN ? "apt" : "sims"}.csv`, profileFile(w, wellThicknessNm(w), io.seed * 3 + 3, rand));
  return ['xrd: { files: "xrd/*.csv" }', 'profiles: { files: "profiles/*.csv" }'].join("\n");
}
