/**
 * The X-ray part of a wafer's structure analysis: layer peaks of every map or
 * peak table (rsmPeaks / rsmPeaksFromTable), then the buffer's Ge fraction and
 * relaxation from a symmetric and an asymmetric reflection (bufferRelaxation),
 * then the well's in-plane strain (wellStrain: from the well's own asymmetric
 * peak when visible, else pseudomorphic on the buffer). Pure; SI units (m, rad,
 * Q in m⁻¹ including 2π).
 */
import type { Layer } from "../../validate/wafer.ts";
import type { XrdFile, MapPoint } from "../../model/structureInputs.ts";
import { bufferRelaxation, type BufferRelaxation, type MeasuredReflection } from "./bufferRelaxation.ts";
import { reflectionOf, rsmPeaks, rsmPeaksFromTable, type RsmPeaks } from "./rsmPeaks.ts";
import { wellStrain, type WellStrain } from "./wellStrain.ts";
import type { BulkPath } from "../bulk.ts";

export interface XrdFileResult {
  file: string;
  kind: XrdFile["kind"];
  peaks: RsmPeaks;
  /** The map points (rad, counts) for pictures; absent for peak tables. */
  points?: MapPoint[];
}

export interface XrdAnalysis {
  files: XrdFileResult[];
  /** Files whose peaks gave the buffer figures. */
  symmetricFile?: string;
  asymmetricFile?: string;
  buffer: BufferRelaxation;
  strain: WellStrain;
}

const ROLES_FOR_PEAKS = new Set(["substrate", "buffer", "well"]);

/** Maps a stack layer name in a peak table to its role (substrate/buffer/well) so the usual assignment applies; other names stay. */
function tableLayer(name: string, stack: readonly Layer[]): string {
  const l = stack.find((s) => s.name.toLowerCase() === name.toLowerCase());
  return l && ROLES_FOR_PEAKS.has(l.role) ? l.role : name.toLowerCase();
}

function peaksOf(f: XrdFile, stack: readonly Layer[]): XrdFileResult {
  const opts = { reflection: f.reflection, wavelength: f.wavelength };
  if (f.kind === "map") return { file: f.file, kind: f.kind, peaks: rsmPeaks(f.points, opts), points: f.points };
  return {
    file: f.file,
    kind: f.kind,
    peaks: rsmPeaksFromTable(
      f.rows.map((r) => ({ ...r, layer: tableLayer(r.layer, stack) })),
      opts,
    ),
  };
}

const isSymmetric = (f: XrdFileResult) => f.peaks.ok && f.peaks.reflection[0] === 0 && f.peaks.reflection[1] === 0;

/** Peaks, buffer composition and relaxation, and well strain from a wafer's XRD files (see module comment). Never throws for data. */
export function analyseXrd(files: readonly XrdFile[], stack: readonly Layer[]): XrdAnalysis {
  const results = files.map((f) => peaksOf(f, stack));
  const withBuffer = results.filter((r) => reflectionOf(r.peaks, "buffer"));
  const sym = withBuffer.find(isSymmetric);
  const asym = withBuffer.find((r) => !isSymmetric(r));
  let buffer: BufferRelaxation;
  if (!asym) {
    const failed = results.filter((r) => !r.peaks.ok).map((r) => `${r.file}: ${(r.peaks as { reason: string }).reason}`);
    buffer = { ok: false, reason: `no asymmetric reflection (such as 224) with a buffer peak${failed.length ? ` (${failed.join("; ")})` : ""}` };
  } else {
    buffer = bufferRelaxation({ asymmetric: reflectionOf(asym.peaks, "buffer")!, symmetric: sym ? reflectionOf(sym.peaks, "buffer") : undefined });
  }
  const wellPeak: MeasuredReflection | undefined = asym ? reflectionOf(asym.peaks, "well") : undefined;
  const strain = wellStrain({
    wellAsymmetric: wellPeak,
    bufferAParallel: buffer.ok ? buffer.aParallel : undefined,
    bufferAParallelStdErr: buffer.ok ? buffer.aParallelStdErr : undefined,
  });
  return { files: results, symmetricFile: sym?.file, asymmetricFile: asym?.file, buffer, strain };
}

/** Reciprocal-space map points, dropped from the slim form (src/analyse/bulk.ts). */
export const XRD_BULK: BulkPath[] = [{ path: ["files", "*", "points"] satisfies [keyof XrdAnalysis, "*", keyof XrdFileResult], drop: true }];
