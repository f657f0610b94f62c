/**
 * Structure analysis of one wafer: X-ray diffraction (buffer composition and
 * relaxation, well strain), critical thickness of the well, depth profiles
 * (interface widths, well thickness, barrier Ge, contaminants), the
 * valley splitting predicted from the profile's fitted interfaces
 * (valleySplitting.ts), and the
 * comparison of measured with design (stack) values. Inputs from
 * src/validate/load/structureFiles.ts, metrics in src/model/metrics/structure.ts. Pure; SI inside, metric
 * values in each metric's unit.
 */
import type { Layer } from "../../validate/wafer.ts";
import type { AnalysisSettings } from "../../validate/settings.ts";
import type { DepthProfileFile, StructureInputs } from "../../model/structureInputs.ts";
import { putMetric } from "../../model/metrics.ts";
import { analyseDepthProfile, DEPTH_PROFILE_BULK, type DepthProfileResult } from "./depthProfile.ts";
import { analyseXrd, XRD_BULK, type XrdAnalysis } from "./xrdAnalysis.ts";
import { checkCriticalThickness, type CriticalThicknessCheck } from "./criticalThicknessCheck.ts";
import { REGISTERED_CONTAMINANTS } from "../../model/metrics/structure.ts";
import { strainedSiOnRelaxedSiGe } from "../../physics/sige.ts";
import { predictValleySplitting, type ValleySplitting } from "./valleySplitting.ts";
import { fields, under } from "../bulk.ts";

export interface ProfileAnalysis {
  data: DepthProfileFile;
  result: DepthProfileResult;
}

/** One line of the design-versus-measured table; values in `unit`. */
export interface DesignRow {
  quantity: string;
  unit: string;
  design?: number;
  measured?: number;
  measuredStdErr?: number;
  source: string;
}

export interface Finding {
  severity: "flag" | "note";
  text: string;
}

export interface StructureAnalysis {
  /** Wafer-level metric values in each metric's unit. */
  metrics: Record<string, number>;
  xrd?: XrdAnalysis;
  profiles: ProfileAnalysis[];
  critical: CriticalThicknessCheck;
  design: DesignRow[];
  findings: Finding[];
  /** Peak contaminant level in or near the well per element (all elements, registered or not), cm⁻³. */
  contaminantPeaks: Record<string, number>;
  /** Valley splitting predicted from the analysed profile (absent when no profile was analysed). */
  valley?: { file: string; result: ValleySplitting };
  /** Metrics shown but not to be judged, with the reason (a premise of their analysis does not hold); see valleyPremises. */
  notJudged: Record<string, string>;
}

/** What the structure analysis takes from other sections of the wafer. */
export interface StructureContext {
  /** The wafer's electron density at peak mobility (mean over its devices), m⁻²; sets the field of the valley prediction. */
  electronDensity?: number;
  /** True when a device of the wafer flags probable parallel conduction (Hall vs SdH density). */
  parallelConduction?: boolean;
}

export const VALLEY_METRICS = [
  "valley_splitting_mean",
  "valley_splitting_p10",
  "valley_splitting_deterministic",
  "valley_splitting_disorder",
  "valley_splitting_yield",
] as const;

/**
 * Why the valley figures must not be judged, or null: the measured profile departs from the
 * two-interface model the prediction is made from (a spike or a graded well the prediction leaves
 * out), or the field comes from a Hall density that, with parallel conduction, may include the parallel channel.
 */
export function valleyPremises(v: ValleySplitting, context: StructureContext): string | null {
  if (!v.ok) return null;
  const reasons: string[] = [];
  if (v.departure.ranges.length) {
    const where = v.departure.ranges.map(([a, b]) => `${a.toFixed(1)}–${b.toFixed(1)} nm`).join(", ");
    reasons.push(`the measured Ge profile departs from the two-interface model the prediction is made from (at ${where})`);
  }
  if (context.parallelConduction && v.fieldSource === "density") {
    reasons.push("the field comes from the Hall density, and parallel conduction is flagged, so that density may include the parallel channel");
  }
  return reasons.length ? reasons.join("; ") : null;
}

