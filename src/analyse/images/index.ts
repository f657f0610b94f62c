/**
 * Lattice-image analysis of one wafer: Z-contrast interface widths and
 * geometric phase analysis. Extension point: inputs from
 * src/read/imageFiles.ts, metrics in ./metrics.ts.
 */
import type { Layer } from "../../validate/wafer.ts";
import type { AnalysisSettings } from "../../validate/settings.ts";

// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface ImageInputs {}

export interface ImageAnalysis {
  /** Wafer-level metric values in each metric's unit. */
  metrics: Record<string, number>;
}

export function analyseImages(_inputs: ImageInputs, _stack: Layer[], _settings: AnalysisSettings): ImageAnalysis | undefined {
  return undefined;
}
