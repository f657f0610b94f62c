/**
 * Page model of the X-ray diffraction, critical thickness and depth profiles
 * section of a wafer page: the layer stack drawn to scale (inline SVG, design
 * vs measured), the reciprocal-space maps (inline SVG heat maps with peaks and
 * relaxation lines), the depth profile with its interface fits (ChartSpec), and
 * tables of peaks, buffer figures, strain, critical thickness and profiles.
 * Every number is formatted here. Returns undefined when there is nothing to show.
 */
import { wellGeMinBrief, wellGeMinText } from "./wellGeMin.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { StructureAnalysis } from "../analyse/structure/index.ts";
import type { InterfaceFit } from "../analyse/structure/depthProfile.ts";
import { radToDeg } from "../analyse/structure/bragg.ts";
import { markerSeries, traceSeries, type ChartSeries, type ChartSpec } from "./charts.ts";
import { formatNumber, sig6OrNull } from "../model/format.ts";
import { formatProblem } from "../model/problem.ts";
import { stackSvg, type StackRow } from "./structureSvg.ts";
import { rsmFigure } from "./rsmFigure.ts";
import { valleySection, type ValleySectionModel } from "./valleySection.ts";

export interface StructureSectionModel {
  /** The depth-profile charts (drawn in the wafer page's appendix). */
  charts: ChartSpec[];
  /** Inline SVG markup built with every text escaped. */
  stackSvg: string;
  maps: { file: string; reflection: string; svg?: string; note: string }[];
  peaks: { file: string; reflection: string; layer: string; omega: string; twoTheta: string; qx: string; qz: string; method: string }[];
  buffer: { label: string; value: string }[];
  bufferReason?: string;
  strain: { label: string; value: string }[];
  critical: { label: string; value: string }[];
  design: { quantity: string; design: string; measured: string; source: string }[];
  profiles: { file: string; method: string; rows: { label: string; value: string }[]; reason?: string }[];
  findings: { severity: string; text: string }[];
  /**
   * Reading notes of the X-ray and depth-profile files: what the reader assumed
   * or changed while reading them by wafer.md's reading instructions (a rule the
   * file's own line overrode, columns the mapping leaves out), as the wafer's
   * warnings give them.
   */
  readingNotes: string[];
  /** The "valley splitting (predicted)" part (valleySection.ts). */
  valley?: ValleySectionModel;
  /** Pictures of the reciprocal-space maps (paths under wafers/<id>/); the build writes them. */
  files: { path: string; bytes: Buffer }[];
}

/** The design row of the minimum Ge in the well (analyse/structure/index.ts designRows), shown with its uncertainty (wellGeMin.ts). */
export const WELL_GE_MIN_ROW = "Minimum Ge in the well";

const pm = (v: number, e: number | undefined, digits = 4) =>
  e !== undefined && e > 0 ? `${formatNumber(v, digits)} ± ${formatNumber(e, 2)}` : formatNumber(v, digits);
const deg = (r: number) => formatNumber(radToDeg(r), 6);
const perNm = (q: number, e: number) => pm(q * 1e-9, e * 1e-9, 6);

function stackRows(o: WaferOutcome, s: StructureAnalysis): StackRow[] {
  const byLabel = new Map(s.design.map((d) => [d.quantity, d]));
  const m = (q: string, unit: string, digits = 3) => {
    const d = byLabel.get(q);
    return d?.measured !== undefined ? `${formatNumber(d.measured, digits)}${unit}` : undefined;
  };
  return (o.record?.stack ?? []).map((l) => {
    let measured: string | undefined;
    if (l.role === "well") measured = [m("Well thickness", " nm"), m("Well in-plane strain", " % strain")].filter(Boolean).join(", ") || undefined;
    if (l.role === "barrier") measured = m("Barrier Ge fraction", "") && `Ge ${m("Barrier Ge fraction", "")}`;
    if (l.role === "buffer")
      measured =
        [m("Buffer Ge fraction", "") && `Ge ${m("Buffer Ge fraction", "")}`, m("Buffer relaxation", " % relaxed")].filter(Boolean).join(", ") || undefined;
    return { name: l.name, role: l.role, ge: l.ge, thickness_nm: l.thickness_nm, measured };
  });
}

