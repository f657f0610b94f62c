/**
 * Page model of the transport in depth (percolation, power law, Shubnikov–de
 * Haas) section of a wafer page: per device the charts (σ vs n with the
 * percolation fit, μ vs n log–log with the power law, the spectrum of the SdH
 * oscillation (first: the oscillation itself with its Lifshitz–Kosevich fit,
 * one view per gate voltage, from traceViews.ts), the Dingle plot as a
 * diagnostic view with the fit's line, density vs gate with Hall and SdH
 * densities), a table of the fits, a table of per-point figures with standard
 * errors, notes (spin splitting) and the reasons for anything not determined.
 * Returns undefined while no device has a depth analysis.
 */
import type { WaferOutcome } from "../judge/outcome.ts";
import type { DeviceAnalysis } from "../analyse/wafer.ts";
import type { DeviceDepth } from "../analyse/transport/deviceDepth.ts";
import { percolationConductivity } from "../analyse/transport/percolation.ts";
import { POWER_LAW_REFERENCE_DENSITY } from "../analyse/transport/mobilityPowerLaw.ts";
import { markerSeries, traceSeries, type ChartSeries, type ChartSpec } from "./charts.ts";
import { formatNumber } from "../model/format.ts";
import { oscillationChart } from "./traceViews.ts";
import { densityAtGate } from "../analyse/transport/densityCalibration.ts";

export interface FitRow {
  name: string;
  result: string;
  window: string;
  quality: string;
}

export interface DepthPointRow {
  gate: string;
  hall: string;
  sdh: string;
  mismatch: string;
  flag: boolean;
  tauT: string;
  mfp: string;
  kfl: string;
  tauQ: string;
  ratio: string;
  fit: string;
}

export interface DepthDevice {
  id: string;
  charts: ChartSpec[];
  fits: FitRow[];
  points: DepthPointRow[];
  skipped: string[];
  notes: string[];
  flagged: string;
}

export interface TransportDepthSectionModel {
  /** Every chart of the devices' blocks (the appendix draws them). */
  charts: ChartSpec[];
  devices: DepthDevice[];
}

const N11 = 1e-15; // m⁻² → 10¹¹ cm⁻²
const f = formatNumber;
const pm = (v: number, e: number | null, digits = 3) => (e === null || !(e > 0) ? f(v, digits) : `${f(v, digits)} ± ${f(e, 2)}`);
const skip = (why: string) => `not fitted: ${why}`;

function conductivityChart(id: string, x: DeviceDepth): ChartSpec | undefined {
  const pc = x.percolation;
  const sweep = pc.ok ? x.gateSweeps.find((s) => s.file === pc.file) : x.gateSweeps.find((s) => s.density.length);
  if (!sweep || sweep.density.length === 0) return undefined;
  const pts: [number, number][] = sweep.density.flatMap((n, i) =>
    sweep.conductivity[i] > 0 && n > 0 ? [[n * N11, sweep.conductivity[i] * 1e3] as [number, number]] : [],
  );
  const series: ChartSeries[] = [markerSeries(`${sweep.file} (${sweep.direction})`, pts)];
  if (pc.ok) {
    const lo = pc.density;
    const hi = pc.window.maxDensity;
    const grid = Array.from({ length: 60 }, (_, k) => lo + ((hi - lo) * k) / 59);
    series.push({
      label: `fit σ = A(n − n_p)^${f(pc.exponent, 3)}`,
      points: grid.map((n) => [n * N11, percolationConductivity(n, pc.density, pc.prefactor, pc.exponent) * 1e3]),
      line: true,
      role: "fit",
    });
  }
  return {
    id: `depth-sigma-${id}`,
    title: `${id}: zero-field sheet conductance against density`,
    x: { label: "Density n from the Hall calibration (10¹¹ cm⁻²)" },
    y: { label: "Sheet conductance σ (mS)" },
    series,
    summary: pc.ok
      ? `Percolation fit on ${pc.file}: n_p = ${f(pc.density * 1e-4)} cm⁻², p = ${f(pc.exponent)}, R² ${pc.r2.toFixed(4)}, ${pc.points} points up to ${f(pc.window.maxDensity * 1e-4)} cm⁻²`
      : `No percolation fit: ${pc.reason}`,
  };
}

