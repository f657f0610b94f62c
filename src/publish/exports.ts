/**
 * Site-wide exports: /results.csv and /results.json (one row per wafer; per
 * metric its value, standard error, limits and verdict, units in the header)
 * and per wafer points.csv (every Hall point of every device). CSV per RFC
 * 4180: comma-separated, fields with a comma, quote or line break quoted,
 * quotes doubled, CRLF line ends. Values in the metric's unit, six significant
 * digits; empty when absent.
 *
 * Spreadsheet safety (OWASP, "CSV Injection"; REFERENCES §17): a text cell
 * that begins with =, +, -, @, tab or carriage return would be run as a
 * formula by a spreadsheet, so it is prefixed with a single quote and quoted.
 * Numbers are written as numbers (a negative number stays -1.5), and a text
 * cell that is exactly a decimal number is left as it is (it cannot run).
 *
 * results.csv columns, in this order (docs/formats.md §7):
 *   wafer, run, grown, reactor, grade, verdict, decision, decision_by, decision_date,
 *   decision_reason, decision_conflict, then per finding finding_<key> (its verdict: pass when
 *   checked and not raised, else the consequence in force), then not_judged (always there, so the
 *   columns after it do not move with the data: "<key>: <reason>; <key>: <reason>" for each metric the
 *   wafer measures but does not judge because a premise of the analysis fails, empty when none), then
 *   per metric <key> [unit], <key>_stderr [unit], <key>_min [unit], <key>_max [unit], <key>_verdict, then, when any wafer records growth
 *   conditions, growth_recipe and one column per growth condition any wafer records (<key> [unit], src/validate/growth.ts growthVariables).
 */
import { METRICS } from "../model/metrics.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import { PER_M2_TO_PER_CM2, M2_PER_VS_TO_CM2_PER_VS } from "../physics/constants.ts";
import { sig6, sig6OrNull } from "../model/format.ts";
import { reactorOf } from "./siteModel.ts";
import type { RunNotes } from "../validate/load/site.ts";
import { metricStdErrors } from "./metricStdErr.ts";
import { decisionConflict } from "../judge/decision.ts";
import { decisionJson } from "./decisionSection.ts";
import { FINDING_KEYS } from "../judge/findings.ts";
import { growthColumns, growthValues } from "./growthSection.ts";

/** A plain decimal number written as text (e.g. "-1.5", "+2e-3"): a spreadsheet reads it as a number, never as a formula. */
const PLAIN_NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/** True when a spreadsheet would treat the text cell as a formula (OWASP "CSV Injection": leading =, +, -, @, tab, CR). */
export function isFormulaLike(s: string): boolean {
  return /^[=+\-@\t\r]/.test(s) && !PLAIN_NUMBER.test(s);
}

export function csvField(v: string | number | null | undefined): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(sig6(v)) : "";
  if (isFormulaLike(v)) return `"'${v.replace(/"/g, '""')}"`;
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

export function toCsv(rows: (string | number | null | undefined)[][]): string {
  return rows.map((r) => r.map(csvField).join(",")).join("\r\n") + "\r\n";
}

/** Metrics that have a value or a limit on at least one wafer, in registry order. */
export function exportedMetrics(outcomes: readonly WaferOutcome[]) {
  return METRICS.filter((m) => outcomes.some((o) => o.judgement.metrics.some((j) => j.key === m.key && (j.value !== undefined || j.target !== undefined))));
}

/** One metric of one wafer as exported: value, standard error, limits of the wafer's grade, verdict. */
export function exportedMetric(o: WaferOutcome, key: string, stdErrs: Record<string, number>) {
  const j = o.judgement.metrics.find((m) => m.key === key);
  return { value: j?.value, stderr: stdErrs[key], min: j?.target?.min, max: j?.target?.max, verdict: j?.verdict ?? "", notJudged: j?.notJudged ?? "" };
}

/**
 * The not_judged cell of a wafer's row: "<key>: <reason>" for each metric it measures but does not
 * judge because a premise of the analysis fails (MetricJudgement.notJudged), in the order of the
 * metric columns, joined by "; "; empty when it judges every metric it measures. One cell whatever
 * the data, so a tool reading columns by position reads the same columns on every site.
 */
export function notJudgedCell(o: WaferOutcome, metrics: readonly { key: string }[]): string {
  const reasons = new Map(o.judgement.metrics.filter((j) => j.notJudged).map((j) => [j.key, j.notJudged!]));
  return metrics
    .filter((m) => reasons.has(m.key))
    .map((m) => `${m.key}: ${reasons.get(m.key)}`)
    .join("; ");
}

/** The per-metric column names, in order, for one metric (see the header comment). */
export function metricColumns(m: { key: string; unit: string }): string[] {
  return [`${m.key} [${m.unit}]`, `${m.key}_stderr [${m.unit}]`, `${m.key}_min [${m.unit}]`, `${m.key}_max [${m.unit}]`, `${m.key}_verdict`];
}

export const DECISION_COLUMNS = ["decision", "decision_by", "decision_date", "decision_reason", "decision_conflict"];

/** One column per finding (judge/findings.ts), so a row says which finding failed a wafer whose metrics all pass. */
export const FINDING_COLUMNS = FINDING_KEYS.map((k) => `finding_${k}`);

