/**
 * Within-wafer uniformity metrics: `<metric>_cv`, the coefficient of variation
 * of a device metric over the wafer's devices, in percent.
 *
 * Definition: CV = 100 · s / |mean| with s the SAMPLE standard deviation
 * (n − 1) of the devices' values (src/judge/uniformity.ts; e.g. Montgomery,
 * Introduction to Statistical Quality Control, for the coefficient of
 * variation). Computed from the device values in the metric's own unit (the
 * ratio is unit-free). Needs at least two devices with a value and a non-zero
 * mean; otherwise the metric is simply absent (the reason is shown in the
 * wafer page's uniformity section). Pure: no I/O.
 */
import { metric, type MetricSpec } from "./metricSpec.ts";
import { uniformity } from "../judge/uniformity.ts";

/** Device metrics whose spread over the wafer is a metric of its own. */
export const UNIFORMITY_SOURCES: { key: string; label: string }[] = [
  { key: "peak_mobility", label: "peak mobility" },
  { key: "density_at_peak_mobility", label: "density at peak mobility" },
  { key: "turn_on_voltage", label: "turn-on voltage" },
];

/** `<metric>_cv` key for a device metric. */
export const cvKey = (key: string): string => `${key}_cv`;

export const UNIFORMITY_METRICS: MetricSpec[] = UNIFORMITY_SOURCES.map((s) =>
  metric(cvKey(s.key), `Within-wafer CV of ${s.label}`, "%", 1, "uniformity", `coefficient of variation (100·s/|mean|, sample s) of ${s.label} over the wafer's devices`, 2),
);

/**
 * Wafer-level `<metric>_cv` values (%) from the devices' metric values.
 * `devices`: each device's metrics in the metric's unit. Keys whose CV cannot
 * be formed (fewer than 2 devices, zero mean) are left out — never NaN.
 */
export function uniformityMetrics(devices: readonly { metrics: Record<string, number> }[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const s of UNIFORMITY_SOURCES) {
    const values = devices.map((d) => d.metrics[s.key]).filter((v): v is number => v !== undefined && Number.isFinite(v));
    const u = uniformity(values);
    if (u.ok && u.cvPercent !== null) out[cvKey(s.key)] = u.cvPercent;
  }
  return out;
}
