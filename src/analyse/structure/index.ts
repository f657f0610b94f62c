/**
 * Structure analysis of one wafer: X-ray diffraction (buffer composition and
 * relaxation, well strain), critical thickness, depth profiles. Extension point:
 * inputs from src/read/structureFiles.ts, metrics in ./metrics.ts.
 */
import type { Layer } from "../../validate/wafer.ts";
import type { AnalysisSettings } from "../../validate/settings.ts";

// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface StructureInputs {}

export interface StructureAnalysis {
  /** Wafer-level metric values in each metric's unit. */
  metrics: Record<string, number>;
}

export function analyseStructure(_inputs: StructureInputs, _stack: Layer[], _settings: AnalysisSettings): StructureAnalysis | undefined {
  return undefined;
}
