/**
 * Page model of the within-wafer uniformity section: for each device metric
 * with at least one positioned device (`at_mm`), a wafer map (inline SVG from
 * waferMapSvg), the uniformity figures (mean, sample standard deviation, CV,
 * range; src/analyse/uniformity.ts) and an accessible table of the devices.
 * Returns undefined when no device has a position.
 */
import type { WaferOutcome } from "../judge/outcome.ts";
import { METRIC_BY_KEY } from "../model/metrics.ts";
import { UNIFORMITY_SOURCES } from "../model/metrics/uniformity.ts";
import { uniformity } from "../analyse/uniformity.ts";
import { formatNumber, formatValue, prettyUnit } from "../model/format.ts";
import { waferMapSvg } from "./waferMapSvg.ts";

export interface UniformityMapModel {
  key: string;
  label: string;
  /** Inline SVG (escaped inside; safe to place as HTML). */
  svg: string;
  figures: { label: string; value: string }[];
  /** Why no CV, when it cannot be formed. */
  note: string;
  rows: { id: string; position: string; value: string }[];
}

export interface UniformitySectionModel {
  maps: UniformityMapModel[];
}

/** Wafer diameter assumed for the outline, mm (the demo lab's 100 mm substrates). */
export const MAP_DIAMETER_MM = 100;

export function uniformitySection(o: WaferOutcome): UniformitySectionModel | undefined {
  const devices = (o.analysis?.devices ?? []).filter((d) => d.at_mm);
  if (devices.length === 0) return undefined;
  const maps: UniformityMapModel[] = [];
  for (const { key } of UNIFORMITY_SOURCES) {
    const spec = METRIC_BY_KEY.get(key)!;
    if (!devices.some((d) => d.metrics[key] !== undefined)) continue;
    const unit = prettyUnit(spec.unit);
    // Figures over every device, as for the judged <metric>_cv (uniformityMetrics); the map shows the positioned ones.
    const values = (o.analysis?.devices ?? []).map((d) => d.metrics[key]).filter((v): v is number => v !== undefined && Number.isFinite(v));
    const u = uniformity(values);
    const svg = waferMapSvg(
      devices.map((d) => ({ id: d.id, atMm: d.at_mm!, value: d.metrics[key] ?? null })),
      {
        title: `${spec.label} across wafer ${o.folder}`,
        unit,
        diameterMm: MAP_DIAMETER_MM,
        format: (v) => formatNumber(v, spec.digits),
        idPrefix: `map-${key}`,
      },
    );
    const figures = u.ok
      ? [
          { label: "Devices", value: String(u.n) },
          { label: "Mean", value: formatValue(u.mean, spec) },
          { label: "Standard deviation (sample)", value: u.standardDeviation === null ? "—" : formatValue(u.standardDeviation, spec) },
          { label: "Coefficient of variation", value: u.cvPercent === null ? "—" : `${formatNumber(u.cvPercent, 2)} %` },
          { label: "Range (max − min)", value: formatValue(u.range, spec) },
        ]
      : [];
    maps.push({
      key,
      label: spec.label,
      svg,
      figures,
      note: u.ok ? (u.cvReason ?? "") : u.reason,
      rows: devices.map((d) => ({ id: d.id, position: `(${d.at_mm![0]}, ${d.at_mm![1]}) mm`, value: formatValue(d.metrics[key], spec) })),
    });
  }
  return maps.length ? { maps } : undefined;
}
