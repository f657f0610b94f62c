/**
 * Writes the demo data set into data/ (fixed seed, fully reproducible).
 *
 * A fictional lab — the Tarnwick Quantum Materials Lab — grows strained-Si
 * quantum wells on relaxed Si0.7Ge0.3 in two reactors ("Heron" and "Kite").
 * Fifteen wafers over four growth runs (one kept in its instruments' own file formats); Hall bars and van der Pauw squares;
 * some pass, some fail, one has a broken file, one was swept with one field
 * sign only. All names and numbers are invented.
 *
 * Run: npm run demo:generate
 */
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { ELEMENTARY_CHARGE } from "../src/physics/constants.ts";
import { formatSweep, hallSweepRows } from "../src/synth/hallSweep.ts";
import { seededUniform } from "../src/synth/random.ts";
import { demoGateSweeps, oscillationHook, parallelChannelOverride } from "./demo/transportDepth.ts";
import { demoExtras } from "./demo/extras.ts";
import { wellThicknessNm } from "./demo/structure.ts";
import { loggerExport, loggerFileName, loggerReading } from "./demo/instrumentExport.ts";
import { growthBlock } from "./demo/growth.ts";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const dataDir = process.argv[2] ? path.resolve(process.argv[2]) : path.join(root, "data");

export interface DemoWafer {
  id: string;
  run: string;
  grown: string;
  grade?: string;
  /** Peak mobility, cm²/(V s), and the density where it peaks, cm⁻². */
  peakMobility: number;
  peakDensity: number;
  /** dn/dVg in cm⁻²/V and turn-on voltage in V. */
  gateSlope: number;
  turnOn: number;
  vdp?: boolean;
  broken?: "non-numeric";
  oneSign?: boolean;
  /** A parallel conducting channel (two-carrier Drude): density cm⁻², mobility cm²/(V s). */
  parallel?: { density: number; mobility: number };
  notes: string;
  waiver?: { metric: string; reason: string; approved_by: string; date: string };
  /** Sweeps kept exactly as the (fictional) cryostat logger exports them, read by wafer.md's reading instructions. */
  instrument?: boolean;
}

export const RUNS: Record<string, { reactor: string; started: string; recipe: string; notes: string }> = {
  "TQ24-A": {
    reactor: "Heron",
    started: "2024-09-02",
    recipe: "SiH4/GeH4 RP-CVD, graded buffer 0→30 % Ge over 3 µm, 10 nm well at 650 °C",
    notes: "Baseline recipe after the chamber bake-out. Buffer grading unchanged from the 2024 process sheet.",
  },
  "TQ24-B": {
    reactor: "Heron",
    started: "2024-11-18",
    recipe: "as TQ24-A, well growth temperature lowered to 625 °C",
    notes: "Lower well temperature to sharpen the upper interface. Watch the turn-on voltage: the cap oxide was grown in a new furnace.",
  },
  "TQ25-A": {
    reactor: "Kite",
    started: "2025-02-10",
    recipe: "as TQ24-B, transferred to the Kite reactor",
    notes: "First run in the Kite reactor. Expect some scatter while the susceptor settles.",
  },
  "TQ25-B": { reactor: "Kite", started: "2025-04-22", recipe: "as TQ25-A with a thinner (8 nm) well", notes: "Thinner well for stronger confinement." },
};

