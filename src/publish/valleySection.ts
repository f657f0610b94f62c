/**
 * Page model of the "valley splitting (predicted)" part of the structure
 * section: the Ge fraction on the atomic layers (model) beside the measured
 * profile with the envelope |ψ|² drawn over it, the predicted distribution of
 * E_v with the threshold marked, the five figures, the settings used, where
 * the measurement departs from the model, and the caution. Every number is
 * formatted here (energies in µeV). Returns undefined when no profile was analysed.
 */
import type { StructureAnalysis } from "../analyse/structure/index.ts";
import { VALLEY_GRID_NM } from "../analyse/structure/valleySplitting.ts";
import { markerSeries, traceSeries, type ChartSeries, type ChartSpec } from "./charts.ts";
import { formatNumber } from "../model/format.ts";

export interface ValleySectionModel {
  file: string;
  reason?: string;
  charts: ChartSpec[];
  figures: { label: string; value: string }[];
  settings: { label: string; value: string }[];
  /** Where the measured profile departs from the model by more than its noise; undefined when it does not. */
  departure?: string;
  caution: string;
}

/** The caution shown with every prediction (also in docs/formats.md). */
export const VALLEY_CAUTION =
  "This is a model estimate of a distribution, not a measurement. It assumes the measured profile represents the whole wafer, and it ignores atomic steps, miscut and strain variations. Its constants come from the literature. It is sensitive to choices the measurement does not fix: which atomic plane is depth zero (a shift of a0/8 can change the deterministic part by tens of percent), the vertical field (the field at the electrons is nearer e·n/2ε than e·n/ε in an undoped stack, which lowers the splittings), and the profile's depth resolution (a broadened SIMS edge lowers the deterministic part; an atom-probe and an image of the same wafer can differ several-fold). Read the figures as a ranking of wafers, not as values. Confirm valley splittings on devices (for example by magnetospectroscopy or pulsed-gate spectroscopy) before any decision that matters.";

const J_PER_UEV = 1.602176634e-25;
const J_PER_MEV = 1.602176634e-22;
const J_PER_EV = 1.602176634e-19;
const ueV = (j: number, digits = 3) => `${formatNumber(j / J_PER_UEV, digits)} µeV`;
/** "v ± u µeV" with u the standard uncertainty from the profile fit (valleyUncertainty.ts), or the value alone when u is 0 or not finite. */
const ueVpm = (j: number, u: number) => (Number.isFinite(u) && u > 0 ? `${formatNumber(j / J_PER_UEV, 3)} ± ${formatNumber(u / J_PER_UEV, 2)} µeV` : ueV(j));

