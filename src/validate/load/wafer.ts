/**
 * Loads one wafer folder: wafer.md, its device files (globs), each read,
 * decoded and validated into typed sweeps. Problems stay with the wafer: a
 * broken file makes this wafer `error` without touching the others.
 */
import { fileInfo, type RawFileInfo } from "../../read/fileInfo.ts";

export { fileInfo, type RawFileInfo };
import { promises as fs } from "node:fs";
import path from "node:path";
import { capProblem, InputError, type Problem } from "../../model/problem.ts";
import type { AnalysisSettings } from "../settings.ts";
import { validateSweep, type Sweep } from "../sweep.ts";
import { validateWafer, type WaferRecord } from "../wafer.ts";
import { deviceDimensionWarnings } from "../recordNumbers.ts";
import { checkRelativePath, decodeText, listFiles, matchGlob, MAX_IMAGE_FILE_BYTES, readDataBytes, relPath } from "../../read/dataFiles.ts";
import { linkInWaferFolder } from "../../read/linkedFolder.ts";
import { loadImageInputs } from "./imageFiles.ts";
import { loadStructureInputs } from "./structureFiles.ts";
import type { WaferFileReader } from "../../read/waferFiles.ts";
import type { StructureInputs } from "../../model/structureInputs.ts";
import type { ImageInputs } from "../../model/imageInputs.ts";
import { readFrontMatter, lineOfField } from "../../read/frontMatter.ts";
import { readTable } from "../../read/table.ts";
import { readInstrumentTable } from "../../read/instrumentTable.ts";

export interface LoadedDevice {
  id: string;
  sweeps: Sweep[];
}

export interface LoadedWafer {
  folder: string;
  record?: WaferRecord;
  devices: LoadedDevice[];
  structure: StructureInputs;
  images: ImageInputs;
  files: RawFileInfo[];
  problems: Problem[];
}

export interface LoadContext {
  dataDir: string;
  today: string;
  siteSettings: AnalysisSettings;
  /** The names in wafers/ (SiteInputs.waferListing), read once per build; read here when absent. */
  waferListing?: readonly string[];
}

/** Every problem an InputError carries, marked with the wafer; anything else is rethrown (an internal error). */
function toProblems(err: unknown, wafer: string): Problem[] {
  if (err instanceof InputError) return err.problems.map((p) => ({ ...p, wafer }));
  throw err;
}

export async function loadWafer(folder: string, ctx: LoadContext): Promise<LoadedWafer> {
  const waferDir = path.join(ctx.dataDir, "wafers", folder);
  const recordAbs = path.join(waferDir, "wafer.md");
  const recordRel = relPath(ctx.dataDir, recordAbs);
  const out: LoadedWafer = { folder, devices: [], structure: {}, images: {}, files: [], problems: [] };
  let record: WaferRecord;
  let matterText = "";
  try {
    const f = await readDataBytes(ctx.dataDir, recordAbs);
    out.files.push(fileInfo(f.rel, f.bytes, "record"));
    const doc = readFrontMatter(decodeText(f), f.rel);
    matterText = doc.matterText;
    record = validateWafer(doc, { folder, file: f.rel, today: ctx.today, siteSettings: ctx.siteSettings });
    out.record = record;
    for (const w of deviceDimensionWarnings(record.devices, f.rel, (field) => lineOfField(doc.matterText, field, doc.firstLine)))
      out.problems.push({ ...w, wafer: folder });
  } catch (err) {
    out.problems.push(...toProblems(err, folder));
    return out;
  }
  const listing = ctx.waferListing ?? (await fs.readdir(path.join(ctx.dataDir, "wafers")));
  const twins = listing.filter((n) => n !== folder && n.toLowerCase() === folder.toLowerCase());
  if (twins.length) {
    const found = [folder, ...twins]
      .sort()
      .map((n) => JSON.stringify(n))
      .join(" and ");
    out.problems.push({
      severity: "error",
      wafer: folder,
      file: recordRel,
      line: lineOfField(matterText, "wafer", 2),
      field: "wafer",
      message: "duplicate wafer id (ids must differ by more than letter case)",
      expected: "a unique id",
      found,
      fix: "rename one of the wafers",
    });
  }
  let all: string[];
  const skippedLinks: string[] = [];
  try {
    const label = relPath(ctx.dataDir, waferDir);
    // A link to a folder, a dangling link or a loop is skipped with a warning naming it (linkedFolder.ts).
    all = (
      await listFiles(waferDir, label, async (rel) => {
        const skipped = await linkInWaferFolder(ctx.dataDir, `${label}/${rel}`);
        if (skipped) {
          out.problems.push({ ...skipped, wafer: folder });
          skippedLinks.push(rel);
        }
        return !skipped;
      })
    ).filter((f) => f !== "wafer.md");
  } catch (err) {
    out.problems.push(...toProblems(err, folder));
    return out;
  }
  for (const [i, spec] of record.devices.entries()) {
    const field = `devices[${i}].files`;
    const device: LoadedDevice = { id: spec.id, sweeps: [] };
    out.devices.push(device);
    let matched: string[];
    try {
      matched = matchGlob(spec.files, all, { file: recordRel, field });
    } catch (err) {
      out.problems.push(...toProblems(err, folder));
      continue;
    }
    if (matched.length === 0) {
      out.problems.push({
        severity: "error",
        wafer: folder,
        file: recordRel,
        line: lineOfField(matterText, field, 2),
        field,
        message: "file pattern matches no file",
        expected: "at least one sweep file",
        found: JSON.stringify(spec.files),
        fix: `check the pattern against the files in wafers/${folder}/${linksNote(folder, skippedLinks)}`,
      });
      continue;
    }
    let failed = 0;
    const ignored = new Set<string>();
    for (const rel of matched) {
      try {
        const f = await readDataBytes(ctx.dataDir, path.join(waferDir, rel));
        out.files.push(fileInfo(f.rel, f.bytes, "sweep"));
        const text = decodeText(f);
        const table = spec.reading ? readInstrumentTable(text, f.rel, spec.reading) : readTable(text, f.rel);
        for (const c of table.ignoredColumns ?? []) ignored.add(c);
        const sweep = validateSweep(table, spec.geometry);
        for (const w of sweep.warnings) out.problems.push({ ...w, wafer: folder });
        device.sweeps.push(sweep);
      } catch (err) {
        out.problems.push(...toProblems(err, folder));
        failed++;
      }
    }
    if (ignored.size) {
      // One note per device, not per file: the columns the mapping leaves out are not read.
      const names = [...ignored];
      out.problems.push({
        severity: "warning",
        wafer: folder,
        file: recordRel,
        line: lineOfField(matterText, `devices[${i}].columns`, 2),
        field: `devices[${i}].columns`,
        message: `columns not named in the mapping are ignored: ${names
          .slice(0, 8)
          .map((n) => JSON.stringify(n))
          .join(", ")}${names.length > 8 ? ` and ${names.length - 8} more` : ""}`,
        expected: "every column the analysis should read mapped in columns:",
        found: `${names.length} unmapped`,
        fix: "map a column to a quantity if the analysis should use it; otherwise nothing to do",
      });
    }
    if (failed === 0 && !device.sweeps.some((sw) => sw.kind === "field")) {
      out.problems.push({
        severity: "error",
        wafer: folder,
        file: recordRel,
        line: lineOfField(matterText, field, 2),
        field,
        message: `no field sweeps for device ${spec.id}: Hall analysis needs B sweeps`,
        expected: "at least one field sweep (a B column, with # gate:) among the device's files",
        found: `gate sweeps only (${matched.join(", ")})`,
        fix: "add the device's field sweeps to the pattern, or check that the files are not gate sweeps exported by mistake",
      });
    }
  }
  const reader = fileReader(ctx, waferDir, recordRel, matterText, all, out, skippedLinks);
  out.structure = await loadStructureInputs(record, reader);
  out.images = await loadImageInputs(record, reader);
  // Problems pushed as literals (file patterns, reports) may echo long input too.
  out.problems = out.problems.map(capProblem);
  return out;
}

