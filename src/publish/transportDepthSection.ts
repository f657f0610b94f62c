/**
 * Page model of the transport in depth (percolation, power law, Shubnikov–de Haas) section of a wafer page. Extension point: returns
 * undefined while the wafer has nothing to show.
 */
import type { WaferOutcome } from "../cli/pipeline.ts";
import type { ChartSpec } from "./charts.ts";

export interface TransportDepthSectionModel {
  charts: ChartSpec[];
}

export function transportDepthSection(_o: WaferOutcome): TransportDepthSectionModel | undefined {
  return undefined;
}
