/**
 * Within-wafer uniformity metrics: `<metric>_cv`, the coefficient of variation
 * of a device metric over the wafer's devices, in percent.
 *
 * Definition: CV = 100 · s / |mean| with s the SAMPLE standard deviation
 * (n − 1) of the devices' values (src/analyse/uniformity.ts; e.g. Montgomery,
 * Introduction to Statistical Quality Control, for the coefficient of
 * variation). Computed from the device values in the metric's own unit (the
 * ratio is unit-free). Needs at least two devices with a value and a non-zero
 * mean; otherwise the metric is simply absent (the reason is shown in the
 * wafer page's uniformity section). Pure: no I/O.
 */
import { cvKey, UNIFORMITY_SOURCES } from "../model/metrics/uniformity.ts";
import { uniformity } from "./uniformity.ts";

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
