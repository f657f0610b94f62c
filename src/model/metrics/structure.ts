/**
 * Metrics of the structure analyses (registered in src/model/metrics.ts).
 * fromSI converts the SI value the analysis works in (1, m, m⁻³) to the unit.
 * Contaminant peaks appear as `peak_<element>`; keys are registered statically,
 * so only the elements in REGISTERED_CONTAMINANTS can be targeted. Every
 * element's peak is still written to results.json (structure.contaminant_peaks).
 */
import { metric, type MetricSpec } from "../metricSpec.ts";

/** Elements whose peak level is a registered metric `peak_<element>`. */
export const REGISTERED_CONTAMINANTS = ["O", "C"] as const;

/** J → µeV (written "ueV", the metric unit of the valley-splitting figures). */
const J_TO_UEV = 1 / 1.602176634e-25;

/**
 * Valley splitting predicted from the Ge profile (valleySplitting.ts). A compact block so the
 * registry can move as a whole; wafer-level, from the profile the structure analysis uses.
 */
export const VALLEY_METRICS: MetricSpec[] = [
  metric(
    "valley_splitting_mean",
    "Valley splitting, predicted mean",
    "ueV",
    J_TO_UEV,
    "structure",
    "mean of the predicted valley-splitting distribution E_v = 2|Δ0 + δ| (model estimate from the Ge profile, not a measurement)",
    3,
  ),
  metric(
    "valley_splitting_p10",
    "Valley splitting, predicted 10th percentile",
    "ueV",
    J_TO_UEV,
    "structure",
    "10th percentile of the predicted valley-splitting distribution (model estimate from the Ge profile)",
    3,
  ),
  metric(
    "valley_splitting_deterministic",
    "Valley splitting, deterministic part",
    "ueV",
    J_TO_UEV,
    "structure",
    "2|Δ0|: the valley splitting the interface shape alone would give (model estimate from the fitted interfaces)",
    3,
  ),
  metric(
    "valley_splitting_disorder",
    "Valley coupling, disorder σ",
    "ueV",
    J_TO_UEV,
    "structure",
    "σ: standard deviation of each component of the alloy-disorder coupling δ (model estimate)",
    3,
  ),
  metric(
    "valley_splitting_yield",
    "Valley splitting, predicted yield",
    "%",
    100,
    "structure",
    "predicted share of dots whose valley splitting reaches valley_splitting_threshold (model estimate)",
    3,
  ),
];

export const STRUCTURE_METRICS: MetricSpec[] = [
  metric(
    "ge_fraction",
    "Buffer Ge fraction",
    "1",
    1,
    "structure",
    "Ge fraction x of the SiGe buffer from the 004 and 224 X-ray peaks (Dismukes' law, composition-dependent elastic constants)",
    3,
  ),
  metric(
    "buffer_relaxation",
    "Buffer relaxation",
    "%",
    100,
    "structure",
    "relaxation R of the SiGe buffer against the Si substrate (0 % pseudomorphic, 100 % fully relaxed)",
    3,
  ),
  metric(
    "well_strain",
    "Well in-plane strain",
    "%",
    100,
    "structure",
    "in-plane strain ε∥ of the Si well relative to bulk Si (from the well peak, or the buffer's a∥ assuming a pseudomorphic well)",
    3,
  ),
  metric(
    "critical_thickness",
    "Critical thickness (Matthews–Blakeslee)",
    "nm",
    1e9,
    "structure",
    "Matthews–Blakeslee critical thickness of the well for its in-plane strain (single layer, 60° dislocations)",
    3,
  ),
  metric(
    "critical_thickness_margin",
    "Critical-thickness margin",
    "nm",
    1e9,
    "structure",
    "Matthews–Blakeslee critical thickness minus the well thickness (negative: the well is beyond its critical thickness)",
    3,
  ),
  metric(
    "well_thickness",
    "Well thickness (profile)",
    "nm",
    1e9,
    "structure",
    "distance between the fitted mid-points of the well's two interfaces on the depth profile",
    3,
  ),
  metric(
    "interface_width_top",
    "Top interface width (10–90 %)",
    "nm",
    1e9,
    "structure",
    "10–90 % width of the well's upper interface (nearer the surface), sigmoid fit",
    3,
  ),
  metric("interface_width_bottom", "Bottom interface width (10–90 %)", "nm", 1e9, "structure", "10–90 % width of the well's lower interface, sigmoid fit", 3),
  metric(
    "barrier_ge_fraction",
    "Barrier Ge fraction",
    "1",
    1,
    "structure",
    "Ge fraction of the barriers on either side of the well (fitted plateaus, mean of both)",
    3,
  ),
  metric(
    "peak_O",
    "Peak O in/near the well",
    "cm^-3",
    1e-6,
    "structure",
    "largest oxygen concentration inside the well or within 10 nm of it (depth profile)",
    2,
  ),
  metric(
    "peak_C",
    "Peak C in/near the well",
    "cm^-3",
    1e-6,
    "structure",
    "largest carbon concentration inside the well or within 10 nm of it (depth profile)",
    2,
  ),
  ...VALLEY_METRICS,
];