function profileCharts(s: StructureAnalysis): ChartSpec[] {
  const charts: ChartSpec[] = [];
  s.profiles.forEach((p, k) => {
    const r = p.result;
    const series: ChartSeries[] = [traceSeries("Ge fraction (measured)", p.data.depth, p.data.ge, "data", 400)];
    let summary = `${p.data.method} profile ${p.data.file}, ${p.data.depth.length} depths`;
    if (r.ok) {
      for (const [f, top] of [
        [r.top, true],
        [r.bottom, false],
      ] as const) {
        series.push(traceSeries(`${top ? "Top" : "Bottom"} interface fit (τ ${formatNumber(f.tau, 3)} nm)`, f.curve.depth, f.curve.ge, "fit"));
      }
      const marks: [number, number][] = [...r.top.marks, ...r.bottom.marks];
      series.push(markerSeries("10 % and 90 % points", marks, "reference"));
      summary += `; top interface at ${formatNumber(r.top.centre, 4)} nm, 10–90 % width ${formatNumber(r.top.width10to90, 3)} nm; bottom at ${formatNumber(r.bottom.centre, 4)} nm, width ${formatNumber(r.bottom.width10to90, 3)} nm; well ${formatNumber(r.wellThickness, 3)} nm thick`;
    }
    charts.push({
      id: `profile-${k}`,
      title: `Ge depth profile (${p.data.method}, ${p.data.file}) with interface fits`,
      x: { label: "Depth (nm)" },
      y: { label: "Ge fraction" },
      series,
      summary,
    });
    const els = Object.keys(p.data.contaminants);
    if (els.length) {
      const roles = ["data", "second", "third"] as const;
      charts.push({
        id: `profile-${k}-contaminants`,
        title: `Contaminants (${p.data.file})`,
        x: { label: "Depth (nm)" },
        y: { label: "Concentration (cm⁻³)", log: true },
        series: els.map((e, i) =>
          traceSeries(
            e,
            p.data.depth,
            p.data.contaminants[e].map((v) => Math.max(v, 1)),
            roles[i % 3],
            300,
          ),
        ),
        summary: els.map((e) => `${e} peak ${formatNumber(s.contaminantPeaks[e] ?? NaN, 3)} cm⁻³ in or near the well`).join("; "),
      });
    }
  });
  return charts;
}

function profileRows(s: StructureAnalysis): StructureSectionModel["profiles"] {
  return s.profiles.map((p) => {
    const r = p.result;
    if (!r.ok) return { file: p.data.file, method: p.data.method, rows: [], reason: r.reason };
    const edge = (f: InterfaceFit) =>
      `centre ${pm(f.centre, f.centreStdErr)} nm, 10–90 % ${pm(f.width10to90, f.width10to90StdErr, 3)} nm, 4τ ${formatNumber(f.width4tau, 3)} nm, barrier Ge ${formatNumber(f.barrierGe, 3)}, R² ${f.r2.toFixed(4)}`;
    const rows = [
      { label: "Top interface (nearer the surface)", value: edge(r.top) },
      { label: "Bottom interface", value: edge(r.bottom) },
      { label: "Well thickness (between mid-points)", value: `${pm(r.wellThickness, r.wellThicknessStdErr, 4)} nm` },
      { label: "Barrier Ge fraction", value: formatNumber(r.barrierGeFraction, 4) },
      { label: "Minimum Ge in the well", value: wellGeMinText(r) },
      ...r.contaminants.map((c) => ({
        label: `${c.element} peak`,
        value: `inside ${c.insidePeak !== undefined ? `${formatNumber(c.insidePeak, 3)} cm⁻³ at ${formatNumber(c.insideDepth ?? NaN, 4)} nm` : "—"}; within ${formatNumber(r.nearDistance, 3)} nm ${c.nearPeak !== undefined ? `${formatNumber(c.nearPeak, 3)} cm⁻³ at ${formatNumber(c.nearDepth ?? NaN, 4)} nm` : "—"}`,
      })),
    ];
    return { file: p.data.file, method: p.data.method, rows };
  });
}

