/**
 * Builds the plain page model and results.json for one wafer. Every number is
 * rounded and given its unit here; templates only place strings.
 */
import { decisionModel } from "./decisionSection.ts";
import { PER_M2_TO_PER_CM2, M2_PER_VS_TO_CM2_PER_VS } from "../physics/constants.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { MetricJudgement, Verdict } from "../judge/verdict.ts";
import { formatProblem } from "../model/problem.ts";
import { formatNumber, formatValue, microSign, prettyUnit } from "../model/format.ts";
import { chartDataJson, markerSeries, SERIES_ROLES, type ChartSpec } from "./charts.ts";
import { traceChart } from "./traceViews.ts";
import { pageIndex } from "./pageIndex.ts";
import { renderNotes } from "./markdown.ts";
import { rawCopyHref } from "./rawCopies.ts";
import { structureSection } from "./structureSection.ts";
import { imagesSection } from "./imagesSection.ts";
import { transportDepthSection } from "./transportDepthSection.ts";
import { uniformitySection } from "./uniformitySection.ts";
import { checkTable, verdictLegend } from "./judgedRows.ts";
import { growthSection } from "./growthSection.ts";
import { deviceConditions } from "./conditionSources.ts";

export interface MetricRow {
  key: string;
  label: string;
  value: string;
  target: string;
  verdict: Verdict;
  reason: string;
  perDevice: string;
  description: string;
}

export function metricRow(m: MetricJudgement): MetricRow {
  const per = Object.entries(m.perDevice);
  return {
    key: m.key,
    label: m.spec.label,
    value: formatValue(m.value, m.spec),
    target: m.target ? targetText(m) : "—",
    verdict: m.verdict,
    reason: m.reason ?? "",
    perDevice: per.length > 1 ? per.map(([id, v]) => `${id}: ${formatNumber(v, m.spec.digits)}`).join(" · ") : "",
    description: m.spec.description,
  };
}

/** "≥ 1.00×10⁵ cm²/(V s) (max over devices, required, guard 5 %)" */
export function targetText(m: MetricJudgement): string {
  const t = m.target!;
  const f = (v: number) => formatValue(v, m.spec);
  const limit = t.min !== undefined && t.max !== undefined ? `${f(t.min)} … ${f(t.max)}` : t.min !== undefined ? `≥ ${f(t.min)}` : `≤ ${f(t.max!)}`;
  const notes = [
    t.aggregate !== "mean" ? (t.aggregate === "every-device" ? "every device" : `${t.aggregate} over devices`) : "",
    t.required ? "required" : "",
    t.guardText ? `guard ${t.guardText}` : "",
  ].filter(Boolean);
  return notes.length ? `${limit} (${notes.join(", ")})` : limit;
}

export function waferCharts(o: WaferOutcome): ChartSpec[] {
  const charts: ChartSpec[] = [];
  const devices = o.analysis?.devices ?? [];
  const withPoints = devices.filter((d) => d.points.length);
  if (withPoints.length === 0) return charts;
  const roles = SERIES_ROLES;
  charts.push({
    id: "density-vs-gate",
    title: "Hall density against gate voltage",
    x: { label: "Gate voltage Vg (V)" },
    y: { label: "Sheet density n (10¹¹ cm⁻²)" },
    series: withPoints.map((d, i) =>
      markerSeries(
        d.id,
        d.points.map((p) => [p.gate_V, (p.density * PER_M2_TO_PER_CM2) / 1e11]),
        roles[i % roles.length],
      ),
    ),
    summary: withPoints
      .map(
        (d) =>
          `${d.id}: ${d.points.length} gate voltages, density ${formatNumber((d.points[0].density * 1e-4) / 1e11)}–${formatNumber((d.points[d.points.length - 1].density * 1e-4) / 1e11)} ×10¹¹ cm⁻²`,
      )
      .join("; "),
  });
  charts.push({
    id: "mobility-vs-density",
    title: "Hall mobility against density",
    x: { label: "Sheet density n (cm⁻²)", log: true },
    y: { label: "Hall mobility μ (cm²/V s)", log: true },
    series: withPoints.map((d, i) =>
      markerSeries(
        d.id,
        d.points.map((p) => [p.density * PER_M2_TO_PER_CM2, p.mobility * M2_PER_VS_TO_CM2_PER_VS]),
        roles[i % roles.length],
      ),
    ),
    summary: withPoints.map((d) => `${d.id}: peak ${formatNumber((d.summary?.peakMobility ?? 0) * 1e4)} cm²/V s`).join("; "),
  });
  for (const d of withPoints) {
    const traces = traceChart(d);
    if (traces) charts.push(traces);
  }
  return charts;
}