const layerOf = (stack: readonly Layer[], role: Layer["role"]) => stack.find((l) => l.role === role);

function contaminantPeaks(p: ProfileAnalysis | undefined): Record<string, number> {
  const out: Record<string, number> = {};
  if (!p?.result.ok) return out;
  for (const c of p.result.contaminants) {
    const v = Math.max(c.insidePeak ?? -Infinity, c.nearPeak ?? -Infinity);
    if (Number.isFinite(v)) out[c.element] = v;
  }
  return out;
}

function designRows(stack: readonly Layer[], xrd: XrdAnalysis | undefined, prof: ProfileAnalysis | undefined, _crit: CriticalThicknessCheck): DesignRow[] {
  const rows: DesignRow[] = [];
  const buffer = layerOf(stack, "buffer");
  const barrier = layerOf(stack, "barrier");
  const well = layerOf(stack, "well");
  const b = xrd?.buffer.ok ? xrd.buffer : undefined;
  rows.push({
    quantity: "Buffer Ge fraction",
    unit: "1",
    design: buffer?.ge,
    measured: b?.geFraction,
    measuredStdErr: b?.geFractionStdErr,
    source: "X-ray 004 + 224",
  });
  rows.push({
    quantity: "Buffer relaxation",
    unit: "%",
    measured: b && b.relaxation * 100,
    measuredStdErr: b && b.relaxationStdErr * 100,
    source: "X-ray 224",
  });
  const s = xrd?.strain.ok ? xrd.strain : undefined;
  rows.push({
    quantity: "Well in-plane strain",
    unit: "%",
    design: buffer?.ge !== undefined ? strainedSiOnRelaxedSiGe(buffer.ge).epsParallel * 100 : undefined,
    measured: s && s.epsParallel * 100,
    measuredStdErr: s && s.epsParallelStdErr * 100,
    source: s ? (s.source === "well-peak" ? "well peak" : "buffer a∥, well assumed pseudomorphic") : "—",
  });
  const r = prof?.result.ok ? prof.result : undefined;
  rows.push({
    quantity: "Well thickness",
    unit: "nm",
    design: well?.thickness_nm,
    measured: r?.wellThickness,
    measuredStdErr: r?.wellThicknessStdErr,
    source: prof ? `${prof.data.method} profile` : "—",
  });
  rows.push({
    quantity: "Barrier Ge fraction",
    unit: "1",
    design: barrier?.ge,
    measured: r?.barrierGeFraction,
    source: prof ? `${prof.data.method} profile` : "—",
  });
  rows.push({ quantity: "Minimum Ge in the well", unit: "1", design: well?.ge, measured: r?.wellGeMin, source: prof ? `${prof.data.method} profile` : "—" });
  return rows;
}

function findings(xrd: XrdAnalysis | undefined, profiles: ProfileAnalysis[], crit: CriticalThicknessCheck): Finding[] {
  const out: Finding[] = [];
  if (crit.ok && crit.beyond) out.push({ severity: "flag", text: crit.statement });
  else if (crit.ok) out.push({ severity: "note", text: crit.statement });
  else out.push({ severity: "note", text: `Critical thickness not checked: ${crit.reason}` });
  if (xrd && !xrd.buffer.ok) out.push({ severity: "note", text: `Buffer figures not computed: ${xrd.buffer.reason}` });
  if (xrd?.strain.ok)
    out.push({
      severity: "note",
      text:
        xrd.strain.source === "well-peak"
          ? "Well strain measured from the well's own asymmetric peak."
          : "No well peak found in the asymmetric map: the well is assumed pseudomorphic on the buffer (its in-plane lattice constant is the buffer's).",
    });
  for (const p of profiles) if (!p.result.ok) out.push({ severity: "note", text: `${p.data.file}: depth profile not analysed: ${p.result.reason}` });
  return out;
}

