/**
 * Page models of /trends/ and /trends/<metric>/: each metric against growth
 * date as an individuals control chart (src/judge/trends.ts), grouped by run
 * and by reactor, with flagged points linking to their wafers and a table
 * alternative. Numbers are formatted here; templates only place strings.
 */
import { siteUrl } from "./siteUrl.ts";
import { METRICS, type MetricSpec } from "../analyse/metrics.ts";
import { describeBaseline, trendChart, type Trend, type TrendInput, type TrendPoint } from "../judge/trends.ts";
import type { Targets } from "../validate/targets.ts";
import { DEFAULT_TREND_SETTINGS } from "../validate/trendSettings.ts";
import { jsonForScript, markerSeries, type ChartSeries, type ChartSpec } from "./charts.ts";
import { formatNumber, formatValue, prettyUnit, sig6 } from "./format.ts";

/** One wafer's values, as the site model knows them. */
export interface TrendWafer {
  id: string;
  grown: string;
  run: string;
  reactor: string;
  /** Metric key → the value judged (aggregated over devices), in the metric's unit. */
  values: Record<string, number | undefined>;
}

const ROLES = ["data", "second", "third", "fit"] as const;

/** Days since 1970-01-01 (UTC) for an ISO date, the x value of a dated chart. */
export function dayNumber(date: string): number {
  return Math.round(Date.parse(date.slice(0, 10)) / 86400000);
}

function groupSeries(points: TrendPoint[], keyOf: (p: TrendPoint) => string, name: string, href: (id: string) => string): ChartSeries[] {
  const groups = [...new Set(points.map(keyOf))].sort();
  return groups.map((g, i) => {
    const mine = points.filter((p) => keyOf(p) === g);
    const s = markerSeries(`${name} ${g || "(not recorded)"}`, mine.map((p) => [dayNumber(p.date), p.value]), ROLES[i % ROLES.length]);
    s.links = mine.map((p) => href(p.id));
    s.tips = mine.map((p) => `${p.id} · run ${p.run || "—"}${p.reactor ? ` · reactor ${p.reactor}` : ""}${p.rules.length ? ` · flagged: ${p.why}` : ""}`);
    return s;
  });
}

function limitLines(t: Trend & { ok: true }, x0: number, x1: number): ChartSeries[] {
  const l = t.limits;
  const line = (label: string, y: number, role: ChartSeries["role"]): ChartSeries => ({ label, points: [[x0, y], [x1, y]].map(([a, b]) => [a, sig6(b)]) as [number, number][], line: true, role });
  return [line("centre line", l.centreLine, "reference"), line("UCL (+3σ)", l.ucl, "fit"), line("LCL (−3σ)", l.lcl, "fit")];
}

function trendCharts(spec: MetricSpec, t: Trend, targets: Targets | undefined, href: (id: string) => string): ChartSpec[] {
  if (!t.ok) return [];
  const xs = t.points.map((p) => dayNumber(p.date));
  const [x0, x1] = [Math.min(...xs) - 5, Math.max(...xs) + 5];
  const unit = prettyUnit(spec.unit);
  const flagged = t.points.filter((p) => p.rules.length);
  const flagSeries: ChartSeries[] = flagged.length ? [{ ...markerSeries("flagged by a rule", flagged.map((p) => [dayNumber(p.date), p.value]), "flag"), links: flagged.map((p) => href(p.id)), tips: flagged.map((p) => `${p.id}: ${p.why}`) }] : [];
  const target = targets?.grades[targets.defaultGrade]?.[spec.key];
  const limits = target ? [{ axis: "y" as const, min: target.min, max: target.max, label: `target (${targets!.defaultGrade})` }] : undefined;
  const summary = `${t.points.length} wafers; centre line ${formatValue(t.limits.centreLine, spec)}, control limits ${formatValue(t.limits.lcl, spec)} to ${formatValue(t.limits.ucl, spec)}; ${flagged.length} point(s) flagged${flagged.length ? `: ${flagged.map((p) => p.id).join(", ")}` : ""}. The table below lists every point.`;
  const base = { x: { label: "Growth date", dates: true }, y: { label: `${spec.label}${unit ? ` (${unit})` : ""}` }, limits };
  const charts: ChartSpec[] = [{ id: `trend-${spec.key}-run`, title: `${spec.label} by growth date, grouped by run`, ...base, series: [...groupSeries(t.points, (p) => p.run ?? "", "run", href), ...flagSeries, ...limitLines(t, x0, x1)], summary }];
  if (t.points.some((p) => p.reactor)) {
    charts.push({ id: `trend-${spec.key}-reactor`, title: `${spec.label} by growth date, grouped by reactor`, ...base, series: [...groupSeries(t.points, (p) => p.reactor ?? "", "reactor", href), ...flagSeries, ...limitLines(t, x0, x1)], summary });
  }
  return charts;
}

/** Builds the trend index and one page per metric with at least one value. */
export function trendsModel(wafers: readonly TrendWafer[], targets: Targets | undefined, basePath: string) {
  const settings = targets?.trends ?? DEFAULT_TREND_SETTINGS;
  const pages = [];
  for (const spec of METRICS) {
    const href = (id: string) => siteUrl(`wafers/${id}/`, `/trends/${spec.key}/`, basePath);
    const inputs: TrendInput[] = wafers.filter((w) => w.values[spec.key] !== undefined && w.grown).map((w) => ({ id: w.id, date: w.grown, run: w.run, reactor: w.reactor, value: w.values[spec.key]! }));
    if (inputs.length === 0) continue;
    const t = trendChart(inputs, settings);
    const fmt = (v: number) => formatValue(v, spec);
    const charts = trendCharts(spec, t, targets, href);
    pages.push({
      key: spec.key,
      label: spec.label,
      unit: prettyUnit(spec.unit) || "(no unit)",
      description: spec.description,
      ok: t.ok,
      reason: t.ok ? "" : t.reason,
      baseline: t.baselineText,
      runLength: settings.runLength,
      limits: t.ok ? [
        { label: "Centre line (baseline mean)", value: fmt(t.limits.centreLine) },
        { label: "σ̂ = MR̄/1.128", value: fmt(t.limits.sigma) },
        { label: "Upper control limit (+3σ̂)", value: fmt(t.limits.ucl) },
        { label: "Lower control limit (−3σ̂)", value: fmt(t.limits.lcl) },
        { label: "Baseline points", value: String(t.limits.baseline.count) },
      ] : [],
      n: t.points.length,
      flagged: t.ok ? t.flagged : 0,
      centre: t.ok ? fmt(t.limits.centreLine) : "—",
      band: t.ok ? `${fmt(t.limits.lcl)} … ${fmt(t.limits.ucl)}` : "—",
      charts,
      chartsJson: jsonForScript(charts),
      rows: t.points.map((p) => ({
        id: p.id,
        href: href(p.id),
        date: p.date,
        run: p.run ?? "",
        reactor: p.reactor ?? "",
        value: fmt(p.value),
        z: p.z === null ? "—" : formatNumber(p.z, 2),
        baseline: p.inBaseline,
        flagged: p.rules.length > 0,
        rules: p.rules.join(", "),
        why: p.why,
      })),
    });
  }
  return { pages, baseline: describeBaseline(settings), runLength: settings.runLength, flaggedTotal: pages.reduce((a, p) => a + p.flagged, 0) };
}

export type TrendsModel = ReturnType<typeof trendsModel>;
