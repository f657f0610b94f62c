/**
 * The registry of metrics waferbook computes: key, what it is, its unit in
 * results.json and targets, and the factor from the SI value the analysis
 * works in. Targets may name only keys listed here; each area lists its own in
 * src/model/metrics/<area>.ts.
 */
import { TRANSPORT_DEPTH_METRICS } from "./metrics/transport.ts";
import { STRUCTURE_METRICS } from "./metrics/structure.ts";
import { IMAGE_METRICS } from "./metrics/images.ts";
import { UNIFORMITY_METRICS } from "./metrics/uniformity.ts";

import { metric, type MetricSpec } from "./metricSpec.ts";
import { withNaturalBounds } from "./metricBounds.ts";
import { withAxisScale } from "./metricScale.ts";
export type { MetricSpec };

const m = metric;

/** Foundation transport metrics (Hall analysis). */
const HALL_METRICS: MetricSpec[] = [
  m("peak_mobility", "Peak Hall mobility", "cm^2/(V s)", 1e4, "transport", "largest Hall mobility over the gate voltages measured"),
  m("density_at_peak_mobility", "Density at peak mobility", "cm^-2", 1e-4, "transport", "Hall sheet density at the gate voltage of peak mobility"),
  m("gate_density_slope", "dn/dVg", "cm^-2/V", 1e-4, "transport", "slope of Hall density against gate voltage (linear fit)"),
  m("turn_on_voltage", "Turn-on voltage", "V", 1, "transport", "gate voltage where the fitted density extrapolates to zero"),
];

export const METRICS: MetricSpec[] = [...HALL_METRICS, ...TRANSPORT_DEPTH_METRICS, ...STRUCTURE_METRICS, ...IMAGE_METRICS, ...UNIFORMITY_METRICS]
  .map(withNaturalBounds)
  .map(withAxisScale);

export const METRIC_BY_KEY: ReadonlyMap<string, MetricSpec> = new Map(METRICS.map((s) => [s.key, s]));

/** Converts an SI value to the metric's unit; undefined stays undefined, non-finite becomes undefined. */
export function toMetricUnit(key: string, si: number | undefined): number | undefined {
  const spec = METRIC_BY_KEY.get(key);
  if (!spec) throw new Error(`unknown metric ${key}`);
  if (si === undefined || !Number.isFinite(si)) return undefined;
  return si * spec.fromSI;
}

/**
 * Stores the SI value `si` of metric `key` in `metrics`, converted to the metric's unit by
 * toMetricUnit; an undefined or non-finite value stores nothing (an existing entry is left).
 * Returns true when a value was stored. Throws for a key not in the registry.
 */
export function putMetric(metrics: Record<string, number>, key: string, si: number | undefined): boolean {
  const v = toMetricUnit(key, si);
  if (v === undefined) return false;
  metrics[key] = v;
  return true;
}
