/**
 * The run page's chart: Hall mobility against density for every wafer of the
 * run, one series per wafer (every device's points), on log–log axes like the
 * wafer page's chart. Each point links to its wafer page and names its wafer
 * and device. Built from the slim outcomes (per-point figures are kept).
 */
import type { WaferOutcome } from "../judge/outcome.ts";
import { PER_M2_TO_PER_CM2, M2_PER_VS_TO_CM2_PER_VS } from "../physics/constants.ts";
import { jsonForScript, markerSeries, type ChartSpec } from "./charts.ts";
import { siteUrl } from "./siteUrl.ts";

const ROLES = ["data", "second", "third", "fit", "reference"] as const;

export function runChart(runId: string, wafers: readonly WaferOutcome[], basePath: string): { chart: ChartSpec; json: string } | undefined {
  const page = `/runs/${runId}/`;
  const series = wafers.flatMap((o, i) => {
    const pts = (o.analysis?.devices ?? []).flatMap((d) =>
      d.points.map((p) => ({ d: d.id, xy: [p.density * PER_M2_TO_PER_CM2, p.mobility * M2_PER_VS_TO_CM2_PER_VS] as [number, number] })),
    );
    if (!pts.length) return [];
    const s = markerSeries(
      o.folder,
      pts.map((p) => p.xy),
      ROLES[i % ROLES.length],
    );
    s.links = pts.map(() => siteUrl(`wafers/${o.folder}/`, page, basePath));
    s.tips = pts.map((p) => `${o.folder} ${p.d}`);
    return [s];
  });
  if (!series.length) return undefined;
  const chart: ChartSpec = {
    id: `run-mobility-${runId}`,
    title: `Hall mobility against density, every wafer of run ${runId}`,
    x: { label: "Sheet density n (cm⁻²)", log: true },
    y: { label: "Hall mobility μ (cm²/V s)", log: true },
    series,
    summary: series
      .map((s) => `${s.label}: ${s.points.length} points, highest mobility ${Math.round(Math.max(...s.points.map((p) => p[1])))} cm²/V s`)
      .join("; "),
  };
  return { chart, json: jsonForScript([chart]) };
}
