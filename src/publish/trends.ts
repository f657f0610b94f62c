/**
 * Page models of /trends/ and /trends/<metric>/: each metric against growth
 * date as an individuals control chart (src/judge/trends.ts), grouped by run
 * and by reactor, with flagged points linking to their wafers and a table
 * alternative. Numbers are formatted here; templates only place strings.
 */
import { siteUrl } from "./siteUrl.ts";
import { METRIC_BY_KEY, METRICS, type MetricSpec } from "../model/metrics.ts";
import { describeBaseline, orderByDate, trendGroups, type Trend, type TrendInput, type TrendPoint } from "../judge/trends.ts";
import { DEFAULT_MAX_PASSES, ROUGH_BASELINE_BELOW } from "../judge/phaseOne.ts";
import type { Targets } from "../validate/targets.ts";
import { DEFAULT_TREND_SETTINGS } from "../validate/trendSettings.ts";
import { jsonForScript, markerSeries, SERIES_ROLES, type ChartSeries, type ChartSpec } from "./charts.ts";
import { countText, formatNumber, formatValue, prettyUnit, sig6 } from "../model/format.ts";

/** One wafer's values, as the site model knows them. */
export interface TrendWafer {
  id: string;
  grown: string;
  run: string;
  reactor: string;
  /** The wafer's grade and verdict: error wafers and non-production grades stay out of the baseline. */
  grade?: string;
  verdict?: string;
  /** Metric key → the value judged (aggregated over devices), in the metric's unit. */
  values: Record<string, number | undefined>;
}

const ROLES = SERIES_ROLES;

/** Days since 1970-01-01 (UTC) for an ISO date, the x value of a dated chart. */
export function dayNumber(date: string): number {
  return Math.round(Date.parse(date.slice(0, 10)) / 86400000);
}

function groupSeries(points: TrendPoint[], keyOf: (p: TrendPoint) => string, name: string, href: (id: string) => string): ChartSeries[] {
  const groups = [...new Set(points.map(keyOf))].sort();
  return groups.map((g, i) => {
    const mine = points.filter((p) => keyOf(p) === g);
    const s = markerSeries(
      `${name} ${g || "(not recorded)"}`,
      mine.map((p) => [dayNumber(p.date), p.value]),
      ROLES[i % ROLES.length],
    );
    s.links = mine.map((p) => href(p.id));
    s.tips = mine.map((p) => `${p.id} · run ${p.run || "—"}${p.reactor ? ` · reactor ${p.reactor}` : ""}${p.rules.length ? ` · flagged: ${p.why}` : ""}`);
    return s;
  });
}

function limitLines(t: Trend & { ok: true }, x0: number, x1: number, suffix: string): ChartSeries[] {
  const l = t.limits;
  const line = (label: string, y: number, role: ChartSeries["role"]): ChartSeries => ({
    label: label + suffix,
    points: [
      [x0, y],
      [x1, y],
    ].map(([a, b]) => [a, sig6(b)]) as [number, number][],
    line: true,
    role,
  });
  return [
    line("centre line", l.centreLine, "reference"),
    line(t.clipped?.ucl !== undefined ? "UCL (clipped at the natural bound)" : "UCL (+3σ)", l.ucl, "fit"),
    line(t.clipped?.lcl !== undefined ? "LCL (clipped at the natural bound)" : "LCL (−3σ)", l.lcl, "fit"),
  ];
}

const groupName = (by: string, g: string) => (by === "none" ? "" : `${by} ${g || "(not recorded)"}`);

