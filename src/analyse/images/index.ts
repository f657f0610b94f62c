/**
 * Lattice-image analysis of one wafer: Z-contrast interface widths and
 * geometric phase analysis. Extension point: inputs from
 * src/validate/load/imageFiles.ts, metrics in src/model/metrics/images.ts.
 *
 * Per image: (1) the Z-contrast profile (zContrastProfile.ts) gives the tilt
 * of the interfaces and the well band; its 10–90 % widths are reported for
 * HAADF images only (HRTEM contrast follows focus and thickness, not atomic
 * number; the band still locates the well when it stands out); (2) GPA
 * (geometricPhase.ts, Hÿtch, Snoeck & Kilaas 1998) relative to the reference
 * region (given in wafer.md, or by default a rectangle inside the lower
 * barrier), in the interface frame tilted by the profile's tilt; (3) well
 * coherence (wellCoherence.ts) against the out-of-plane strain expected from
 * the stack (expectedWellStrain.ts). Wafer metrics come from the first image
 * that gives each figure. Pure: no files, no clock.
 */
import type { Layer } from "../../validate/wafer.ts";
import type { AnalysisSettings } from "../../validate/settings.ts";
import { putMetric } from "../../model/metrics.ts";
import { expectedWellStrain, type ExpectedWellStrain } from "./expectedWellStrain.ts";
import { geometricPhase, type GpaResult } from "./geometricPhase.ts";
import { growthCoordinate } from "./geometry.ts";
import type { GrowthAxis, PixelRect, ImageInputs, MicrographInput } from "../../model/imageInputs.ts";
import { wellCoherence, type WellCoherenceResult } from "./wellCoherence.ts";
import { zContrastProfile, type ZContrastResult } from "./zContrastProfile.ts";
import { withPeakSearchMemo } from "./latticeSpacing.ts";
import { degToRad } from "../numeric/angle.ts";

export interface ImageResult {
  input: MicrographInput;
  /** Z-contrast profile, or why there is none. */
  profile: ZContrastResult;
  /** Why the interface widths are not reported (HRTEM, or the profile failed), else null. */
  widthsSkipped: string | null;
  gpa: GpaResult;
  /** Where the GPA reference came from, in plain words. */
  referenceSource: string;
  coherence: WellCoherenceResult;
  expected: ExpectedWellStrain;
  /** Plain-words findings: tilt, coherence. */
  findings: string[];
}

export interface ImageAnalysis {
  /** Wafer-level metric values in each metric's unit. */
  metrics: Record<string, number>;
  images: ImageResult[];
  /** Which image gave the metrics (index into images), per metric key. */
  metricSource: Record<string, number>;
}

/** A rectangle inside the growth band [sLo, sHi] (growth coordinate, pixels), or null when too thin. */
export function bandRectangle(width: number, height: number, axis: GrowthAxis, tilt_deg: number, sLo: number, sHi: number, border: number): PixelRect | null {
  const vertical = axis === "up" || axis === "down";
  const across = vertical ? width : height;
  const along = vertical ? height : width;
  const slack = Math.abs(Math.tan(degToRad(tilt_deg))) * (across / 2 - border);
  const lo = sLo + slack;
  const hi = sHi - slack;
  const c = (along - 1) / 2;
  const sign = axis === "up" || axis === "left" ? -1 : 1;
  const a = Math.max(border, Math.ceil(Math.min(c + sign * lo, c + sign * hi)));
  const b = Math.min(along - border, Math.floor(Math.max(c + sign * lo, c + sign * hi)));
  if (b - a < 8 || across - 2 * border < 8) return null;
  return vertical ? [border, a, width - border, b] : [a, border, b, height - border];
}

/** Growth-coordinate band [min, max] covered by a pixel rectangle. */
function rectangleBand(m: MicrographInput, r: PixelRect, tilt_deg: number) {
  const t = degToRad(tilt_deg);
  const s = [
    [r[0], r[1]],
    [r[2] - 1, r[1]],
    [r[0], r[3] - 1],
    [r[2] - 1, r[3] - 1],
  ].map(([x, y]) => growthCoordinate(x, y, m.width, m.height, m.growthAxis, t));
  return { bottom_px: Math.min(...s), top_px: Math.max(...s) };
}