function mobilityChart(d: DeviceAnalysis, x: DeviceDepth): ChartSpec | undefined {
  if (d.points.length === 0) return undefined;
  const series: ChartSeries[] = [
    markerSeries(
      "Hall points",
      d.points.map((p) => [p.density * 1e-4, p.mobility * 1e4]),
    ),
  ];
  const pl = x.powerLaw;
  if (pl.ok) {
    const line = [pl.window.minDensity, pl.window.maxDensity].map(
      (n) => [n * 1e-4, pl.mobilityAtReference * 1e4 * (n / POWER_LAW_REFERENCE_DENSITY) ** pl.exponent] as [number, number],
    );
    series.push({ label: `fit μ ∝ n^${f(pl.exponent, 3)}`, points: line, line: true, role: "fit" });
  }
  return {
    id: `depth-mu-${d.id}`,
    title: `${d.id}: mobility against density (log–log)`,
    x: { label: "Hall density n (cm⁻²)", log: true },
    y: { label: "Hall mobility μ (cm²/V s)", log: true },
    series,
    summary: pl.ok
      ? `Power law μ ∝ n^α with α = ${pm(pl.exponent, pl.exponentStdErr)} over ${pl.points} points (${pl.window.rule})`
      : `No power-law fit: ${pl.reason}`,
  };
}

function sdhCharts(id: string, x: DeviceDepth): ChartSpec[] {
  // The charted point is the last with a spectrum, as the slim form keeps (cli/analyseFolder.ts).
  const best = x.points.filter((p) => p.sdh.ok).at(-1);
  if (!best?.sdh.ok) return [];
  const s = best.sdh;
  const o = best.oscillation;
  const charts: ChartSpec[] = [];
  charts.push({
    id: `depth-fft-${id}`,
    title: `${id}: spectrum of the oscillation at Vg = ${f(best.gate_V)} V`,
    x: { label: "Frequency in 1/B (T)" },
    y: { label: "Amplitude (Ω)" },
    series: [traceSeries("FFT amplitude", s.spectrum.frequency, s.spectrum.amplitude, "data", 400)],
    summary: `Spectral peak ${f(s.frequency, 4)} T (the fit's starting value)${o.ok ? `; fitted f = ${pm(o.frequency.value, o.frequency.stdErr, 5)} T, so n_SdH = ${pm(o.density.value * 1e-4, o.density.stdErr * 1e-4, 5)} cm⁻²` : `; no fit: ${o.reason}`} (Hall ${f(best.hallDensity * 1e-4, 4)} cm⁻²)`,
  });
  const d = best.dingle;
  if (o.ok && d.ok) {
    const u = [Math.min(...d.inverseField), Math.max(...d.inverseField)];
    charts.push({
      id: `depth-dingle-${id}`,
      title: `${id}: Dingle plot at Vg = ${f(best.gate_V)} V (diagnostic)`,
      x: { label: "Inverse field 1/B (T⁻¹)" },
      y: { label: "ln[Δρ/(4ρ_bg·X/sinh X)]" },
      series: [
        markerSeries(
          "one-period amplitudes",
          d.inverseField.map((v, i) => [v, d.ordinate[i]]),
        ),
        { label: "fitted line ln A − β/B", points: u.map((v) => [v, d.line.intercept + d.line.slope * v]), line: true, role: "fit" },
      ],
      summary: `Per-period amplitudes of the same data against the fit's line (β = ${f(-d.line.slope)} T, A = ${f(o.amplitudeFactor.value)}); ${o.quantumLifetime.ok ? `τ_q = ${pm(o.quantumLifetime.value * 1e12, o.quantumLifetime.stdErr * 1e12)} ps` : `τ_q not determined: ${o.quantumLifetime.reason}`}`,
    });
  }
  return charts;
}

