/**
 * Which metrics are compared on a logarithmic axis where wafers are plotted
 * against each other (the relation page), decided per quantity here rather
 * than from the span of the data shown: the axis, and with it the fitted line
 * (a power law on log–log axes), must not change meaning when a filter leaves
 * out a few wafers.
 *
 * Log-like are the strictly positive quantities that span decades across a
 * wafer population and whose relations are power laws (common practice in
 * Si/SiGe heterostructure transport: μ ∝ n^α, so mobility against density is
 * straight on log–log axes with slope α):
 * - Hall mobility (10³ … 10⁶ cm²/(V s) from a leaky to a record well),
 * - sheet and percolation densities (10¹⁰ … 10¹² cm⁻²),
 * - quantum lifetime τ_q (0.1 … 10 ps),
 * - contaminant peak concentrations (10¹⁵ … 10¹⁹ cm⁻³; any `peak_<element>`).
 * Thicknesses, widths, fractions, strains, voltages and percentages stay
 * linear: they vary by tens of percent, may be zero or negative, and a
 * straight line on linear axes is what one fits to them.
 */
import type { MetricSpec } from "./metricSpec.ts";

const LOG_AXIS = ["peak_mobility", "density_at_peak_mobility", "percolation_density", "quantum_lifetime"];

/** True when metric `key` is compared on a log axis (see the module comment). */
export function logAxis(key: string): boolean {
  return LOG_AXIS.includes(key) || /^peak_[A-Z][a-z]?$/.test(key);
}

/** The spec with its axis scale set (a spec that already names one keeps it). */
export function withAxisScale(s: MetricSpec): MetricSpec {
  return s.axis || !logAxis(s.key) ? s : { ...s, axis: "log" };
}
