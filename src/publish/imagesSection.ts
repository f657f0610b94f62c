/**
 * Page model of the lattice images (Z-contrast and geometric phase analysis) section of a wafer page. Extension point: returns
 * undefined while the wafer has nothing to show.
 */
import type { WaferOutcome } from "../cli/pipeline.ts";
import type { ChartSpec } from "./charts.ts";

export interface ImagesSectionModel {
  charts: ChartSpec[];
}

export function imagesSection(_o: WaferOutcome): ImagesSectionModel | undefined {
  return undefined;
}
