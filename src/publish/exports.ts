/**
 * Site-wide exports: /results.csv and /results.json (one row per wafer, one
 * column per metric with its unit in the header) and per wafer points.csv
 * (every Hall point of every device). CSV per RFC 4180: comma-separated,
 * fields with a comma, quote or line break quoted, quotes doubled, CRLF line
 * ends. Values in the metric's unit, six significant digits; empty when absent.
 */
import { METRICS } from "../analyse/metrics.ts";
import type { WaferOutcome } from "../cli/pipeline.ts";
import { PER_M2_TO_PER_CM2, M2_PER_VS_TO_CM2_PER_VS } from "../physics/constants.ts";
import { sig6, sig6OrNull } from "./format.ts";
import { reactorOf } from "./siteModel.ts";
import type { RunNotes } from "../read/site.ts";

export function csvField(v: string | number | null | undefined): string {
  if (v === null || v === undefined) return "";
  const s = typeof v === "number" ? (Number.isFinite(v) ? String(sig6(v)) : "") : v;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function toCsv(rows: (string | number | null | undefined)[][]): string {
  return rows.map((r) => r.map(csvField).join(",")).join("\r\n") + "\r\n";
}

/** Metrics that have a value on at least one wafer, in registry order. */
export function exportedMetrics(outcomes: readonly WaferOutcome[]) {
  return METRICS.filter((m) => outcomes.some((o) => o.judgement.metrics.some((j) => j.key === m.key && j.value !== undefined)));
}

const value = (o: WaferOutcome, key: string) => o.judgement.metrics.find((m) => m.key === key)?.value;

export function resultsCsv(outcomes: readonly WaferOutcome[], runs: ReadonlyMap<string, RunNotes> = new Map()): string {
  const metrics = exportedMetrics(outcomes);
  const header = ["wafer", "run", "grown", "reactor", "grade", "verdict", ...metrics.map((m) => `${m.key} [${m.unit}]`)];
  const rows = outcomes.map((o) => [o.folder, o.record?.run ?? "", o.record?.grown ?? "", reactorOf(o, runs), o.judgement.grade, o.judgement.verdict, ...metrics.map((m) => value(o, m.key))]);
  return toCsv([header, ...rows]);
}

export function allResultsJson(outcomes: readonly WaferOutcome[], meta: { version: string; builtAt: string; dataCommit?: string | null }, runs: ReadonlyMap<string, RunNotes> = new Map()) {
  const metrics = exportedMetrics(outcomes);
  return {
    waferbookVersion: meta.version,
    // No build time here: the footer "Built …" line is the one place a build's output varies (DEVELOPERS.md).
    dataCommit: meta.dataCommit ?? null,
    units: Object.fromEntries(metrics.map((m) => [m.key, m.unit])),
    wafers: outcomes.map((o) => ({
      wafer: o.folder,
      run: o.record?.run ?? null,
      grown: o.record?.grown ?? null,
      reactor: reactorOf(o, runs) || null,
      grade: o.judgement.grade,
      verdict: o.judgement.verdict,
      reasons: o.judgement.reasons,
      metrics: Object.fromEntries(metrics.map((m) => {
        const v = value(o, m.key);
        return [m.key, sig6OrNull(v)];
      })),
    })),
  };
}

export function pointsCsv(o: WaferOutcome): string {
  const header = ["device", "file", "gate [V]", "density [cm^-2]", "mobility [cm^2/(V s)]", "sheet_resistance [ohm/sq]", "hall_fit_r2", "hall_fit_poor", "symmetrised"];
  const rows = (o.analysis?.devices ?? []).flatMap((d) => d.points.map((p) => [d.id, p.file, p.gate_V, p.density * PER_M2_TO_PER_CM2, p.mobility * M2_PER_VS_TO_CM2_PER_VS, p.sheetResistance, p.hall.r2, String(p.hall.poor), String(p.symmetrised)]));
  return toCsv([header, ...rows]);
}
