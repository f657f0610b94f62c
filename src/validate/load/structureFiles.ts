/**
 * Reads and validates a wafer's X-ray diffraction files (`xrd.files`) and
 * composition depth profiles (`profiles.files`): each matched file is read as
 * text, split by readTable and validated (src/validate/xrd.ts,
 * src/validate/depthProfile.ts). A broken file becomes a located problem of
 * this wafer; the other files are still read. Files read by reading
 * instructions report their reading notes as warnings, as sweeps do.
 */
import type { WaferFileReader } from "../../read/waferFiles.ts";
import type { StructureInputs, XrdFile, DepthProfileFile } from "../../model/structureInputs.ts";
import type { WaferRecord } from "../wafer.ts";
import { validateXrd } from "../xrd.ts";
import { validateDepthProfile } from "../depthProfile.ts";
import { readTable, type RawTable } from "../../read/table.ts";
import { readInstrumentTable, type ReadingRules } from "../../read/instrumentTable.ts";

export async function loadStructureInputs(record: WaferRecord, files: WaferFileReader): Promise<StructureInputs> {
  const xrd: XrdFile[] = [];
  const profiles: DepthProfileFile[] = [];
  const names = record.stack.map((l) => l.name);
  if (record.xrd) {
    const r = record.xrd.reading;
    const ignored = new Set<string>();
    for (const rel of files.glob(record.xrd.files, "xrd.files")) {
      const f = await files.guard(async () => {
        const { rel: path, text } = await files.readText(rel, "xrd");
        return validateXrd(r ? readByRules(text, path, r, files, ignored) : readTable(text, path), names);
      });
      if (f) xrd.push(f);
    }
    reportIgnored(ignored, "xrd", files);
  }
  if (record.profiles) {
    const r = record.profiles.reading;
    const ignored = new Set<string>();
    for (const rel of files.glob(record.profiles.files, "profiles.files")) {
      const f = await files.guard(async () => {
        const { rel: path, text } = await files.readText(rel, "depth profile");
        return validateDepthProfile(r ? readByRules(text, path, r, files, ignored) : readTable(text, path));
      });
      if (f) profiles.push(f);
    }
    reportIgnored(ignored, "profiles", files);
  }
  return { xrd, profiles };
}

/**
 * Reads a file by its entry's reading instructions and reports, as the device
 * loader does for sweeps (load/wafer.ts), the reading notes of the file (a
 * rule the file's own line overrode) as warnings of the wafer; the columns the
 * mapping leaves out are gathered for one note per entry.
 */
function readByRules(text: string, path: string, rules: ReadingRules, files: WaferFileReader, ignored: Set<string>): RawTable {
  const t = readInstrumentTable(text, path, rules);
  for (const n of t.readingNotes ?? []) files.report(n);
  for (const c of t.ignoredColumns ?? []) ignored.add(c);
  return t;
}

/** One note per entry (not per file) naming the columns the `columns` mapping leaves out. */
function reportIgnored(ignored: Set<string>, entry: "xrd" | "profiles", files: WaferFileReader): void {
  if (ignored.size === 0) return;
  const names = [...ignored];
  const field = `${entry}.columns`;
  files.report({
    severity: "warning",
    file: files.recordFile,
    line: files.lineOf(field),
    field,
    message: `columns not named in the mapping are ignored: ${names
      .slice(0, 8)
      .map((n) => JSON.stringify(n))
      .join(", ")}${names.length > 8 ? ` and ${names.length - 8} more` : ""}`,
    expected: "every column the analysis should read mapped in columns:",
    found: `${names.length} unmapped`,
    fix: "map a column to a quantity if the analysis should use it; otherwise nothing to do",
  });
}
