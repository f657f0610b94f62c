/**
 * Layer peaks of a reciprocal-space map (or of a peak table): assignment to
 * substrate, buffer and well, instrument-offset correction, and conversion to
 * (Qx, Qz) with uncertainties.
 *
 * Assignment (Si(001) substrate, SiGe buffer, tensile Si well):
 *  - substrate: the strongest peak within `substrateTolerance` (relative |ΔQ|,
 *    default 1.5 %) of the theoretical Si position;
 *  - buffer: the strongest remaining peak with Qz below the substrate's (larger
 *    a⊥) and, for an asymmetric reflection, |Qx| not above it (a∥ ≥ a_Si);
 *  - well: the strongest remaining peak with Qz above the substrate's (a⊥ < a_Si),
 *    |Qx| not above it; others are returned as unassigned.
 * Offset correction: constant angular offsets Δω, Δ2θ (sample tilt/miscut and
 * detector zero) chosen so the substrate peak sits at its theoretical (ω, 2θ),
 * hence at its theoretical (Qx, Qz); the same offsets are added to every peak,
 * and the substrate's angular standard errors are added in quadrature to the
 * other peaks' (the offset is estimated from it). Q errors: first-order
 * propagation of σω, σ2θ through anglesToQ (independent errors).
 * Geometry: grazing incidence when the substrate peak has ω < θ, else grazing
 * exit (Qx < 0). Angles in rad, Q in m⁻¹ including 2π, λ and a in m.
 */
import { A_SI } from "../../physics/sige.ts";
import { CU_KALPHA1 } from "../../physics/constants.ts";
import type { MapPoint, Miller, TableRow } from "../../model/structureInputs.ts";
import type { MeasuredReflection } from "./bufferRelaxation.ts";
import { anglesToQ, layerPeakQ, qToAngles } from "./reciprocalSpace.ts";
import { searchMapPeaks, type PeakSearchOptions, type RawPeak } from "./rsmPeakFind.ts";
import { median } from "simple-statistics";

export interface RsmPeak {
  /** "substrate", "buffer", "well", a stack layer name (tables) or "unassigned". */
  layer: string;
  /** Offset-corrected angles and their standard errors, rad. */
  omega: number;
  twoTheta: number;
  omegaStdErr: number;
  twoThetaStdErr: number;
  /** Offset-corrected reciprocal-space position and standard errors, m⁻¹ (includes 2π). */
  qx: number;
  qz: number;
  qxStdErr: number;
  qzStdErr: number;
  /** Height above background, counts (undefined for tables). */
  height?: number;
  method: "gaussian" | "centroid" | "table";
}

export interface RsmOptions extends PeakSearchOptions {
  reflection: Miller;
  /** m (default Cu Kα1, 0.154059292 nm). */
  wavelength?: number;
  /** Substrate lattice constant, m (default a_Si = 5.431 Å). */
  substrateLattice?: number;
  /** Relative |ΔQ| within which the substrate is sought (default 0.015). */
  substrateTolerance?: number;
  /** Apply the substrate offset correction (default true). */
  correctOffset?: boolean;
}

export type RsmPeaks =
  | {
      ok: true;
      reflection: Miller;
      wavelength: number;
      /** Map background and noise, counts (0 for tables). */
      background: number;
      noise: number;
      /** Added to measured ω and 2θ, rad. */
      offset: { omega: number; twoTheta: number };
      offsetCorrected: boolean;
      peaks: RsmPeak[];
      notes: string[];
    }
  | { ok: false; reason: string };

interface Theory {
  wavelength: number;
  omega: number;
  twoTheta: number;
  q: number;
}

function substrateTheory(opts: RsmOptions, exitGeometry: boolean): Theory {
  const wavelength = opts.wavelength ?? CU_KALPHA1;
  const a = opts.substrateLattice ?? A_SI;
  const q = layerPeakQ(a, a, opts.reflection);
  const ang = qToAngles(exitGeometry ? -q.qx : q.qx, q.qz, wavelength);
  return { wavelength, omega: ang.omega, twoTheta: ang.twoTheta, q: Math.hypot(q.qx, q.qz) };
}

function toPeak(
  layer: string,
  raw: RawPeak | (TableRow & { height?: number }),
  off: { omega: number; twoTheta: number },
  extra: { o: number; t: number },
  wavelength: number,
  method: RsmPeak["method"],
): RsmPeak {
  const omega = raw.omega + off.omega;
  const twoTheta = raw.twoTheta + off.twoTheta;
  const so = Math.hypot(raw.omegaStdErr ?? 0, extra.o);
  const st = Math.hypot(raw.twoThetaStdErr ?? 0, extra.t);
  const q = anglesToQ(omega, twoTheta, wavelength);
  const h = 1e-7;
  const dO = anglesToQ(omega + h, twoTheta, wavelength);
  const dT = anglesToQ(omega, twoTheta + h, wavelength);
  const qxStdErr = Math.hypot(((dO.qx - q.qx) / h) * so, ((dT.qx - q.qx) / h) * st);
  const qzStdErr = Math.hypot(((dO.qz - q.qz) / h) * so, ((dT.qz - q.qz) / h) * st);
  return { layer, omega, twoTheta, omegaStdErr: so, twoThetaStdErr: st, ...q, qxStdErr, qzStdErr, height: raw.height, method };
}

