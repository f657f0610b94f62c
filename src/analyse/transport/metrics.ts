/** Metrics of the transport analyses (registered in src/analyse/metrics.ts). */
import { metric, type MetricSpec } from "../metricSpec.ts";

export const TRANSPORT_DEPTH_METRICS: MetricSpec[] = [];
