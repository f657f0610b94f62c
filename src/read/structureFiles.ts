/**
 * Reads and validates a wafer's X-ray diffraction files (`xrd.files`) and
 * composition depth profiles (`profiles.files`). Extension point filled by the
 * structure analysis (issue: strain and interface figures).
 */
import type { WaferFileReader } from "./waferFiles.ts";
import type { StructureInputs } from "../analyse/structure/index.ts";
import type { WaferRecord } from "../validate/wafer.ts";

export async function loadStructureInputs(_record: WaferRecord, _files: WaferFileReader): Promise<StructureInputs> {
  return {};
}