function tiltFinding(p: ZContrastResult): string | null {
  if (!p.ok) return null;
  const t = Math.abs(p.tilt_deg).toFixed(1);
  return p.tilted
    ? `The interfaces are tilted by ${p.tilt_deg.toFixed(1)}° from the image axis; the profile was averaged along the tilted direction and the strain maps use the tilted frame.`
    : `The interfaces run parallel to the image axis (tilt ${t}°, within the 1° tolerance).`;
}

/**
 * Analyses one micrograph; see the module comment. Its Bragg-peak searches share one memo
 * (latticeSpacing.ts withPeakSearchMemo), dropped when this returns.
 */
export function analyseMicrograph(m: MicrographInput, stack: Layer[]): ImageResult {
  return withPeakSearchMemo(() => analyseOne(m, stack));
}

function analyseOne(m: MicrographInput, stack: Layer[]): ImageResult {
  const { width, height, pixels, growthAxis } = m;
  const profile = zContrastProfile(pixels, width, height, { pixelSize_m: m.pixelSize_m, growthAxis });
  const widthsSkipped =
    m.kind === "hrtem"
      ? "interface widths are measured on HAADF images only: HRTEM contrast follows focus and specimen thickness, not atomic number"
      : profile.ok
        ? null
        : profile.reason;
  const tilt = profile.ok ? profile.tilt_deg : 0;
  let reference = m.reference;
  let referenceSource = reference ? `the region [${reference.join(", ")}] given in wafer.md` : "";
  if (!reference && profile.ok) {
    const th = profile.well.top_px - profile.well.bottom_px;
    const margin = Math.max(10, 0.15 * th);
    const r = bandRectangle(width, height, growthAxis, tilt, profile.well.bottom_px - margin - Math.max(th, 20), profile.well.bottom_px - margin, 16);
    if (r) {
      reference = r;
      referenceSource = `the lower barrier, pixels [${r.join(", ")}]`;
    }
  }
  if (!reference) referenceSource = "the whole image (no well band found to place a lower-barrier reference)";
  const gpa = geometricPhase(pixels, width, height, { growthAxis, frameTilt_deg: tilt, reference });
  const expected = expectedWellStrain(stack);
  let coherence: WellCoherenceResult;
  if (!gpa.ok) coherence = { ok: false, reason: `no strain maps: ${gpa.reason}` };
  else if (!profile.ok) coherence = { ok: false, reason: `the well could not be located: ${profile.reason}` };
  else {
    coherence = wellCoherence(gpa, {
      well: profile.well,
      tilt_deg: tilt,
      reference: m.reference ? rectangleBand(m, m.reference, tilt) : undefined,
      expectedOutOfPlane_pct: expected.ok ? expected.outOfPlane_pct : null,
    });
  }
  const findings: string[] = [];
  const tf = tiltFinding(profile);
  if (tf) findings.push(tf);
  if (coherence.ok) {
    if (coherence.coherent) findings.push("The well is coherent with the reference lattice: the in-plane spacing runs unchanged across both interfaces.");
    else findings.push(...coherence.findings.map((f) => `${f[0].toUpperCase()}${f.slice(1)}.`));
  }
  return { input: m, profile, widthsSkipped, gpa, referenceSource, coherence, expected, findings };
}

/** Lattice-image analysis of a wafer (see the module comment); undefined when the wafer has no images. */
export function analyseImages(inputs: ImageInputs, stack: Layer[], _settings: AnalysisSettings): ImageAnalysis | undefined {
  const list = inputs.micrographs ?? [];
  if (list.length === 0) return undefined;
  const images = list.map((m) => analyseMicrograph(m, stack));
  const metrics: Record<string, number> = {};
  const metricSource: Record<string, number> = {};
  // First value wins: a later image never overwrites a metric an earlier one gave.
  const put = (key: string, si: number, i: number) => {
    if (!(key in metrics) && putMetric(metrics, key, si)) metricSource[key] = i;
  };
  images.forEach((r, i) => {
    if (r.profile.ok && r.widthsSkipped === null) {
      put("interface_width_top_image", r.profile.top.width10to90_m, i);
      put("interface_width_bottom_image", r.profile.bottom.width10to90_m, i);
    }
    if (r.coherence.ok) {
      put("interface_inplane_mismatch", r.coherence.inPlaneMismatch_pct.value / 100, i);
      put("interface_outofplane_strain", r.coherence.outOfPlaneStrain_pct.value / 100, i);
    }
  });
  return { metrics, images, metricSource };
}