export const WAFERS: DemoWafer[] = [
  {
    id: "TQ-2401",
    run: "TQ24-A",
    grown: "2024-09-03",
    peakMobility: 1.32e5,
    peakDensity: 3.1e11,
    gateSlope: 5.6e11,
    turnOn: 0.31,
    notes: "Reference wafer of the baseline recipe. Mirror-like surface, no slip lines under Nomarski.",
  },
  {
    id: "TQ-2402",
    run: "TQ24-A",
    grown: "2024-09-04",
    peakMobility: 1.18e5,
    peakDensity: 2.9e11,
    gateSlope: 5.4e11,
    turnOn: 0.34,
    vdp: true,
    notes: "Van der Pauw square cut from the wafer edge alongside the Hall bars.",
  },
  {
    id: "TQ-2403",
    run: "TQ24-A",
    grown: "2024-09-05",
    peakMobility: 0.81e5,
    peakDensity: 3.4e11,
    gateSlope: 5.1e11,
    turnOn: 0.52,
    notes: "Particle count after growth was high (load-lock pump fault that day).",
  },
  {
    id: "TQ-2404",
    run: "TQ24-A",
    grown: "2024-09-06",
    peakMobility: 1.25e5,
    peakDensity: 3.0e11,
    gateSlope: 5.5e11,
    turnOn: 0.29,
    broken: "non-numeric",
    notes: "One sweep file was exported with an instrument overload marker in it.",
  },
  {
    id: "TQ-2405",
    run: "TQ24-B",
    grown: "2024-11-19",
    peakMobility: 1.46e5,
    peakDensity: 2.7e11,
    gateSlope: 5.8e11,
    turnOn: 0.27,
    notes: "Best wafer of the run.",
  },
  {
    id: "TQ-2406",
    run: "TQ24-B",
    grown: "2024-11-20",
    grade: "test",
    peakMobility: 0.62e5,
    peakDensity: 3.6e11,
    gateSlope: 4.9e11,
    turnOn: 0.58,
    notes: "Test-grade wafer for process development; judged against the test targets.",
  },
  {
    id: "TQ-2407",
    run: "TQ24-B",
    grown: "2024-11-21",
    peakMobility: 1.06e5,
    peakDensity: 3.2e11,
    gateSlope: 5.3e11,
    turnOn: 0.4,
    notes: "Mobility just above the qubit minimum.",
  },
  {
    id: "TQ-2408",
    run: "TQ24-B",
    grown: "2024-11-22",
    peakMobility: 1.21e5,
    peakDensity: 2.8e11,
    gateSlope: 5.5e11,
    turnOn: 0.66,
    notes: "Cap oxide from the new furnace; turn-on higher than usual.",
    waiver: {
      metric: "turn_on_voltage",
      reason: "device team confirmed the gate stack works up to 0.8 V for the planned dot layout",
      approved_by: "I. Okonkwo-Hale",
      date: "2024-12-03",
    },
  },
  {
    id: "TQ-2501",
    run: "TQ25-A",
    grown: "2025-02-11",
    peakMobility: 1.12e5,
    peakDensity: 3.3e11,
    gateSlope: 5.2e11,
    turnOn: 0.36,
    oneSign: true,
    notes: "The magnet power supply was limited to positive fields on the day; one field sign only.",
  },
  {
    id: "TQ-2502",
    run: "TQ25-A",
    grown: "2025-02-12",
    peakMobility: 0.93e5,
    peakDensity: 3.5e11,
    gateSlope: 5.0e11,
    turnOn: 0.45,
    vdp: true,
    notes: "Slight haze at the wafer edge.",
  },
  {
    id: "TQ-2503",
    run: "TQ25-A",
    grown: "2025-02-13",
    peakMobility: 1.28e5,
    peakDensity: 3.0e11,
    gateSlope: 5.6e11,
    turnOn: 0.33,
    notes: "Grown with a 20 nm well to test the thickness limit of the new reactor (see the structure section).",
  },
  {
    id: "TQ-2504",
    run: "TQ25-B",
    grown: "2025-04-23",
    peakMobility: 1.38e5,
    peakDensity: 2.6e11,
    gateSlope: 5.9e11,
    turnOn: 0.28,
    notes: "Thinner well; mobility holds up.",
  },
  {
    id: "TQ-2505",
    run: "TQ25-B",
    grown: "2025-04-24",
    peakMobility: 1.41e5,
    peakDensity: 2.7e11,
    gateSlope: 5.7e11,
    turnOn: 0.3,
    parallel: { density: 1.2e11, mobility: 1.5e4 },
    notes: "Hall density came out higher than the gate calibration of the run suggested; a conducting layer in the upper barrier is suspected.",
  },
  {
    id: "TQ-2506",
    run: "TQ25-B",
    grown: "2025-04-25",
    peakMobility: 1.02e5,
    peakDensity: 3.1e11,
    gateSlope: 5.4e11,
    turnOn: 0.35,
    vdp: true,
    notes: "Measured by the visiting student; repeat planned.",
  },
  // Last, so the random draws of the wafers above are unchanged.
  {
    id: "TQ-2507",
    run: "TQ25-B",
    grown: "2025-04-28",
    peakMobility: 1.24e5,
    peakDensity: 2.9e11,
    gateSlope: 5.6e11,
    turnOn: 0.31,
    instrument: true,
    notes:
      "First wafer measured with the new cryostat logger: its sweep files and the microscope's 16-bit TIFF are kept exactly as exported, and wafer.md says how to read them.",
  },
];

/** Peaked mobility–density curve: μ(n) = μ_peak·2(n/n_p)^a / (1 + (n/n_p)^(2a)), a = 0.9. */
export function mobilityAt(n: number, w: DemoWafer): number {
  const r = Math.pow(n / w.peakDensity, 0.9);
  return (w.peakMobility * 2 * r) / (1 + r * r);
}