export function valleySection(s: StructureAnalysis, measured?: { depth: readonly number[]; ge: readonly number[] }): ValleySectionModel | undefined {
  const v = s.valley;
  if (!v) return undefined;
  const r = v.result;
  if (!r.ok) return { file: v.file, reason: r.reason, charts: [], figures: [], settings: [], caution: VALLEY_CAUTION };
  const { depth, ge, weight } = r.layers;
  const lo = depth[0];
  const hi = depth[depth.length - 1];
  const series: ChartSeries[] = [];
  if (measured) {
    const keep = measured.depth.map((_, i) => i).filter((i) => measured.depth[i] >= lo && measured.depth[i] <= hi);
    series.push(
      traceSeries(
        "Ge fraction (measured)",
        keep.map((i) => measured.depth[i]),
        keep.map((i) => measured.ge[i]),
        "data",
        300,
      ),
    );
  }
  series.push(traceSeries("Ge fraction on the atomic layers (model)", depth, ge, "third", 400));
  const wMax = Math.max(...weight);
  const xMax = Math.max(...ge);
  const scale = wMax > 0 ? xMax / wMax : 1;
  series.push(
    traceSeries(
      `|ψ|² per layer (scaled: peak ${formatNumber(wMax, 3)} drawn at ${formatNumber(xMax, 3)})`,
      depth,
      weight.map((w) => w * scale),
      "second",
      400,
    ),
  );
  const profileChart: ChartSpec = {
    id: "valley-layers",
    title: `Ge fraction on the (001) atomic layers with the envelope |ψ|² (${v.file})`,
    x: { label: "Depth (nm)" },
    y: { label: "Ge fraction" },
    series,
    summary: `${depth.length} atomic layers from ${formatNumber(lo, 4)} to ${formatNumber(hi, 4)} nm; barrier Ge ${formatNumber(r.xTop, 3)} above and ${formatNumber(r.xBottom, 3)} below, well Ge ${formatNumber(r.xWell, 2)}; the envelope's largest layer weight is ${formatNumber(wMax, 3)}`,
  };
  const e = r.distribution.energy.map((x) => x / J_PER_UEV);
  const dens = r.distribution.density.map((p) => p * J_PER_UEV);
  const peak = Math.max(...dens);
  const marker = (label: string, at: number, role: ChartSeries["role"]): ChartSeries => ({
    ...markerSeries(
      label,
      [
        [at / J_PER_UEV, 0],
        [at / J_PER_UEV, peak],
      ],
      role,
    ),
    line: true,
  });
  const threshold = r.settings.threshold / J_PER_UEV;
  const distChart: ChartSpec = {
    id: "valley-distribution",
    title: "Predicted distribution of the valley splitting E_v over dots",
    x: { label: "E_v (µeV)" },
    y: { label: "Probability density (1/µeV)" },
    series: [traceSeries("Predicted density of E_v", e, dens, "data", 200), marker("10th percentile", r.p10, "reference"), marker("Mean", r.mean, "fit")],
    limits: [{ axis: "x", min: threshold, label: `threshold ${formatNumber(threshold, 3)} µeV` }],
    summary: `Rician distribution of E_v: mean ${ueV(r.mean)}, 10th percentile ${ueV(r.p10)}, deterministic part ${ueV(r.deterministicSplitting)}, disorder σ ${ueV(r.sigma)}; ${formatNumber(r.yieldFraction * 100, 3)} % of dots reach the threshold of ${formatNumber(threshold, 3)} µeV (shaded)`,
  };
  const fieldFrom =
    r.fieldSource === "setting"
      ? "setting valley_field"
      : r.fieldSource === "density"
        ? `e·n/(ε0·11.7), n = ${formatNumber((r.electronDensity ?? NaN) * 1e-4, 3)} cm⁻² (density at peak mobility, mean over devices)`
        : "default: no transport data";
  return {
    file: v.file,
    charts: [profileChart, distChart],
    figures: [
      { label: "Mean E_v", value: ueVpm(r.mean, r.stdErr.mean) },
      { label: "10th percentile of E_v", value: ueVpm(r.p10, r.stdErr.p10) },
      { label: "Deterministic part 2|Δ0| (interface shape)", value: ueVpm(r.deterministicSplitting, r.stdErr.deterministicSplitting) },
      { label: "Disorder σ (each component of δ)", value: ueVpm(r.sigma, r.stdErr.sigma) },
      // σ is on the scale of one component of Δ; the E_v that disorder alone would give is on the scale of 2|Δ0| above.
      { label: "Disorder alone: mean E_v = √(2π)·σ", value: ueV(Math.sqrt(2 * Math.PI) * r.sigma) },
      {
        label: `Yield: dots with E_v ≥ ${formatNumber(threshold, 3)} µeV`,
        value:
          Number.isFinite(r.stdErr.yieldFraction) && r.stdErr.yieldFraction > 0
            ? `${formatNumber(r.yieldFraction * 100, 3)} ± ${formatNumber(r.stdErr.yieldFraction * 100, 2)} %`
            : `${formatNumber(r.yieldFraction * 100, 3)} %`,
      },
    ],
    settings: [
      { label: "Vertical field F", value: `${formatNumber(r.field / 1e6, 3)} MV/m (${fieldFrom})` },
      {
        label: "Dot orbital energy E_orb (dot radius a_dot)",
        value: `${formatNumber(r.settings.orbitalEnergy / J_PER_MEV, 3)} meV (${formatNumber(r.dotRadius, 4)} nm)`,
      },
      {
        label: "Band offset per unit Ge b",
        value: `${formatNumber(r.settings.bandOffset / J_PER_EV, 3)} eV (${formatNumber((r.settings.bandOffset * r.xTop) / J_PER_MEV, 3)} meV at the top barrier)`,
      },
      {
        label: "Uncertainties (±)",
        value:
          "one standard uncertainty from the profile fit's errors on the interface centres and widths only (the model's constants, the field and the caution's choices are not in it)",
      },
      { label: "Threshold of the yield", value: `${formatNumber(threshold, 3)} µeV` },
      {
        label: "Ge fraction: top barrier, well, bottom barrier",
        value: `${formatNumber(r.xTop, 3)}, ${formatNumber(r.xWell, 2)}, ${formatNumber(r.xBottom, 3)}`,
      },
      { label: "Grid", value: `${formatNumber(VALLEY_GRID_NM, 2)} nm steps, hard walls 10 nm beyond the interface centres; layers every a0/4 = 0.135775 nm` },
    ],
    departure: r.departure.ranges.length
      ? `The measured profile departs from the two-interface model by more than its noise (point-to-point noise ${formatNumber(r.departure.noise, 2)} in Ge fraction; largest 5-point mean departure ${formatNumber(r.departure.largest, 2)} near ${formatNumber(r.departure.largestDepth, 4)} nm) at ${r.departure.ranges.map(([a, b]) => `${formatNumber(a, 4)}–${formatNumber(b, 4)} nm`).join(", ")}. Such features (a spike, a graded well) are not in the prediction.`
      : undefined,
    caution: VALLEY_CAUTION,
  };
}
