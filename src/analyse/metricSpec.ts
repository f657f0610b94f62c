/** Shim: MetricSpec lives in src/model/metricSpec.ts. Remove once no branch imports this path (DEVELOPERS.md, shims). */
export * from "../model/metricSpec.ts";
