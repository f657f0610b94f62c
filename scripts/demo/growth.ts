/**
 * Invented growth conditions of the demo wafers (the `growth:` block of
 * wafer.md). Deterministic, no random draws, so the raw files the generator
 * writes do not change. The well temperature follows the run's recipe, and a
 * wafer grown warmer than its recipe (a drifting susceptor thermocouple, the
 * story of TQ-2403 and TQ-2504) gets the broader interfaces and lower
 * mobility its data show. The Si growth rate from silane follows an Arrhenius
 * law with an activation energy of about 2 eV (common practice for the
 * kinetically limited regime; the number is illustrative, from memory).
 */
import type { DemoWafer } from "../generate-demo.ts";

interface RunRecipe {
  recipe: string;
  wellC: number;
  barrierC: number;
  /** Well growth rate at 625 °C, nm/min, and barrier rate, nm/min. */
  wellRate625: number;
  barrierRate: number;
  pressureTorr: number;
  silane: number;
  germane: number;
  capAnneal: boolean;
}

const RECIPES: Record<string, RunRecipe> = {
  "TQ24-A": {
    recipe: "HRN-QW650-r1",
    wellC: 650,
    barrierC: 650,
    wellRate625: 1.2,
    barrierRate: 9.0,
    pressureTorr: 20,
    silane: 20,
    germane: 4.5,
    capAnneal: false,
  },
  "TQ24-B": {
    recipe: "HRN-QW625-r2",
    wellC: 625,
    barrierC: 650,
    wellRate625: 1.2,
    barrierRate: 9.0,
    pressureTorr: 20,
    silane: 20,
    germane: 4.5,
    capAnneal: true,
  },
  "TQ25-A": {
    recipe: "KTE-QW625-r1",
    wellC: 625,
    barrierC: 640,
    wellRate625: 1.4,
    barrierRate: 10.5,
    pressureTorr: 15,
    silane: 18,
    germane: 4.2,
    capAnneal: true,
  },
  "TQ25-B": {
    recipe: "KTE-QW625-r2-8nm",
    wellC: 625,
    barrierC: 640,
    wellRate625: 1.4,
    barrierRate: 10.5,
    pressureTorr: 15,
    silane: 18,
    germane: 4.2,
    capAnneal: true,
  },
};

/** Degrees above the recipe's well temperature: the drifting thermocouple of the broad-interface wafers, and a little with the mobility shortfall. */
const DRIFT_C: Record<string, number> = { "TQ-2403": 14, "TQ-2504": 12, "TQ-2406": 9 };

const BOLTZMANN_EV_PER_K = 8.617333262e-5;

function fixed(v: number, digits: number): string {
  return String(Number(v.toFixed(digits)));
}

/** The growth: block of a demo wafer's front matter. */
export function growthBlock(w: DemoWafer): string {
  const r = RECIPES[w.run];
  const shortfall = Math.max(0, Math.round(((1.3e5 - w.peakMobility) / 1e4) * 2));
  const wellC = r.wellC + (DRIFT_C[w.id] ?? shortfall);
  const arrhenius = Math.exp((-2.0 / BOLTZMANN_EV_PER_K) * (1 / (wellC + 273.15) - 1 / (625 + 273.15)));
  const wellRate = r.wellRate625 * arrhenius;
  const flows = (ge: number) => `{ SiH4: "${r.silane} sccm"${ge ? `, GeH4: "${ge} sccm"` : ""}, H2: "20 slm" }`;
  const p = `pressure: "${r.pressureTorr} Torr"`;
  const lines = [
    "growth:",
    `  recipe: "${r.recipe}"`,
    "  layers:",
    `    - { layer: graded buffer, temperature: "800 °C", rate: "30 nm/min", ${p}, flows: ${flows(r.germane)} }`,
    `    - { layer: lower barrier, temperature: "${r.barrierC} °C", rate: "${fixed(r.barrierRate, 2)} nm/min", ${p}, flows: ${flows(r.germane)} }`,
    `    - { layer: well, temperature: "${wellC} °C", rate: "${fixed(wellRate, 2)} nm/min", ${p}, flows: ${flows(0)} }`,
    `    - { layer: upper barrier, temperature: "${r.barrierC} °C", rate: "${fixed(r.barrierRate, 2)} nm/min", ${p}, flows: ${flows(r.germane)} }`,
    `    - { layer: cap, temperature: "600 °C", rate: "0.6 nm/min", ${p}, flows: ${flows(0)} }`,
    "  anneals:",
    `    - { name: buffer, temperature: "850 °C", time: "10 min" }`,
  ];
  if (r.capAnneal) lines.push(`    - { name: cap oxide, temperature: "400 °C", time: "30 min" }`);
  return lines.join("\n");
}