function findingCells(o: WaferOutcome): string[] {
  const by = new Map(o.judgement.findings.map((f) => [f.key, f.verdict as string]));
  return FINDING_KEYS.map((k) => by.get(k) ?? "");
}

function decisionCells(o: WaferOutcome): string[] {
  const d = o.record?.decision;
  if (!d) return ["", "", "", "", ""];
  return [d.state, d.by, d.date, d.reason, decisionConflict(d, o.judgement) ?? ""];
}

export function resultsCsv(outcomes: readonly WaferOutcome[], runs: ReadonlyMap<string, RunNotes> = new Map()): string {
  const metrics = exportedMetrics(outcomes);
  const growth = growthColumns(outcomes.map((o) => o.record?.growth));
  // Growth columns only when some wafer records growth conditions: a lab without them keeps its columns.
  const anyGrowth = outcomes.some((o) => o.record?.growth);
  const header = [
    "wafer",
    "run",
    "grown",
    "reactor",
    "grade",
    "verdict",
    ...DECISION_COLUMNS,
    ...FINDING_COLUMNS,
    "not_judged",
    ...metrics.flatMap((m) => metricColumns(m)),
    ...(anyGrowth ? ["growth_recipe", ...growth.map((g) => `${g.key} [${g.unit}]`)] : []),
  ];
  const rows = outcomes.map((o) => {
    const se = metricStdErrors(o);
    const gv = growthValues(o.record?.growth);
    return [
      o.folder,
      o.record?.run ?? "",
      o.record?.grown ?? "",
      reactorOf(o, runs),
      o.judgement.grade,
      o.judgement.verdict,
      ...decisionCells(o),
      ...findingCells(o),
      notJudgedCell(o, metrics),
      ...metrics.flatMap((m) => {
        const x = exportedMetric(o, m.key, se);
        return [x.value, x.stderr, x.min, x.max, x.verdict];
      }),
      ...(anyGrowth ? [o.record?.growth?.recipe ?? "", ...growth.map((g) => gv[g.key] ?? null)] : []),
    ];
  });
  return toCsv([header, ...rows]);
}

export function allResultsJson(
  outcomes: readonly WaferOutcome[],
  meta: { version: string; builtAt: string; dataCommit?: string | null },
  runs: ReadonlyMap<string, RunNotes> = new Map(),
) {
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
      decision: decisionJson(o),
      // Each finding's judged check: its verdict, the consequence in force for the grade, and why.
      findings: Object.fromEntries(o.judgement.findings.map((f) => [f.key, { verdict: f.verdict, consequence: f.consequence, reason: f.reason ?? null }])),
      ...metricMaps(o, metrics),
      growth: growthJson(o),
    })),
  };
}

/** A wafer's growth conditions in results.json: recipe, per-layer and anneal records in their units, and the flat values keyed like the CSV columns; null when not recorded. */
export function growthJson(o: WaferOutcome) {
  const g = o.record?.growth;
  if (!g) return null;
  return {
    recipe: g.recipe ?? null,
    layers: g.layers.map((l) => ({
      layer: l.layer,
      temperature_C: sig6OrNull(l.temperature_C),
      rate_nm_per_min: sig6OrNull(l.rate_nm_per_min),
      pressure_Torr: sig6OrNull(l.pressure_Torr),
      flows_sccm: Object.fromEntries(l.flows_sccm.map(([k, v]) => [k, sig6OrNull(v)])),
    })),
    anneals: g.anneals.map((a) => ({ name: a.name, temperature_C: sig6OrNull(a.temperature_C), time_s: sig6OrNull(a.time_s) })),
    values: growthValues(g),
  };
}

/**
 * The per-metric maps of a wafer in results.json, keyed like the CSV columns: metrics, stderr, limits,
 * verdicts, and not_judged (the analysis's reason a measured value is shown but not judged; null when judged or unmeasured).
 */
function metricMaps(o: WaferOutcome, metrics: readonly { key: string }[]) {
  const se = metricStdErrors(o);
  const xs = metrics.map((m) => [m.key, exportedMetric(o, m.key, se)] as const);
  return {
    metrics: Object.fromEntries(xs.map(([k, x]) => [k, sig6OrNull(x.value)])),
    stderr: Object.fromEntries(xs.map(([k, x]) => [k, sig6OrNull(x.stderr)])),
    limits: Object.fromEntries(xs.map(([k, x]) => [k, { min: sig6OrNull(x.min), max: sig6OrNull(x.max) }])),
    verdicts: Object.fromEntries(xs.map(([k, x]) => [k, x.verdict || null])),
    not_judged: Object.fromEntries(xs.map(([k, x]) => [k, x.notJudged || null])),
  };
}

export function pointsCsv(o: WaferOutcome): string {
  const header = [
    "device",
    "file",
    "gate [V]",
    "density [cm^-2]",
    "mobility [cm^2/(V s)]",
    "sheet_resistance [ohm/sq]",
    "hall_fit_r2",
    "hall_fit_poor",
    "symmetrised",
  ];
  const rows = (o.analysis?.devices ?? []).flatMap((d) =>
    d.points.map((p) => [
      d.id,
      p.file,
      p.gate_V,
      p.density * PER_M2_TO_PER_CM2,
      p.mobility * M2_PER_VS_TO_CM2_PER_VS,
      p.sheetResistance,
      p.hall.r2,
      String(p.hall.poor),
      String(p.symmetrised),
    ]),
  );
  return toCsv([header, ...rows]);
}
