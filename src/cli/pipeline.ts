/**
 * The per-wafer pipeline's context: what loading a wafer needs (src/validate/load/wafer.ts) and
 * what judging it needs (src/judge/outcome.ts). The outcome itself lives in src/judge/outcome.ts;
 * the re-export below is a shim for code written before the move (DEVELOPERS.md, shims).
 */
import type { LoadContext } from "../validate/load/wafer.ts";
import type { OutcomeContext } from "../judge/outcome.ts";

export interface PipelineContext extends LoadContext, OutcomeContext {}

export { judgeOutcome, metricValues, type Provenance, type WaferOutcome } from "../judge/outcome.ts";
