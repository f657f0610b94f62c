/** Metrics of the structure analyses (registered in src/analyse/metrics.ts). */
import { metric, type MetricSpec } from "../metricSpec.ts";

export const STRUCTURE_METRICS: MetricSpec[] = [];
