/** Metrics of the images analyses (registered in src/model/metrics.ts). */
import { metric, type MetricSpec } from "../metricSpec.ts";

export const IMAGE_METRICS: MetricSpec[] = [
  metric(
    "interface_width_top_image",
    "Upper interface width (image)",
    "nm",
    1e9,
    "images",
    "10–90 % width of the well's upper (surface-side) interface from the HAADF Z-contrast profile",
  ),
  metric(
    "interface_width_bottom_image",
    "Lower interface width (image)",
    "nm",
    1e9,
    "images",
    "10–90 % width of the well's lower (substrate-side) interface from the HAADF Z-contrast profile",
  ),
  metric(
    "interface_inplane_mismatch",
    "In-plane mismatch, well vs reference",
    "%",
    100,
    "images",
    "in-plane lattice spacing of the well relative to the reference region, from geometric phase analysis (≈ 0 for a coherent well)",
  ),
  metric(
    "interface_outofplane_strain",
    "Out-of-plane strain, well vs reference",
    "%",
    100,
    "images",
    "out-of-plane lattice spacing of the well relative to the reference region, from geometric phase analysis",
  ),
];