/** For "matches no file": the links in the folder that were skipped, which may be why. */
function linksNote(folder: string, skipped: readonly string[]): string {
  if (!skipped.length) return "";
  const names = skipped
    .slice(0, 3)
    .map((l) => `wafers/${folder}/${l}`)
    .join(", ");
  return ` (the symbolic link${skipped.length === 1 ? "" : "s"} ${names}${skipped.length > 3 ? ` and ${skipped.length - 3} more` : ""} ${skipped.length === 1 ? "was" : "were"} skipped: see ${skipped.length === 1 ? "its warning" : "their warnings"})`;
}

function fileReader(
  ctx: LoadContext,
  waferDir: string,
  recordRel: string,
  matterText: string,
  all: string[],
  out: LoadedWafer,
  skippedLinks: readonly string[],
): WaferFileReader {
  const folder = out.folder;
  const lineOf = (field: string) => lineOfField(matterText, field, 2);
  const report = (p: Omit<Problem, "wafer">) => out.problems.push({ ...p, wafer: folder });
  return {
    wafer: folder,
    recordFile: recordRel,
    lineOf,
    report,
    glob(pattern, field) {
      try {
        const matched = matchGlob(pattern, all, { file: recordRel, field });
        if (matched.length === 0)
          report({
            severity: "error",
            file: recordRel,
            line: lineOf(field),
            field,
            message: "file pattern matches no file",
            expected: "at least one file",
            found: JSON.stringify(pattern),
            fix: `check the pattern against the files in wafers/${folder}/${linksNote(folder, skippedLinks)}`,
          });
        return matched;
      } catch (err) {
        out.problems.push(...toProblems(err, folder));
        return [];
      }
    },
    async readText(rel, role) {
      // rel comes from glob (listFiles names), yet a POSIX file name may hold a backslash (a file named a\..\b.csv matches "*.csv"): still refused here.
      checkRelativePath(rel, { file: recordRel, field: role });
      const f = await readDataBytes(ctx.dataDir, path.join(waferDir, rel));
      out.files.push(fileInfo(f.rel, f.bytes, role));
      return { rel: f.rel, text: decodeText(f) };
    },
    async readBytes(rel, role) {
      // rel is an images[i].file that validateWafer has already passed through checkRelativePath.
      const f = await readDataBytes(ctx.dataDir, path.join(waferDir, rel), MAX_IMAGE_FILE_BYTES);
      out.files.push(fileInfo(f.rel, f.bytes, role));
      return { rel: f.rel, bytes: f.bytes };
    },
    async guard(fn) {
      try {
        return await fn();
      } catch (err) {
        out.problems.push(...toProblems(err, folder));
        return undefined;
      }
    },
  };
}
