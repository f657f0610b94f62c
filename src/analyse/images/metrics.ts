/** Metrics of the images analyses (registered in src/analyse/metrics.ts). */
import { metric, type MetricSpec } from "../metricSpec.ts";

export const IMAGE_METRICS: MetricSpec[] = [];