function densityChart(d: DeviceAnalysis, x: DeviceDepth): ChartSpec | undefined {
  if (d.points.length === 0) return undefined;
  const series: ChartSeries[] = [
    markerSeries(
      "Hall density",
      d.points.map((p) => [p.gate_V, p.density * N11]),
    ),
  ];
  const sdh = x.points.flatMap((p) => (p.sdh.ok ? [[p.gate_V, p.sdh.density * N11] as [number, number]] : []));
  if (sdh.length) series.push(markerSeries("SdH density", sdh, "second"));
  const c = x.calibration;
  if (c.ok) {
    const vs = [c.turnOnVoltage, Math.max(...d.points.map((p) => p.gate_V))];
    series.push({ label: "calibration line", points: vs.map((v) => [v, densityAtGate(c, v) * N11]), line: true, role: "fit" });
  }
  return {
    id: `depth-n-${d.id}`,
    title: `${d.id}: Hall and SdH densities against gate voltage`,
    x: { label: "Gate voltage Vg (V)" },
    y: { label: "Sheet density n (10¹¹ cm⁻²)" },
    series,
    summary: `${d.points.length} Hall densities, ${sdh.length} SdH densities${c.ok ? `; C = ${f(c.capacitance * 100)} µF/cm², turn-on ${f(c.turnOnVoltage)} V` : ""}${x.parallelConduction.length ? `; Hall exceeds SdH beyond tolerance at ${x.parallelConduction.length} points (parallel conduction)` : ""}`,
  };
}

function fitRows(x: DeviceDepth): FitRow[] {
  const c = x.calibration;
  const pc = x.percolation;
  const pl = x.powerLaw;
  const h = x.hysteresis;
  const q = x.quantumLifetime;
  return [
    c.ok
      ? {
          name: "Gate calibration n(Vg)",
          result: `C = ${pm(c.capacitance * 100, c.capacitanceStdErr === null ? null : c.capacitanceStdErr * 100)} µF/cm², V_on = ${pm(c.turnOnVoltage, c.turnOnVoltageStdErr)} V`,
          window: "all Hall points",
          quality: `R² ${c.r2.toFixed(4)}, ${c.points} points`,
        }
      : { name: "Gate calibration n(Vg)", result: skip(c.reason), window: "", quality: "" },
    pc.ok
      ? {
          name: "Percolation σ = A(n − n_p)^p",
          result: `n_p = ${pm(pc.density * 1e-4, pc.densityStdErr * 1e-4)} cm⁻², p = ${pc.exponentFixed ? `${f(pc.exponent)} (fixed)` : pm(pc.exponent, pc.exponentStdErr)}, A = ${pm(pc.prefactor, pc.prefactorStdErr)} S·m^2p`,
          window: `${f(pc.window.minDensity * 1e-4)}–${f(pc.window.maxDensity * 1e-4)} cm⁻² (${pc.window.rule})`,
          quality: `R² ${pc.r2.toFixed(4)}, ${pc.points} points, ${pc.excludedInsulating} insulating left out`,
        }
      : { name: "Percolation σ = A(n − n_p)^p", result: skip(pc.reason), window: "", quality: "" },
    pl.ok
      ? {
          name: "Mobility power law μ ∝ n^α",
          result: `α = ${pm(pl.exponent, pl.exponentStdErr)}`,
          window: `${f(pl.window.minDensity * 1e-4)}–${f(pl.window.maxDensity * 1e-4)} cm⁻² (${pl.window.rule})`,
          quality: `R² ${pl.r2.toFixed(4)}, ${pl.points} points`,
        }
      : { name: "Mobility power law μ ∝ n^α", result: skip(pl.reason), window: "", quality: "" },
    h.ok
      ? {
          name: "Gate hysteresis (down − up)",
          result: `mean ${f(h.meanShift * 1e3)} mV, largest ${f(h.maxShift * 1e3)} mV`,
          window: "conducting range, R ≤ h/e²",
          quality: `${h.points} equal-resistance points`,
        }
      : { name: "Gate hysteresis (down − up)", result: skip(h.reason), window: "", quality: "" },
    q.ok
      ? {
          name: "Quantum lifetime (Lifshitz–Kosevich fit)",
          result: `τ_q = ${f(q.value * 1e12)} ps (median)`,
          window: "SdH field window",
          quality: `${q.points} of ${x.points.length} points determined`,
        }
      : { name: "Quantum lifetime (Lifshitz–Kosevich fit)", result: `not determined: ${q.reason}`, window: "", quality: "" },
    x.scatteringTimeRatio.ok
      ? {
          name: "Scattering-time ratio τ_t/τ_q",
          result: `${f(x.scatteringTimeRatio.value)} (median)`,
          window: "points with both lifetimes",
          quality: `${x.scatteringTimeRatio.points} points`,
        }
      : { name: "Scattering-time ratio τ_t/τ_q", result: `not determined: ${x.scatteringTimeRatio.reason}`, window: "", quality: "" },
  ];
}