function trendCharts(spec: MetricSpec, groups: Trend[], by: string, targets: Targets | undefined, href: (id: string) => string): ChartSpec[] {
  const all = groups.flatMap((t) => t.points);
  if (!groups.some((t) => t.ok) || all.length === 0) return [];
  const xs = all.map((p) => dayNumber(p.date));
  const [x0, x1] = [Math.min(...xs) - 5, Math.max(...xs) + 5];
  const unit = prettyUnit(spec.unit);
  const judged = all.filter((p) => p.role !== "left-out");
  const flagged = all.filter((p) => p.rules.length);
  const left = all.filter((p) => p.role === "left-out");
  const dropped = all.filter((p) => p.role === "dropped");
  const overlay: ChartSeries[] = [
    ...(flagged.length
      ? [
          {
            ...markerSeries(
              "flagged by a rule",
              flagged.map((p) => [dayNumber(p.date), p.value]),
            ),
            role: "flag" as const,
            links: flagged.map((p) => href(p.id)),
            tips: flagged.map((p) => `${p.id}: ${p.why}`),
          },
        ]
      : []),
    ...(dropped.length
      ? [
          {
            ...markerSeries(
              "dropped from the baseline (Phase I)",
              dropped.map((p) => [dayNumber(p.date), p.value]),
              "reference",
            ),
            links: dropped.map((p) => href(p.id)),
            tips: dropped.map((p) => `${p.id}: ${p.note}`),
          },
        ]
      : []),
    ...(left.length
      ? [
          {
            ...markerSeries(
              "left out of the baseline and the rules",
              left.map((p) => [dayNumber(p.date), p.value]),
              "muted",
            ),
            links: left.map((p) => href(p.id)),
            tips: left.map((p) => `${p.id}: ${p.note}`),
          },
        ]
      : []),
  ];
  // Separate limits are drawn over their own group's dates only (±5 days), one set over the whole chart.
  const span = (t: Trend): [number, number] => {
    const d = t.points.map((p) => dayNumber(p.date));
    return by === "none" || d.length === 0 ? [x0, x1] : [Math.min(...d) - 5, Math.max(...d) + 5];
  };
  const lines = groups.flatMap((t) => (t.ok ? limitLines(t, ...span(t), by === "none" ? "" : ` (${groupName(by, t.group)})`) : []));
  const target = targets?.grades[targets.defaultGrade]?.[spec.key];
  const limits = target ? [{ axis: "y" as const, min: target.min, max: target.max, label: `target (${targets!.defaultGrade})` }] : undefined;
  const limitText = groups
    .map(
      (t) =>
        `${by === "none" ? "" : `${groupName(by, t.group)}: `}${t.ok ? `centre line ${formatValue(t.limits.centreLine, spec)}, control limits ${formatValue(t.limits.lcl, spec)} to ${formatValue(t.limits.ucl, spec)}` : `no limits (${t.reason})`}`,
    )
    .join("; ");
  const summary = `${countText(all.length, "wafer")}; ${limitText}; ${countText(flagged.length, "point")} flagged${flagged.length ? `: ${flagged.map((p) => p.id).join(", ")}` : ""}${left.length ? `; ${left.length} left out` : ""}. The table below lists every point.`;
  const base = { x: { label: "Growth date", dates: true }, y: { label: `${spec.label}${unit ? ` (${unit})` : ""}` }, limits };
  const charts: ChartSpec[] = [
    {
      id: `trend-${spec.key}-run`,
      title: `${spec.label} by growth date, grouped by run`,
      ...base,
      series: [...groupSeries(judged, (p) => p.run ?? "", "run", href), ...overlay, ...lines],
      summary,
    },
  ];
  if (all.some((p) => p.reactor)) {
    charts.push({
      id: `trend-${spec.key}-reactor`,
      title: `${spec.label} by growth date, grouped by reactor`,
      ...base,
      series: [...groupSeries(judged, (p) => p.reactor ?? "", "reactor", href), ...overlay, ...lines],
      summary,
    });
  }
  return charts;
}

/** The grades whose wafers may form a baseline (null: every grade). */
export function productionGrades(targets: Targets | undefined): Set<string> | null {
  const p = targets?.trends?.productionGrades ?? { kind: "default" as const };
  if (!targets || p.kind === "all") return null;
  return new Set(p.kind === "list" ? p.grades : [targets.defaultGrade]);
}

/** Plain words for the production-grade setting. */
export function describeProduction(targets: Targets | undefined): string {
  const set = productionGrades(targets);
  return set ? `grade${set.size > 1 ? "s" : ""} ${[...set].join(", ")}` : "every grade";
}

function groupModel(t: Trend, spec: MetricSpec, by: string, href: (id: string) => string) {
  const fmt = (v: number) => formatValue(v, spec);
  const bound = (which: "lcl" | "ucl") =>
    t.ok && t.clipped?.[which] !== undefined ? ` — clipped at the natural bound; the formula gives ${fmt(t.clipped[which]!)}` : "";
  return {
    name: groupName(by, t.group) || "all wafers",
    ok: t.ok,
    reason: t.ok ? "" : t.reason,
    limits: t.ok
      ? [
          { label: "Centre line (baseline mean)", value: fmt(t.limits.centreLine) },
          { label: "σ̂ = MR̄/1.128", value: fmt(t.limits.sigma) },
          { label: "Upper control limit (+3σ̂)", value: fmt(t.limits.ucl) + bound("ucl") },
          { label: "Lower control limit (−3σ̂)", value: fmt(t.limits.lcl) + bound("lcl") },
          {
            label: "Baseline points kept",
            value:
              String(t.limits.baseline.count) + (t.limits.baseline.count < ROUGH_BASELINE_BELOW ? ` (fewer than ${ROUGH_BASELINE_BELOW}: rough limits)` : ""),
          },
          {
            label: "Phase I revisions",
            value: t.passes === 0 ? "none needed" : `${t.passes}${t.stoppedAtLimit ? " (stopped at max_passes with points still beyond the limits)" : ""}`,
          },
        ]
      : [],
    dropped: t.dropped.map((d) => ({
      id: d.id,
      href: href(d.id),
      value: fmt(d.value),
      pass: d.pass,
      side: d.side === "above" ? "above the upper" : "below the lower",
    })),
  };
}