export const GATES = [0.5, 0.65, 0.8, 0.95, 1.1, 1.25];

async function write(rel: string, text: string | Buffer): Promise<void> {
  const abs = path.join(dataDir, rel);
  await fs.mkdir(path.dirname(abs), { recursive: true });
  await fs.writeFile(abs, text);
}

export function waferMd(w: DemoWafer, devices: { id: string; geometry: string; at: [number, number] }[], extra: string): string {
  const lines = ["---", `wafer: ${w.id}`, `run: ${w.run}`, `grown: ${w.grown}`];
  if (w.grade) lines.push(`grade: ${w.grade}`);
  lines.push(`reactor: ${RUNS[w.run].reactor}`);
  lines.push("stack:");
  const well = wellThicknessNm(w);
  for (const [name, role, mat, ge, t] of [
    ["cap", "cap", "Si", 0, 1],
    ["upper barrier", "barrier", "Si0.7Ge0.3", 0.3, 45],
    ["well", "well", "Si", 0, well],
    ["lower barrier", "barrier", "Si0.7Ge0.3", 0.3, 300],
    ["graded buffer", "buffer", "SiGe 0→0.3", 0.3, 3000],
    ["substrate", "substrate", "Si(001)", 0, 725000],
  ] as const) {
    lines.push(`  - { name: ${name}, role: ${role}, material: "${mat}", ge: ${ge}, thickness_nm: ${t} }`);
  }
  lines.push("devices:");
  for (const d of devices) {
    lines.push(`  - id: ${d.id}`, `    geometry: ${d.geometry}`);
    if (d.geometry === "hall-bar") lines.push("    length_um: 100", "    width_um: 20");
    lines.push(`    at_mm: [${d.at[0]}, ${d.at[1]}]`);
    lines.push(w.instrument ? loggerReading(d.id) : `    files: "transport/${d.id}/*.csv"`);
  }
  if (w.waiver) {
    lines.push(
      "waivers:",
      `  - metric: ${w.waiver.metric}`,
      `    reason: "${w.waiver.reason}"`,
      `    approved_by: "${w.waiver.approved_by}"`,
      `    date: ${w.waiver.date}`,
    );
  }
  lines.push(extra.trimEnd());
  lines.push(growthBlock(w));
  lines.push(
    "---",
    "",
    w.notes || "No notes recorded.",
    "",
    "Measured at 1.6 K in the Tarnwick variable-temperature insert. Follow the lab's own cryogen-handling and electrical-safety procedures when repeating these measurements.",
    "",
  );
  return (
    lines
      .filter((l) => l !== "")
      .join("\n")
      .replace(/\n---\n/, "\n---\n\n") + "\n"
  );
}

