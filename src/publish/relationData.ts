/**
 * Data of the relation page (relation/): every wafer's judged metric values
 * (in the metric's unit) and numeric growth conditions (src/validate/growth.ts),
 * with its run, reactor, grade, growth date and verdict, and the list of
 * variables a chart axis may show. Built from the slim outcomes; embedded in
 * the page as a JSON block that assets/relation.js reads (works from disk).
 */
import { METRICS } from "../model/metrics.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import { growthVariables } from "../validate/growth.ts";
import { jsonForScript } from "./charts.ts";
import { prettyUnit, sig6OrNull } from "../model/format.ts";

export interface RelationVariable {
  key: string;
  label: string;
  unit: string;
  group: "metric" | "growth";
  /** Plotted and fitted on a log axis (the metric registry's `axis`, src/model/metricScale.ts); growth conditions are linear. */
  log: boolean;
}

/** `reactorOf`: the wafer's reactor, from its record or its run notes (siteModel.ts). */
export function relationModel(sorted: readonly WaferOutcome[], reactorOf: (o: WaferOutcome) => string) {
  const variables: RelationVariable[] = [];
  const seen = new Set<string>();
  for (const m of METRICS) {
    if (sorted.some((o) => o.judgement.metrics.some((j) => j.key === m.key && j.value !== undefined))) {
      variables.push({ key: m.key, label: m.label, unit: prettyUnit(m.unit), group: "metric", log: m.axis === "log" });
      seen.add(m.key);
    }
  }
  for (const o of sorted) {
    for (const v of growthVariables(o.record?.growth)) {
      if (seen.has(v.key)) continue;
      seen.add(v.key);
      variables.push({ key: v.key, label: v.label, unit: v.unit, group: "growth", log: false });
    }
  }
  const wafers = sorted.map((o) => {
    const values: Record<string, number | null> = {};
    for (const j of o.judgement.metrics) if (j.value !== undefined) values[j.key] = sig6OrNull(j.value);
    for (const v of growthVariables(o.record?.growth)) values[v.key] = sig6OrNull(v.value);
    return {
      id: o.folder,
      run: o.record?.run ?? "",
      reactor: reactorOf(o),
      grade: o.judgement.grade,
      grown: o.record?.grown ?? "",
      verdict: o.judgement.verdict,
      values,
    };
  });
  const choices = (f: (w: (typeof wafers)[number]) => string) => [...new Set(wafers.map(f).filter(Boolean))].sort();
  return {
    variables,
    runs: choices((w) => w.run),
    reactors: choices((w) => w.reactor),
    grades: choices((w) => w.grade),
    json: jsonForScript({ variables, wafers }),
  };
}