function pointRows(x: DeviceDepth): DepthPointRow[] {
  return x.points.map((p) => {
    const o = p.oscillation;
    const tq = o.ok ? o.quantumLifetime : undefined;
    return {
      gate: f(p.gate_V, 3),
      hall: f(p.hallDensity * 1e-4, 4),
      sdh: o.ok ? pm(o.density.value * 1e-4, o.density.stdErr * 1e-4, 5) : "not determined",
      mismatch: p.mismatch ? `${pm(p.mismatch.mismatchPercent, p.mismatch.stdErrPercent)} %` : "—",
      flag: p.mismatch?.parallelConduction ?? false,
      tauT: p.derived.ok ? f(p.derived.transportLifetime * 1e12) : "—",
      mfp: p.derived.ok ? f(p.derived.meanFreePath * 1e6) : "—",
      kfl: p.derived.ok ? f(p.derived.kfl) : "—",
      tauQ: tq?.ok ? pm(tq.value * 1e12, tq.stdErr * 1e12) : "not determined",
      ratio: p.scatteringTimeRatio !== undefined ? f(p.scatteringTimeRatio) : "—",
      fit: o.ok ? `R² ${o.r2.toFixed(3)}, ${f(o.periods, 2)} periods` : "—",
    };
  });
}

function deviceModel(d: DeviceAnalysis, x: DeviceDepth): DepthDevice {
  const charts = [oscillationChart(d.id, x), conductivityChart(d.id, x), mobilityChart(d, x), ...sdhCharts(d.id, x), densityChart(d, x)].filter(
    (c): c is ChartSpec => c !== undefined,
  );
  const skipped = [
    ...x.gateSweeps.flatMap((s) => (s.percolation.ok ? [] : [`${s.file}: ${s.percolation.reason}`])),
    ...x.points.flatMap((p) => {
      const o = p.oscillation;
      if (!o.ok) return [`${p.file}: SdH density and τ_q not determined — ${o.reason}`];
      return o.quantumLifetime.ok ? [] : [`${p.file}: τ_q not determined — ${o.quantumLifetime.reason}`];
    }),
  ];
  const notes = x.points.flatMap((p) => (p.oscillation.ok && p.oscillation.spinSplitting ? [`${p.file}: ${p.oscillation.spinSplitting.note}`] : []));
  const flagged = x.parallelConduction.length
    ? `Probable parallel conduction: the Hall density differs from the SdH density of the well by more than the tolerance and three standard errors at ${x.parallelConduction.join(", ")}.`
    : "";
  return { id: d.id, charts, fits: fitRows(x), points: pointRows(x), skipped, notes, flagged };
}

export function transportDepthSection(o: WaferOutcome): TransportDepthSectionModel | undefined {
  const withDepth = (o.analysis?.devices ?? []).flatMap((d) => (d.depth ? [{ d, x: d.depth }] : []));
  if (withDepth.length === 0) return undefined;
  const devices = withDepth.map(({ d, x }) => deviceModel(d, x));
  return { charts: devices.flatMap((d) => d.charts), devices };
}