async function main(): Promise<void> {
  await fs.rm(dataDir, { recursive: true, force: true });
  const rand = seededUniform(20241);
  await write(
    "targets.yaml",
    `# Tarnwick Quantum Materials Lab — qualification targets (fictional demo).
# Verdicts support, and never replace, the lab's own QA sign-off.
default_grade: qubit
grades:
  qubit:
    peak_mobility: { min: "1.0e5 cm^2/(V s)", guard: "5 %", required: true }
    density_at_peak_mobility: { between: ["1.5e11 cm^-2", "4.5e11 cm^-2"] }
    turn_on_voltage: { between: ["0.1 V", "0.6 V"], aggregate: max }
    interface_inplane_mismatch: { between: ["-0.3 %", "0.3 %"] }
    interface_width_top_image: { max: "2 nm" }
    peak_mobility_cv: { max: "6 %" }
    buffer_relaxation: { min: "70 %" }
    critical_thickness_margin: { min: "0 nm" }
    interface_width_top: { max: "3 nm" }
    interface_width_bottom: { max: "3 nm" }
    peak_O: { max: "1e18 cm^-3" }
    # Predicted from the Ge profile (a model estimate, not a measurement): an illustrative floor, not a
    # device requirement — 90 % of dots above about k_B·T at 0.1 K (8.6 µeV), the same level analysis.yaml
    # sets as valley_splitting_threshold (the yield). Qubits usually want E_v well above the Zeeman energy
    # at their operating field (tens of µeV and more; from memory). The prediction depends on how the
    # profile was measured (atom probe vs SIMS): compare wafers measured the same way.
    valley_splitting_p10: { min: "8 µeV" }
    hall_sdh_mismatch: { max: "5 %", aggregate: max }
  test:
    peak_mobility: { min: "3e4 cm^2/(V s)" }
    turn_on_voltage: { max: "1.0 V" }
    # Findings' consequences (default: fail or marginal, docs/formats.md): test wafers keep these as notes.
    findings: { fit_undetermined: note, coarse_profile: note }
# Control charts on the trend pages: limits from the 2024 baseline wafers.
trends:
  baseline: { first: 8 }
  run_length: 8
`,
  );
  await write(
    "analysis.yaml",
    `# Site-wide analysis settings (defaults in docs/formats.md).
hall_max_field: "0.2 T"
# Shubnikov–de Haas window: at 1.6 K the oscillations of these wells are
# thermally damped below about 0.6 T.
sdh_min_field: "0.6 T"
# The valley splitting counted as enough for the yield: the same 8 µeV as the valley_splitting_p10
# target in targets.yaml (measured Si/SiGe splittings run from tens to a few hundred µeV; from memory).
valley_splitting_threshold: "8 µeV"
`,
  );
  for (const [id, r] of Object.entries(RUNS)) {
    await write(
      `runs/${id}.md`,
      `---\nreactor: ${r.reactor}\nstarted: ${r.started}\nrecipe: "${r.recipe}"\n---\n\n${r.notes}\n\nProcess gases (silane, germane, hydrogen) are handled under the lab's gas-safety procedures; nothing in these notes replaces them.\n`,
    );
  }
  let seed = 1;
  for (const w of WAFERS) {
    const devices: { id: string; geometry: "hall-bar" | "van-der-pauw"; at: [number, number] }[] = [
      { id: "HB1", geometry: "hall-bar", at: [-18, 6] },
      { id: "HB2", geometry: "hall-bar", at: [15, -12] },
    ];
    if (w.vdp) devices.push({ id: "VDP1", geometry: "van-der-pauw", at: [2, 30] });
    let counter = 0;
    for (const [di, d] of devices.entries()) {
      const spread = 1 + 0.04 * (rand() - 0.5) + (di === 1 ? -0.03 : 0);
      for (const [gi, vg] of GATES.entries()) {
        const nCm2 = w.gateSlope * (vg - w.turnOn) * (1 + 0.01 * (rand() - 0.5));
        if (nCm2 <= 2e10) continue;
        const mu = mobilityAt(nCm2, w) * spread;
        const rows = hallSweepRows({
          density: nCm2 * 1e4,
          mobility: mu * 1e-4,
          geometry: d.geometry,
          length_um: 100,
          width_um: 20,
          maxField: 2,
          points: w.oneSign ? 401 : 801,
          misalignment: 0.01 + 0.02 * rand(),
          noise: 2e-4,
          seed: seed++,
          oscillation: w.parallel ? undefined : oscillationHook(w, nCm2 * 1e4),
          override: w.parallel ? parallelChannelOverride(w, nCm2 * 1e4, mu * 1e-4) : undefined,
        });
        if (w.oneSign) rows.rows = rows.rows.filter((r) => r[0] >= 0);
        let text = formatSweep({ gate: `${vg.toFixed(2)} V`, temperature: "1.6 K", current: "10 nA", device: d.id }, rows);
        if (w.broken && di === 0 && gi === 2) {
          const lines = text.split("\n");
          lines[140] = lines[140].replace(/,[^,]*$/, ",OVLD");
          text = lines.join("\n");
        }
        if (w.instrument)
          await write(
            `wafers/${w.id}/transport/${d.id}/${loggerFileName(d.id, text, ++counter)}`,
            loggerExport(text, `${w.id} ${d.id}`, `${w.grown}T10:${String(counter).padStart(2, "0")}:00`),
          );
        else await write(`wafers/${w.id}/transport/${d.id}/vg_${vg.toFixed(2).replace(".", "p")}V.csv`, text);
      }
      if (d.geometry === "hall-bar") {
        for (const [name, text] of Object.entries(demoGateSweeps(w, d.id, spread, 70000 + seed))) {
          if (w.instrument)
            await write(
              `wafers/${w.id}/transport/${d.id}/${loggerFileName(d.id, text, ++counter)}`,
              loggerExport(text, `${w.id} ${d.id}`, `${w.grown}T11:${String(counter).padStart(2, "0")}:00`),
            );
          else await write(`wafers/${w.id}/transport/${d.id}/${name}`, text);
        }
      }
    }
    const extra = await demoExtras(w, { write, seed: seed++ });
    await write(`wafers/${w.id}/wafer.md`, waferMd(w, devices, extra));
  }
  void ELEMENTARY_CHARGE;
  console.log(`demo data written to ${path.relative(process.cwd(), dataDir) || "."}/ (${WAFERS.length} wafers, ${Object.keys(RUNS).length} runs)`);
}

if (import.meta.url === `file://${process.argv[1]}`) await main();
