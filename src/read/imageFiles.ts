/**
 * Reads and validates a wafer's cross-section micrographs (`images:`).
 * Extension point filled by the lattice-image analysis.
 */
import type { WaferFileReader } from "./waferFiles.ts";
import type { ImageInputs } from "../analyse/images/index.ts";
import type { WaferRecord } from "../validate/wafer.ts";

export async function loadImageInputs(_record: WaferRecord, _files: WaferFileReader): Promise<ImageInputs> {
  return {};
}
