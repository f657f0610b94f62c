/**
 * Transport analysis in depth for one device: gate calibration, percolation,
 * mobility power law, Shubnikov–de Haas, derived quantities, hysteresis.
 * Extension point called by analyseDevice; metrics in ./metrics.ts.
 */
import type { AnalysisSettings } from "../../validate/settings.ts";
import type { Sweep } from "../../validate/sweep.ts";
import type { TransportPoint } from "./fieldSweep.ts";

export interface DeviceDepth {
  /** Device-level metric values in each metric's unit. */
  metrics: Record<string, number>;
}

export function analyseDeviceDepth(_points: TransportPoint[], _gateSweeps: Sweep[], _settings: AnalysisSettings): DeviceDepth | undefined {
  return undefined;
}