function xrdTables(
  s: StructureAnalysis,
  wafer: string,
  files: StructureSectionModel["files"],
): Pick<StructureSectionModel, "maps" | "peaks" | "buffer" | "bufferReason" | "strain"> {
  const x = s.xrd;
  const geX = x?.buffer.ok ? x.buffer.geFraction : undefined;
  const figure = (f: NonNullable<typeof x>["files"][number], i: number) => {
    const fig = rsmFigure(f, geX, `rsm-${i}`, `structure/rsm-${i}.png`);
    if (fig) files.push({ path: `wafers/${wafer}/structure/rsm-${i}.png`, bytes: fig.png });
    return fig?.svg;
  };
  const maps = (x?.files ?? []).map((f, i) => ({
    file: f.file,
    reflection: f.peaks.ok ? f.peaks.reflection.join(" ") : "",
    svg: figure(f, i),
    note: f.peaks.ok
      ? `offsets added: Δω ${formatNumber(radToDeg(f.peaks.offset.omega), 3)}°, Δ2θ ${formatNumber(radToDeg(f.peaks.offset.twoTheta), 3)}°${f.peaks.notes.length ? `; ${f.peaks.notes.join("; ")}` : ""}`
      : `not analysed: ${f.peaks.reason}`,
  }));
  const peaks = (x?.files ?? []).flatMap((f) => {
    const pk = f.peaks;
    return pk.ok
      ? pk.peaks.map((p) => ({
          file: f.file,
          reflection: pk.reflection.join(" "),
          layer: p.layer,
          omega: `${deg(p.omega)} ± ${formatNumber(radToDeg(p.omegaStdErr), 2)}`,
          twoTheta: `${deg(p.twoTheta)} ± ${formatNumber(radToDeg(p.twoThetaStdErr), 2)}`,
          qx: perNm(p.qx, p.qxStdErr),
          qz: perNm(p.qz, p.qzStdErr),
          method: p.method,
        }))
      : [];
  });
  const b = x?.buffer;
  const buffer = b?.ok
    ? [
        { label: "Ge fraction x", value: pm(b.geFraction, b.geFractionStdErr) },
        { label: "Relaxation R", value: `${pm(b.relaxation * 100, b.relaxationStdErr * 100, 4)} %` },
        { label: "a∥ (in-plane)", value: `${pm(b.aParallel * 1e9, b.aParallelStdErr * 1e9, 6)} nm` },
        { label: `a⊥ (out-of-plane, from the ${b.aPerpendicularFrom} peak)`, value: `${pm(b.aPerpendicular * 1e9, b.aPerpendicularStdErr * 1e9, 6)} nm` },
        { label: "Relaxed lattice constant a_r", value: `${pm(b.aRelaxed * 1e9, b.aRelaxedStdErr * 1e9, 6)} nm` },
        { label: "Biaxial ratio D = 2C12/C11", value: formatNumber(b.biaxialRatio, 5) },
        { label: "Reflections used", value: `${x?.asymmetricFile ?? "—"} (asymmetric), ${x?.symmetricFile ?? "none"} (symmetric)` },
      ]
    : [];
  const st = x?.strain;
  const strain = st?.ok
    ? [
        { label: "In-plane strain ε∥", value: `${pm(st.epsParallel * 100, st.epsParallelStdErr * 100)} %` },
        { label: "Out-of-plane strain ε⊥ (elastic, −D·ε∥)", value: `${pm(st.epsPerpendicular * 100, st.epsPerpendicularStdErr * 100)} %` },
        {
          label: "Source",
          value: st.source === "well-peak" ? "the well's own asymmetric peak" : "no well peak: well assumed pseudomorphic on the buffer (a∥ of the buffer)",
        },
        ...(st.aPerpendicularMeasured !== undefined
          ? [
              {
                label: "a⊥ measured / expected",
                value: `${formatNumber(st.aPerpendicularMeasured * 1e9, 6)} / ${formatNumber(st.aPerpendicularExpected * 1e9, 6)} nm`,
              },
            ]
          : []),
      ]
    : [];
  return { maps, peaks, buffer, bufferReason: b && !b.ok ? b.reason : undefined, strain };
}