export function waferPageModel(o: WaferOutcome) {
  const r = o.record;
  const transportDepth = transportDepthSection(o);
  const transportCharts = waferCharts(o);
  const structure = structureSection(o);
  const images = imagesSection(o);
  const uniformity = uniformitySection(o);
  const allCharts = [
    ...transportCharts,
    ...(transportDepth?.charts ?? []),
    ...(structure?.charts ?? []),
    ...(structure?.valley?.charts ?? []),
    ...(images?.charts ?? []),
  ];
  const devices = o.analysis?.devices ?? [];
  return {
    /** The "On this page" list (pageIndex.ts). */
    toc: pageIndex({
      decision: !!o.record?.decision,
      problems: o.problems.length > 0,
      transport: true,
      uniformity: uniformity !== undefined,
      structure: structure !== undefined,
      images: images !== undefined,
      stack: (r?.stack ?? []).length > 0,
      valley: structure?.valley !== undefined,
      growth: r?.growth !== undefined,
      deviceTables: devices.length > 0,
      transportDepth: transportDepth !== undefined,
      imageIds: images?.images.map((b) => b.id),
    }),
    id: o.folder,
    /** "" when the record could not be read (the page then says so instead of linking a run). */
    run: r?.run ?? "",
    grown: r?.grown ?? "",
    grade: o.judgement.grade,
    reactor: r?.reactor ?? "",
    title: r?.title,
    verdict: o.judgement.verdict,
    reasons: o.judgement.reasons,
    decision: decisionModel(o),
    metrics: o.judgement.metrics.map(metricRow),
    checks: checkTable(o.judgement),
    legend: verdictLegend(),
    devices: (o.analysis?.devices ?? []).map((d) => ({
      id: d.id,
      geometry: d.geometry,
      position: d.at_mm ? `(${d.at_mm[0]}, ${d.at_mm[1]}) mm` : "",
      gateFit: d.summary?.gateFit
        ? `dn/dVg = ${formatNumber(d.summary.gateFit.slope * 1e-4)} cm⁻²/V, turn-on ${formatNumber(d.summary.gateFit.turnOn)} ± ${formatNumber(d.summary.gateFit.turnOnStdErr, 2)} V (R² ${d.summary.gateFit.r2.toFixed(4)}, ${d.summary.gateFit.points} points)`
        : (d.summary?.gateFitSkipped ?? ""),
      points: d.points.map((p) => ({
        file: p.file,
        gate: formatNumber(p.gate_V, 4),
        density: formatNumber(p.density * PER_M2_TO_PER_CM2, 4),
        mobility: formatNumber(p.mobility * M2_PER_VS_TO_CM2_PER_VS, 4),
        rho: formatNumber(p.sheetResistance, 4),
        r2: p.hall.r2.toFixed(5),
        poor: p.hall.poor,
        symmetrised: p.symmetrised,
      })),
      skipped: d.skipped,
      conditions: deviceConditions(d),
    })),
    growth: growthSection(r?.growth),
    stack: (r?.stack ?? []).map((l) => ({
      ...l,
      material: l.material ?? "",
      ge: l.ge === undefined ? "" : formatNumber(l.ge, 3),
      thickness: l.thickness_nm === undefined ? "" : `${formatNumber(l.thickness_nm, 3)} nm`,
    })),
    notesHtml: renderNotes(r?.notes ?? ""),
    problems: o.problems.map((p) => ({ severity: p.severity, text: formatProblem(p) })),
    files: o.provenance.files.map((f) => ({
      ...f,
      size: f.bytes < 1024 ? `${f.bytes} B` : `${(f.bytes / 1024).toFixed(1)} KiB`,
      href: rawCopyHref(f),
      name: f.path.split("/").at(-1) ?? f.path,
    })),
    // The provenance keeps ASCII units (exports); the page prints the micro prefix as µ.
    settings: o.provenance.settings.map((st) => ({ ...st, value: microSign(st.value) })),
    transportCharts,
    transportDepth,
    structure,
    images,
    uniformity,
    /** Every chart on the page, for the one JSON block the chart script reads. */
    charts: allCharts,
    /** The same, serialised for the page's <script type="application/json"> block ("</script>" cannot close it). */
    chartsJson: chartDataJson(allCharts),
    units: { mobility: prettyUnit("cm^2/(V s)"), density: prettyUnit("cm^-2") },
  };
}
