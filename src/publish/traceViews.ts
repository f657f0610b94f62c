/**
 * Field-sweep charts with one view per gate voltage (the page's <select>
 * switches them; assets/charts.js):
 *   - ρxx and Rxy against |B| on their own axes: ρxx in Ω/□ on the left,
 *     Rxy in kΩ on the right, so the Shubnikov–de Haas oscillations of ρxx
 *     stay visible beside the Hall slope;
 *   - the oscillating part of ρxx (background removed) against 1/B with the
 *     fitted Lifshitz–Kosevich curve (src/analyse/transport/oscillationFit.ts),
 *     for every gate voltage whose fit succeeded.
 * Traces are downsampled (LTTB: 220 points for ρxx, 60 for the smoother Rxy;
 * 160 for the oscillation data and 100 for the smooth fitted curve) and
 * rounded to four significant digits; the page packs them further to a
 * quarter of a pixel (charts.ts chartDataJson), so a page with every gate
 * voltage stays light (about 1.2 kB of chart data per view).
 */
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { DeviceDepth } from "../analyse/transport/deviceDepth.ts";
import { lttb } from "../analyse/numeric/lttb.ts";
import type { ChartSeries, ChartSpec } from "./charts.ts";

const POINTS = { rhoxx: 220, rxy: 60, oscillation: 160, model: 100 };
import { formatNumber } from "../model/format.ts";

/** Four significant digits: plenty for a line on screen. */
const r4 = (v: number) => (Number.isFinite(v) ? Number(v.toPrecision(4)) : 0);

function line(label: string, x: ArrayLike<number>, y: ArrayLike<number>, max: number, role: ChartSeries["role"], axis?: "y2"): ChartSeries {
  const d = lttb(x, y, max);
  return { label, points: d.x.map((v, i) => [r4(v), r4(d.y[i])]), line: true, role, ...(axis ? { axis } : {}) };
}

const gateText = (v: number) => `Vg = ${formatNumber(v)} V`;

/** ρxx (Ω/□, left) and Rxy (kΩ, right) against |B|, one view per field sweep with a trace; undefined without any. */
export function traceChart(d: DeviceAnalysis): ChartSpec | undefined {
  const points = d.points.filter((p) => p.trace.b.length > 1);
  if (points.length === 0) return undefined;
  const views = points.map((p) => ({
    label: `${gateText(p.gate_V)} (${p.file.split("/").at(-1)})`,
    caption: `Symmetrised traces from ${p.file}, ${p.trace.b.length} field values shown up to ${formatNumber(p.trace.b[p.trace.b.length - 1])} T`,
    series: [
      line("ρxx (symmetrised), left axis", p.trace.b, p.trace.rhoxx, POINTS.rhoxx, "data"),
      line(
        "|Rxy| (antisymmetrised), right axis",
        p.trace.b,
        Array.from(p.trace.rxy, (v) => Math.abs(v) / 1000),
        POINTS.rxy,
        "second",
        "y2",
      ),
    ],
  }));
  const last = views.length - 1;
  return {
    id: `traces-${d.id}`,
    title: `${d.id}: ρxx and Rxy against field`,
    x: { label: "Field |B| (T)" },
    y: { label: "ρxx (Ω/□)" },
    y2: { label: "|Rxy| (kΩ)" },
    series: [],
    views,
    view: last,
    viewLabel: "Gate voltage",
    summary: `${views.length} field sweeps, one per gate voltage, chosen with the list above the chart. ${views[last].caption}.`,
  };
}

/** The oscillating part of ρxx against 1/B with the Lifshitz–Kosevich fit, one view per fitted gate voltage; undefined without a fit. */
export function oscillationChart(id: string, x: DeviceDepth): ChartSpec | undefined {
  const fitted = x.points.filter((p) => p.oscillation.ok);
  if (fitted.length === 0) return undefined;
  const views = fitted.map((p) => {
    const o = p.oscillation;
    if (!o.ok) throw new Error("unreachable: filtered on ok");
    return {
      label: gateText(p.gate_V),
      caption: `Fit of ${p.file} between ${formatNumber(o.fieldRange[0])} T and ${formatNumber(o.fieldRange[1])} T: ${formatNumber(o.periods)} periods, R² ${o.r2.toFixed(4)}, residual noise ${formatNumber(o.residualNoise)} Ω${o.spinSplitting ? `; ${o.spinSplitting.note}` : ""}`,
      series: [
        line("ρxx − fitted background (data)", o.curve.inverseField, o.curve.oscillation, POINTS.oscillation, "data"),
        line("Lifshitz–Kosevich fit", o.model.inverseField, o.model.oscillation, POINTS.model, "fit"),
      ],
    };
  });
  const last = views.length - 1;
  return {
    id: `depth-osc-${id}`,
    title: `${id}: oscillating part of ρxx against 1/B, with the Lifshitz–Kosevich fit`,
    x: { label: "Inverse field 1/B (T⁻¹)" },
    y: { label: "ρxx − fitted background (Ω)" },
    series: [],
    views,
    view: last,
    viewLabel: "Gate voltage",
    summary: `${views.length} fitted field sweeps, chosen with the list above the chart. ${views[last].caption}.`,
  };
}
