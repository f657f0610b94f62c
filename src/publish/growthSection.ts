/**
 * Page model of a wafer's growth conditions (the `growth:` block of wafer.md,
 * src/validate/growth.ts): one compact table row per layer, one per anneal,
 * every number formatted with its unit here. Also the exports' growth columns.
 */
import type { GrowthConditions } from "../validate/growth.ts";
import { growthVariables } from "../validate/growth.ts";
import { formatNumber } from "./format.ts";
import { sig6OrNull } from "./format.ts";

export interface GrowthSectionModel {
  recipe: string;
  layers: { layer: string; temperature: string; rate: string; pressure: string; flows: string }[];
  anneals: { name: string; temperature: string; time: string }[];
}

const withUnit = (v: number | undefined, unit: string, digits = 3) => (v === undefined ? "" : `${formatNumber(v, digits)} ${unit}`);

/** "20 sccm SiH4 · 20 000 sccm H2" → written per gas with the flow first. */
function flowText(flows: [string, number][]): string {
  return flows.map(([gas, f]) => `${gas} ${f >= 1000 ? `${formatNumber(f / 1000, 3)} slm` : `${formatNumber(f, 3)} sccm`}`).join(" · ");
}

/** A duration in the largest unit that keeps it whole-ish: 600 s → "10 min". */
function timeText(s: number): string {
  if (s >= 3600 && s % 360 === 0) return `${formatNumber(s / 3600, 3)} h`;
  if (s >= 60 && s % 6 === 0) return `${formatNumber(s / 60, 3)} min`;
  return `${formatNumber(s, 3)} s`;
}

export function growthSection(g: GrowthConditions | undefined): GrowthSectionModel | undefined {
  if (!g) return undefined;
  return {
    recipe: g.recipe ?? "",
    layers: g.layers.map((l) => ({ layer: l.layer, temperature: withUnit(l.temperature_C, "°C", 4), rate: withUnit(l.rate_nm_per_min, "nm/min"), pressure: withUnit(l.pressure_Torr, "Torr"), flows: flowText(l.flows_sccm) })),
    anneals: g.anneals.map((a) => ({ name: a.name, temperature: withUnit(a.temperature_C, "°C", 4), time: timeText(a.time_s) })),
  };
}

/** The growth columns of results.csv over all wafers: every variable any wafer has, in first-seen order. */
export function growthColumns(all: readonly (GrowthConditions | undefined)[]): { key: string; unit: string }[] {
  const seen = new Map<string, string>();
  for (const g of all) for (const v of growthVariables(g)) if (!seen.has(v.key)) seen.set(v.key, v.unit);
  return [...seen].map(([key, unit]) => ({ key, unit }));
}

/** A wafer's growth variables as a key → value map (six significant digits), for results.json. */
export function growthValues(g: GrowthConditions | undefined): Record<string, number | null> {
  return Object.fromEntries(growthVariables(g).map((v) => [v.key, sig6OrNull(v.value)]));
}