/** Runs the structure analyses of one wafer (see module comment); undefined when the wafer has no XRD or profile files. Never throws for data. */
export function analyseStructure(
  inputs: StructureInputs,
  stack: Layer[],
  settings: AnalysisSettings,
  context: StructureContext = {},
): StructureAnalysis | undefined {
  const xrdFiles = inputs.xrd ?? [];
  const profFiles = inputs.profiles ?? [];
  if (xrdFiles.length === 0 && profFiles.length === 0) return undefined;
  const xrd = xrdFiles.length ? analyseXrd(xrdFiles, stack) : undefined;
  const profiles = profFiles.map((data) => ({ data, result: analyseDepthProfile({ depth: data.depth, ge: data.ge, contaminants: data.contaminants }) }));
  const prof = profiles.find((p) => p.result.ok) ?? profiles[0];
  const r = prof?.result.ok ? prof.result : undefined;
  const crit = checkCriticalThickness(stack, xrd?.strain, r ? r.wellThickness * 1e-9 : undefined);
  const metrics: Record<string, number> = {};
  const put = (key: string, si: number | undefined) => putMetric(metrics, key, si);
  if (xrd?.buffer.ok) {
    put("ge_fraction", xrd.buffer.geFraction);
    put("buffer_relaxation", xrd.buffer.relaxation);
  }
  if (xrd?.strain.ok) put("well_strain", xrd.strain.epsParallel);
  if (crit.ok) {
    put("critical_thickness", crit.matthewsBlakeslee);
    put("critical_thickness_margin", crit.margin);
  }
  if (r) {
    put("well_thickness", r.wellThickness * 1e-9);
    put("interface_width_top", r.top.width10to90 * 1e-9);
    put("interface_width_bottom", r.bottom.width10to90 * 1e-9);
    put("barrier_ge_fraction", r.barrierGeFraction);
  }
  const peaks = contaminantPeaks(prof);
  for (const el of REGISTERED_CONTAMINANTS) put(`peak_${el}`, peaks[el] === undefined ? undefined : peaks[el] * 1e6);
  const valley =
    r && prof
      ? {
          file: prof.data.file,
          result: predictValleySplitting(
            { depth: prof.data.depth, ge: prof.data.ge, top: r.top, bottom: r.bottom, electronDensity: context.electronDensity },
            {
              field: settings.valley_field,
              orbitalEnergy: settings.valley_dot_orbital_energy,
              bandOffset: settings.valley_band_offset_per_ge,
              threshold: settings.valley_splitting_threshold,
            },
          ),
        }
      : undefined;
  if (valley?.result.ok) {
    const v = valley.result;
    put("valley_splitting_mean", v.mean);
    put("valley_splitting_p10", v.p10);
    put("valley_splitting_deterministic", v.deterministicSplitting);
    put("valley_splitting_disorder", v.sigma);
    put("valley_splitting_yield", v.yieldFraction);
  }
  const notJudged: Record<string, string> = {};
  const premise = valley ? valleyPremises(valley.result, context) : null;
  if (premise) for (const key of VALLEY_METRICS) if (key in metrics) notJudged[key] = premise;
  const found = findings(xrd, profiles, crit);
  if (valley && !valley.result.ok) found.push({ severity: "note", text: `Valley splitting not predicted: ${valley.result.reason}` });
  return { metrics, xrd, profiles, critical: crit, design: designRows(stack, xrd, prof, crit), findings: found, contaminantPeaks: peaks, valley, notJudged };
}

/** The structure section's bulk arrays (src/analyse/bulk.ts): profile columns, interface curves, XRD map points. */
export const STRUCTURE_BULK = [
  ...under(["profiles", "*", "data"], fields<DepthProfileFile>("depth", "ge")),
  ...under(["profiles", "*", "result"], DEPTH_PROFILE_BULK),
  ...under(["xrd"], XRD_BULK),
  // The valley prediction's atomic-layer profile and its E_v distribution (valleySplitting.ts), drawn only.
  ...under(["valley", "result", "layers"], [{ path: ["depth"] }, { path: ["ge"] }, { path: ["weight"] }]),
  ...under(["valley", "result", "distribution"], [{ path: ["energy"] }, { path: ["density"] }]),
];
