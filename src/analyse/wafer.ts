/**
 * Analyses one wafer: every device's sweeps → transport points → device
 * summary → device metrics (in metric units). Pure: takes validated sweeps and
 * settings, returns figures and the reasons for anything skipped.
 */
import type { AnalysisSettings } from "../validate/settings.ts";
import type { Sweep } from "../validate/sweep.ts";
import type { DeviceSpec, Layer } from "../validate/wafer.ts";
import { analyseStructure, STRUCTURE_BULK, type StructureAnalysis } from "./structure/index.ts";
import type { StructureInputs } from "../model/structureInputs.ts";
import { analyseImages, type ImageAnalysis } from "./images/index.ts";
import type { ImageInputs } from "../model/imageInputs.ts";
import type { ConditionSource } from "../model/conditionSource.ts";
import { analyseDeviceDepth, DEVICE_DEPTH_BULK, type DeviceDepth } from "./transport/deviceDepth.ts";
import { putMetric } from "../model/metrics.ts";
import { analyseFieldSweep, type TransportPoint } from "./transport/fieldSweep.ts";
import { pointsCalibration, sortByGate, summariseDevice, type DeviceSummary } from "./transport/deviceSummary.ts";
import { under } from "./bulk.ts";

export interface DeviceInput {
  spec: DeviceSpec;
  sweeps: Sweep[];
}

export interface SkippedFile {
  file: string;
  reason: string;
}

export interface DeviceAnalysis {
  id: string;
  geometry: DeviceSpec["geometry"];
  at_mm?: [number, number];
  points: TransportPoint[];
  gateSweeps: Sweep[];
  skipped: SkippedFile[];
  /** Each sweep file's conditions and where they came from (carried from validation for the page), in file order. */
  conditions: { file: string; kind: Sweep["kind"]; sources: ConditionSource[] }[];
  summary?: DeviceSummary;
  depth?: DeviceDepth;
  /** Metric key → value in the metric's unit. */
  metrics: Record<string, number>;
}

export interface WaferAnalysis {
  devices: DeviceAnalysis[];
  structure?: StructureAnalysis;
  images?: ImageAnalysis;
}

export interface WaferInputs {
  devices: DeviceInput[];
  structure: StructureInputs;
  images: ImageInputs;
  stack: Layer[];
}

export function analyseDevice(input: DeviceInput, settings: AnalysisSettings): DeviceAnalysis {
  const points: TransportPoint[] = [];
  const skipped: SkippedFile[] = [];
  const gateSweeps: Sweep[] = [];
  for (const sweep of input.sweeps) {
    if (sweep.kind === "gate") {
      gateSweeps.push(sweep);
      continue;
    }
    const r = analyseFieldSweep(sweep, input.spec, settings);
    if (r.ok) points.push(r.point);
    else skipped.push({ file: r.file, reason: r.reason });
  }
  const sorted = sortByGate(points);
  // One n(Vg) fit per device, shared by the summary (gate fit) and the depth analysis (gate capacitance, gate sweeps).
  const calibration = pointsCalibration(sorted);
  const summary = summariseDevice(points, calibration);
  const metrics: Record<string, number> = {};
  const put = (key: string, si: number | undefined) => putMetric(metrics, key, si);
  if (summary) {
    put("peak_mobility", summary.peakMobility);
    put("density_at_peak_mobility", summary.densityAtPeakMobility);
    put("gate_density_slope", summary.gateFit?.slope);
    put("turn_on_voltage", summary.gateFit?.turnOn);
  }
  const depth = analyseDeviceDepth(sorted, gateSweeps, settings, input.spec, calibration);
  if (depth) Object.assign(metrics, depth.metrics);
  const conditions = input.sweeps.map((s) => ({ file: s.file, kind: s.kind, sources: s.conditions ?? [] }));
  return {
    id: input.spec.id,
    geometry: input.spec.geometry,
    at_mm: input.spec.at_mm,
    points: sorted,
    gateSweeps,
    skipped,
    conditions,
    summary,
    depth,
    metrics,
  };
}

/** The wafer's electron density at peak mobility, m⁻²: the mean over its devices (as the metric's default aggregate), or undefined. */
function waferDensity(devices: DeviceAnalysis[]): number | undefined {
  const n = devices.map((d) => d.summary?.densityAtPeakMobility).filter((v): v is number => v !== undefined && Number.isFinite(v) && v > 0);
  return n.length ? n.reduce((a, b) => a + b, 0) / n.length : undefined;
}

export function analyseWafer(inputs: WaferInputs, settings: AnalysisSettings): WaferAnalysis {
  const devices = inputs.devices.map((d) => analyseDevice(d, settings));
  return {
    devices,
    structure: analyseStructure(inputs.structure, inputs.stack, settings, {
      electronDensity: waferDensity(devices),
      parallelConduction: devices.some((d) => (d.depth?.parallelConduction.length ?? 0) > 0),
    }),
    images: analyseImages(inputs.images, inputs.stack, settings),
  };
}

/** Every plain bulk array of a wafer analysis (src/analyse/bulk.ts); the images' bulk data are typed arrays. */
export const WAFER_BULK = [...under(["devices", "*", "depth"], DEVICE_DEPTH_BULK), ...under(["structure"], STRUCTURE_BULK)];