function criticalRows(s: StructureAnalysis): StructureSectionModel["critical"] {
  const c = s.critical;
  if (!c.ok) return [{ label: "Not checked", value: c.reason }];
  return [
    {
      label: "Strain used",
      value: `${pm(c.strain * 100, c.strainStdErr * 100)} % (${c.strainSource === "design" ? "design: Si on a fully relaxed buffer" : c.strainSource === "well-peak" ? "from the well peak" : "pseudomorphic on the buffer"})`,
    },
    { label: "Matthews–Blakeslee h_c (single layer, 60° dislocations)", value: `${pm(c.matthewsBlakeslee * 1e9, c.matthewsBlakesleeStdErr * 1e9, 3)} nm` },
    { label: "People–Bean h_c", value: c.peopleBean !== undefined ? `${formatNumber(c.peopleBean * 1e9, 3)} nm` : "—" },
    { label: `Well thickness (${c.thicknessSource === "stack" ? "design" : "depth profile"})`, value: `${formatNumber(c.thickness * 1e9, 3)} nm` },
    { label: "Margin h_c − t", value: `${formatNumber(c.margin * 1e9, 3)} nm${c.beyond ? " — beyond the critical thickness" : ""}` },
  ];
}

export function structureSection(o: WaferOutcome): StructureSectionModel | undefined {
  const s = o.analysis?.structure;
  if (!s) return undefined;
  const fmt = (v: number | undefined, unit: string) => (v === undefined ? "—" : `${formatNumber(v, 4)}${unit === "1" ? "" : ` ${unit}`}`);
  const files: StructureSectionModel["files"] = [];
  // The profile the design rows were measured on (the first analysed one: analyse/structure/index.ts).
  const first = s.profiles.find((p) => p.result.ok)?.result;
  const minProfile = first?.ok ? first : undefined;
  return {
    files,
    charts: profileCharts(s),
    stackSvg: stackSvg(stackRows(o, s), "stack-fig"),
    ...xrdTables(s, o.folder, files),
    critical: criticalRows(s),
    design: s.design.map((d) => ({
      quantity: d.quantity,
      design: fmt(d.design, d.unit),
      measured:
        d.measured === undefined
          ? "—"
          : d.quantity === WELL_GE_MIN_ROW && minProfile
            ? wellGeMinBrief(minProfile)
            : d.measuredStdErr
              ? `${pm(d.measured, d.measuredStdErr)}${d.unit === "1" ? "" : ` ${d.unit}`}`
              : fmt(d.measured, d.unit),
      source: d.source,
    })),
    profiles: profileRows(s),
    findings: s.findings,
    readingNotes: structureReadingNotes(o),
    valley: valleySection(s, s.profiles.find((p) => p.data.file === s.valley?.file)?.data),
  };
}

/** The wafer's warnings located in its X-ray or depth-profile files, or at the xrd/profiles entries of wafer.md. */
export function structureReadingNotes(o: Pick<WaferOutcome, "problems" | "provenance">): string[] {
  const files = new Set(o.provenance.files.filter((f) => f.role === "xrd" || f.role === "depth profile").map((f) => f.path));
  return o.problems.filter((p) => p.severity === "warning" && (files.has(p.file) || /^(xrd|profiles)\./.test(p.field ?? ""))).map(formatProblem);
}

/** The structure block of results.json: figures not covered by registered metrics (all contaminant peaks, the flag). */
export function structureResults(o: WaferOutcome): unknown {
  const s = o.analysis?.structure;
  if (!s) return null;
  return {
    contaminant_peaks_cm3: Object.fromEntries(Object.entries(s.contaminantPeaks).map(([k, v]) => [k, sig6OrNull(v)])),
    beyond_critical_thickness: s.critical.ok ? s.critical.beyond : null,
    strain_source: s.critical.ok ? s.critical.strainSource : null,
    valley_inputs: valleyInputs(s),
    findings: s.findings,
  };
}

/** What the valley-splitting prediction was made from (its five figures are registered metrics); null without a prediction. */
function valleyInputs(s: StructureAnalysis): unknown {
  const v = s.valley;
  if (!v) return null;
  if (!v.result.ok) return { file: v.file, reason: v.result.reason };
  const r = v.result;
  return {
    file: v.file,
    field_MV_per_m: sig6OrNull(r.field / 1e6),
    field_source: r.fieldSource,
    dot_radius_nm: sig6OrNull(r.dotRadius),
    ge_top_well_bottom: [r.xTop, r.xWell, r.xBottom].map(sig6OrNull),
    departures_nm: r.departure.ranges.map(([a, b]) => [sig6OrNull(a), sig6OrNull(b)]),
  };
}
