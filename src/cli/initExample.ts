/**
 * The example wafer `waferbook init` writes: a commented wafer.md with one
 * Hall bar and four small field sweeps at four gate voltages, made by the
 * synthetic Drude model of src/synth/hallSweep.ts (fixed seeds, so every init
 * writes the same bytes). Small enough to read (41 points per sweep), and
 * complete enough to analyse without a problem: density and Hall mobility per
 * sweep, the mobility peak, and a verdict against the starter targets.
 */
import { formatSweep, hallSweepRows } from "../synth/hallSweep.ts";

export const EXAMPLE_WAFER = "example-01";
export const EXAMPLE_RUN = "run-01";

/** Gate voltages of the example sweeps, V. */
const GATES = [0.5, 0.7, 0.9, 1.1];

/**
 * The example's sheet density at gate voltage vg, cm⁻²: a gate capacitance
 * of 5.5e11 cm⁻²/V above a turn-on at 0.3 V. Mobility, cm²/(V s): peaked at
 * 1.2e5 near 2.8e11 cm⁻² (the demo generator's curve).
 */
function exampleTransport(vg: number): { density: number; mobility: number } {
  const density = 5.5e11 * (vg - 0.3);
  const r = Math.pow(density / 2.8e11, 0.9);
  return { density, mobility: (1.2e5 * 2 * r) / (1 + r * r) };
}

const WAFER_MD = `---
# The wafer record: front matter (YAML) between the two --- lines, then free
# notes in Markdown. Format: waferbook's docs/formats.md, section 1.
wafer: ${EXAMPLE_WAFER}         # equal to the folder name
run: ${EXAMPLE_RUN}             # the growth run (notes in runs/${EXAMPLE_RUN}.md)
grown: 2025-01-15           # ISO date
# grade: test               # the target grade; default: default_grade in targets.yaml
stack:                      # layers from the surface down
  - { name: cap, role: cap, material: "Si", ge: 0, thickness_nm: 1 }
  - { name: upper barrier, role: barrier, material: "Si0.7Ge0.3", ge: 0.3, thickness_nm: 45 }
  - { name: well, role: well, material: "Si", ge: 0, thickness_nm: 10 }
  - { name: lower barrier, role: barrier, material: "Si0.7Ge0.3", ge: 0.3, thickness_nm: 300 }
  - { name: substrate, role: substrate, material: "Si(001)" }
devices:
  - id: HB1
    geometry: hall-bar      # hall-bar | van-der-pauw
    length_um: 100          # voltage-probe spacing
    width_um: 20            # bar width
    files: "transport/HB1/*.csv"   # the device's sweep files, relative to this folder
---

An example wafer written by \`waferbook init\`: four synthetic field sweeps of one Hall bar, so that the first build has something to show. Replace this folder with your first real wafer.
`;

/** The example wafer's files, by path inside the data folder. */
export function exampleWaferFiles(): Map<string, string> {
  const files = new Map<string, string>();
  files.set(`wafers/${EXAMPLE_WAFER}/wafer.md`, WAFER_MD);
  for (const [i, vg] of GATES.entries()) {
    const { density, mobility } = exampleTransport(vg);
    const rows = hallSweepRows({
      density: density * 1e4,
      mobility: mobility * 1e-4,
      geometry: "hall-bar",
      length_um: 100,
      width_um: 20,
      maxField: 1,
      points: 41,
      misalignment: 0.01,
      noise: 2e-4,
      seed: 101 + i,
    });
    const name = `vg_${vg.toFixed(2).replace(".", "p")}V.csv`;
    files.set(
      `wafers/${EXAMPLE_WAFER}/transport/HB1/${name}`,
      formatSweep({ gate: `${vg.toFixed(2)} V`, temperature: "1.6 K", current: "10 nA", device: "HB1" }, rows),
    );
  }
  return files;
}
