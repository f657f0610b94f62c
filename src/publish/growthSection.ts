/**
 * Page model of a wafer's growth conditions (the `growth:` block of wafer.md,
 * src/validate/growth.ts): one compact table row per layer, one per anneal,
 * every number formatted with its unit here. Also the exports' growth columns.
 */
import type { GrowthConditions } from "../validate/growth.ts";
import { growthVariables } from "../validate/growth.ts";
import { sig6OrNull } from "../model/format.ts";

/** A recorded condition as growers write it: up to 4 significant digits, no padding zeros ("625", "4.5", "0.6"). */
function asRecorded(v: number, digits = 4): string {
  return String(Number(v.toPrecision(digits)));
}

export interface GrowthSectionModel {
  recipe: string;
  layers: { layer: string; temperature: string; rate: string; pressure: string; flows: string }[];
  anneals: { name: string; temperature: string; time: string }[];
}

const withUnit = (v: number | undefined, unit: string, digits = 4) => (v === undefined ? "" : `${asRecorded(v, digits)} ${unit}`);

/** "SiH4 20 sccm · H2 20 slm": per gas, flows of 1000 sccm and more in slm. */
function flowText(flows: [string, number][]): string {
  return flows.map(([gas, f]) => `${gas} ${f >= 1000 ? `${asRecorded(f / 1000)} slm` : `${asRecorded(f)} sccm`}`).join(" · ");
}

/** A duration in the largest unit that keeps it whole-ish: 600 s → "10 min". */
function timeText(s: number): string {
  if (s >= 3600 && s % 360 === 0) return `${asRecorded(s / 3600)} h`;
  if (s >= 60 && s % 6 === 0) return `${asRecorded(s / 60)} min`;
  return `${asRecorded(s)} s`;
}

export function growthSection(g: GrowthConditions | undefined): GrowthSectionModel | undefined {
  if (!g) return undefined;
  return {
    recipe: g.recipe ?? "",
    layers: g.layers.map((l) => ({
      layer: l.layer,
      temperature: withUnit(l.temperature_C, "°C"),
      rate: withUnit(l.rate_nm_per_min, "nm/min"),
      pressure: withUnit(l.pressure_Torr, "Torr"),
      flows: flowText(l.flows_sccm),
    })),
    anneals: g.anneals.map((a) => ({ name: a.name, temperature: withUnit(a.temperature_C, "°C"), time: timeText(a.time_s) })),
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