/** Finds, assigns and offset-corrects the layer peaks of a map (see module comment). */
export function rsmPeaks(points: readonly MapPoint[], opts: RsmOptions): RsmPeaks {
  const good = points.filter((p) => [p.omega, p.twoTheta, p.counts].every(Number.isFinite));
  if (good.length < 25) return { ok: false, reason: `the map has ${good.length} usable points; at least 25 are needed` };
  const search = searchMapPeaks(good, opts);
  if (search.peaks.length === 0) return { ok: false, reason: "no peak rises above the background" };
  const probe = substrateTheory(opts, false);
  const exit = median(good.map((p) => p.omega)) > probe.twoTheta / 2 && Math.hypot(opts.reflection[0], opts.reflection[1]) > 0;
  const th = substrateTheory(opts, exit);
  const tol = opts.substrateTolerance ?? 0.015;
  const dist = (r: RawPeak) => {
    const q = anglesToQ(r.omega, r.twoTheta, th.wavelength);
    return Math.abs(Math.hypot(q.qx, q.qz) - th.q) / th.q;
  };
  const candidates = search.peaks.filter((r) => dist(r) < tol).sort((a, b) => b.height - a.height);
  if (candidates.length === 0) return { ok: false, reason: "no peak lies near the theoretical substrate position" };
  const sub = candidates[0];
  const correct = opts.correctOffset ?? true;
  const off = correct ? { omega: th.omega - sub.omega, twoTheta: th.twoTheta - sub.twoTheta } : { omega: 0, twoTheta: 0 };
  const extra = correct ? { o: sub.omegaStdErr, t: sub.twoThetaStdErr } : { o: 0, t: 0 };
  const subPeak = toPeak("substrate", sub, off, { o: 0, t: 0 }, th.wavelength, sub.method);
  const rest = search.peaks.filter((r) => r !== sub).map((r) => toPeak("unassigned", r, off, extra, th.wavelength, r.method));
  assignLayers(subPeak, rest, Math.hypot(opts.reflection[0], opts.reflection[1]) > 0);
  return {
    ok: true,
    reflection: opts.reflection,
    wavelength: th.wavelength,
    background: search.background,
    noise: search.noise,
    offset: off,
    offsetCorrected: correct,
    peaks: [subPeak, ...rest.sort((a, b) => order(a.layer) - order(b.layer))],
    notes: [],
  };
}

const order = (l: string) => ["substrate", "buffer", "well"].indexOf(l) >>> 0;

function assignLayers(sub: RsmPeak, rest: RsmPeak[], asymmetric: boolean): void {
  const eps = 1e-3;
  const inPlaneOk = (p: RsmPeak) => !asymmetric || Math.abs(p.qx) <= Math.abs(sub.qx) * (1 + eps);
  const byHeight = rest.slice().sort((a, b) => (b.height ?? 0) - (a.height ?? 0));
  const buffer = byHeight.find((p) => p.qz < sub.qz * (1 - eps) && inPlaneOk(p));
  if (buffer) buffer.layer = "buffer";
  const well = byHeight.find((p) => p !== buffer && p.qz > sub.qz * (1 + eps) && inPlaneOk(p));
  if (well) well.layer = "well";
}

/**
 * Peak table (layer, ω, 2θ in rad, optional standard errors in rad) → corrected
 * peaks. A row named "substrate" sets the offsets; without one, no correction
 * is applied and a note says so. Missing standard errors are taken as 0.
 */
export function rsmPeaksFromTable(rows: readonly TableRow[], opts: RsmOptions): RsmPeaks {
  const good = rows.filter((r) => Number.isFinite(r.omega) && Number.isFinite(r.twoTheta) && r.layer);
  if (good.length === 0) return { ok: false, reason: "the peak table has no usable rows" };
  const notes: string[] = [];
  const sub = good.find((r) => r.layer.toLowerCase() === "substrate");
  const exit = sub ? sub.omega > sub.twoTheta / 2 && Math.hypot(opts.reflection[0], opts.reflection[1]) > 0 : false;
  const th = substrateTheory(opts, exit);
  let off = { omega: 0, twoTheta: 0 };
  let extra = { o: 0, t: 0 };
  if (sub && (opts.correctOffset ?? true)) {
    off = { omega: th.omega - sub.omega, twoTheta: th.twoTheta - sub.twoTheta };
    extra = { o: sub.omegaStdErr ?? 0, t: sub.twoThetaStdErr ?? 0 };
  } else notes.push(sub ? "offset correction switched off" : "no substrate row: angles used without offset correction");
  if (good.some((r) => r.omegaStdErr === undefined || r.twoThetaStdErr === undefined)) notes.push("some rows give no angular uncertainty; taken as 0");
  const peaks = good.map((r) => toPeak(r.layer.toLowerCase(), r, off, r === sub ? { o: 0, t: 0 } : extra, th.wavelength, "table"));
  return {
    ok: true,
    reflection: opts.reflection,
    wavelength: th.wavelength,
    background: 0,
    noise: 0,
    offset: off,
    offsetCorrected: !!sub && (opts.correctOffset ?? true),
    peaks,
    notes,
  };
}

/** The peak of `layer` as a MeasuredReflection for bufferRelaxation/wellStrain, or undefined. */
export function reflectionOf(result: RsmPeaks, layer: string): MeasuredReflection | undefined {
  if (!result.ok) return undefined;
  const p = result.peaks.find((x) => x.layer === layer);
  return p && { hkl: result.reflection, qx: p.qx, qz: p.qz, qxStdErr: p.qxStdErr, qzStdErr: p.qzStdErr };
}
