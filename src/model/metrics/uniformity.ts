/**
 * Metrics of within-wafer uniformity (registered in src/model/metrics.ts): `<metric>_cv`, the
 * coefficient of variation of a device metric over the wafer's devices, in percent. The values
 * are computed by src/analyse/uniformityMetrics.ts.
 */
import { metric, type MetricSpec } from "../metricSpec.ts";

/** Device metrics whose spread over the wafer is a metric of its own. */
export const UNIFORMITY_SOURCES: { key: string; label: string }[] = [
  { key: "peak_mobility", label: "peak mobility" },
  { key: "density_at_peak_mobility", label: "density at peak mobility" },
  { key: "turn_on_voltage", label: "turn-on voltage" },
];

/** `<metric>_cv` key for a device metric. */
export const cvKey = (key: string): string => `${key}_cv`;

export const UNIFORMITY_METRICS: MetricSpec[] = UNIFORMITY_SOURCES.map((s) =>
  metric(
    cvKey(s.key),
    `Within-wafer CV of ${s.label}`,
    "%",
    1,
    "uniformity",
    `coefficient of variation (100·s/|mean|, sample s) of ${s.label} over the wafer's devices`,
    2,
  ),
);
