/** Shim: the metric registry lives in src/model/metrics.ts. Remove once no branch imports this path (DEVELOPERS.md, shims). */
export * from "../model/metrics.ts";
