/**
 * Page model of the X-ray diffraction, critical thickness and depth profiles section of a wafer page. Extension point: returns
 * undefined while the wafer has nothing to show.
 */
import type { WaferOutcome } from "../cli/pipeline.ts";
import type { ChartSpec } from "./charts.ts";

export interface StructureSectionModel {
  charts: ChartSpec[];
}

export function structureSection(_o: WaferOutcome): StructureSectionModel | undefined {
  return undefined;
}