/** Builds the trend index and one page per metric with at least one value. */
export function trendsModel(wafers: readonly TrendWafer[], targets: Targets | undefined, basePath: string) {
  const settings = targets?.trends ?? DEFAULT_TREND_SETTINGS;
  const by = settings.limitsBy ?? "none";
  const production = productionGrades(targets);
  const pages = [];
  for (const spec of METRICS) {
    const href = (id: string) => siteUrl(`wafers/${id}/`, `/trends/${spec.key}/`, basePath);
    const inputs: TrendInput[] = wafers
      .filter((w) => w.values[spec.key] !== undefined && w.grown)
      .map((w) => ({ id: w.id, date: w.grown, run: w.run, reactor: w.reactor, value: w.values[spec.key]!, grade: w.grade, error: w.verdict === "error" }));
    if (inputs.length === 0) continue;
    const groups = trendGroups(inputs, settings, { metric: spec.key, productionGrades: production, bounds: spec.bounds, group: "" });
    const points = orderByDate(groups.flatMap((t) => t.points));
    const fmt = (v: number) => formatValue(v, spec);
    const charts = trendCharts(spec, groups, by, targets, href);
    const one = groups.length === 1 ? groups[0] : undefined;
    const flagged = points.filter((p) => p.rules.length).length;
    const zOf = (p: TrendPoint) => (p.z === null ? "—" : formatNumber(p.z, 2));
    pages.push({
      key: spec.key,
      label: spec.label,
      unit: prettyUnit(spec.unit) || "(no unit)",
      description: spec.description,
      ok: groups.some((t) => t.ok),
      reason: groups
        .filter((t) => !t.ok)
        .map((t) => `${by === "none" ? "" : `${groupName(by, t.group)}: `}${t.ok ? "" : t.reason}`)
        .join("; "),
      baseline: describeBaseline(settings),
      runLength: settings.runLength,
      groups: groups.map((t) => groupModel(t, spec, by, href)),
      limits: one ? groupModel(one, spec, by, href).limits : [],
      n: points.length,
      flagged,
      leftOut: points.filter((p) => p.role === "left-out").length,
      droppedCount: points.filter((p) => p.role === "dropped").length,
      centre: one?.ok ? fmt(one.limits.centreLine) : one ? "—" : `per ${by}`,
      band: one?.ok ? `${fmt(one.limits.lcl)} … ${fmt(one.limits.ucl)}` : one ? "—" : `per ${by}`,
      charts,
      chartsJson: jsonForScript(charts),
      rows: points.map((p) => ({
        id: p.id,
        href: href(p.id),
        date: p.date,
        run: p.run ?? "",
        reactor: p.reactor ?? "",
        grade: p.grade ?? "",
        value: fmt(p.value),
        z: zOf(p),
        baseline: p.inBaseline,
        role: ROLE_TEXT[p.role],
        note: p.note,
        flagged: p.rules.length > 0,
        rules: p.rules.join(", "),
        why: p.why,
      })),
    });
  }
  const exclusions = (settings.exclude ?? []).map((e) => ({
    wafer: e.wafer,
    href: wafers.some((w) => w.id === e.wafer) ? siteUrl(`wafers/${e.wafer}/`, "/trends/", basePath) : "",
    metric: e.metric ? (METRIC_BY_KEY.get(e.metric)?.label ?? e.metric) : "every metric",
    reason: e.reason,
  }));
  return {
    pages,
    baseline: describeBaseline(settings),
    runLength: settings.runLength,
    production: describeProduction(targets),
    maxPasses: settings.maxPasses ?? DEFAULT_MAX_PASSES,
    limitsBy: by === "none" ? "one set of limits for all wafers" : `separate limits per ${by}`,
    exclusions,
    flaggedTotal: pages.reduce((a, p) => a + p.flagged, 0),
  };
}

const ROLE_TEXT: Record<TrendPoint["role"], string> = { baseline: "baseline", dropped: "dropped (Phase I)", monitored: "judged", "left-out": "left out" };

export type TrendsModel = ReturnType<typeof trendsModel>;
