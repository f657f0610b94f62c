/**
 * The per-wafer pipeline's context: what loading a wafer needs (src/validate/load/wafer.ts) and
 * what judging it needs (src/judge/outcome.ts). The outcome itself (WaferOutcome, judgeOutcome)
 * lives in src/judge/outcome.ts.
 */
import type { LoadContext } from "../validate/load/wafer.ts";
import type { OutcomeContext } from "../judge/outcome.ts";

export interface PipelineContext extends LoadContext, OutcomeContext {}
