/**
 * Natural bounds of the metrics, in each metric's own unit: what the quantity cannot be, whatever
 * the data. Used to clip control limits (src/judge/phaseOne.ts) so a chart never shows a negative
 * width or density. Quantities that may take either sign (turn-on voltage, strains, mismatch,
 * critical-thickness margin, exponents, dn/dVg) have no bound here.
 */
import type { MetricSpec } from "./metricSpec.ts";

const NON_NEGATIVE = [
  // magnitudes, densities, concentrations, times and lengths
  "peak_mobility",
  "density_at_peak_mobility",
  "percolation_density",
  "gate_capacitance",
  "quantum_lifetime",
  "critical_thickness",
  "well_thickness",
  "interface_width_top",
  "interface_width_bottom",
  "interface_width_top_image",
  "interface_width_bottom_image",
  "peak_O",
  "peak_C",
  // absolute values by definition (see each metric's description)
  "hall_sdh_mismatch",
  "gate_hysteresis",
  // coefficients of variation, 100·s/|mean|
  "peak_mobility_cv",
  "density_at_peak_mobility_cv",
  "turn_on_voltage_cv",
  // relaxation R (0 % pseudomorphic)
  "buffer_relaxation",
  // predicted valley splittings and disorder spread (magnitudes)
  "valley_splitting_mean",
  "valley_splitting_p10",
  "valley_splitting_deterministic",
  "valley_splitting_disorder",
];

/** Shares in %: 0 … 100. */
const PERCENTAGES = ["valley_splitting_yield"];

/** Ge fractions x of Si(1−x)Ge(x): 0 … 1. */
const FRACTIONS = ["ge_fraction", "barrier_ge_fraction"];

/** The bounds of a metric key, or undefined when it has none. */
export function naturalBounds(key: string): { min?: number; max?: number } | undefined {
  if (FRACTIONS.includes(key)) return { min: 0, max: 1 };
  if (PERCENTAGES.includes(key)) return { min: 0, max: 100 };
  if (NON_NEGATIVE.includes(key) || /^peak_[A-Z][a-z]?$/.test(key)) return { min: 0 };
  return undefined;
}

/** The spec with its natural bounds set (a spec that already names bounds keeps its own). */
export function withNaturalBounds(s: MetricSpec): MetricSpec {
  if (s.bounds) return s;
  const bounds = naturalBounds(s.key);
  return bounds ? { ...s, bounds } : s;
}
