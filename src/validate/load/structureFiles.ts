/**
 * Reads and validates a wafer's X-ray diffraction files (`xrd.files`) and
 * composition depth profiles (`profiles.files`): each matched file is read as
 * text, split by readTable and validated (src/validate/xrd.ts,
 * src/validate/depthProfile.ts). A broken file becomes a located problem of
 * this wafer; the other files are still read.
 */
import type { WaferFileReader } from "../../read/waferFiles.ts";
import type { StructureInputs, XrdFile, DepthProfileFile } from "../../model/structureInputs.ts";
import type { WaferRecord } from "../wafer.ts";
import { validateXrd } from "../xrd.ts";
import { validateDepthProfile } from "../depthProfile.ts";
import { readTable } from "../../read/table.ts";
import { readInstrumentTable } from "../../read/instrumentTable.ts";

export async function loadStructureInputs(record: WaferRecord, files: WaferFileReader): Promise<StructureInputs> {
  const xrd: XrdFile[] = [];
  const profiles: DepthProfileFile[] = [];
  const names = record.stack.map((l) => l.name);
  if (record.xrd) {
    for (const rel of files.glob(record.xrd.files, "xrd.files")) {
      const f = await files.guard(async () => {
        const { rel: path, text } = await files.readText(rel, "xrd");
        const r = record.xrd!.reading;
        return validateXrd(r ? readInstrumentTable(text, path, r) : readTable(text, path), names);
      });
      if (f) xrd.push(f);
    }
  }
  if (record.profiles) {
    for (const rel of files.glob(record.profiles.files, "profiles.files")) {
      const f = await files.guard(async () => {
        const { rel: path, text } = await files.readText(rel, "depth profile");
        const r = record.profiles!.reading;
        return validateDepthProfile(r ? readInstrumentTable(text, path, r) : readTable(text, path));
      });
      if (f) profiles.push(f);
    }
  }
  return { xrd, profiles };
}
