/**
 * Page model of the lattice images (Z-contrast and geometric phase analysis)
 * section of a wafer page: per image the micrograph, the Z-contrast profile
 * with its interface fits (chart), the in-plane and out-of-plane strain maps
 * (PNG, downsampled to ≤ 256 px for the page, full size linked), the numbers
 * with their uncertainties and the findings in plain words. PNG files are
 * returned in `files` (paths under wafers/<id>/images/); the build writes
 * them. Image links in the page are relative (`images/<name>.png`). Returns
 * undefined while the wafer has no images.
 */
import { rawCopyHref } from "./rawCopies.ts";
import type { WaferOutcome } from "../judge/outcome.ts";
import type { ImageResult } from "../analyse/images/index.ts";
import { renderMicrograph, renderStrainMap } from "./strainMapImage.ts";
import { traceSeries, type ChartSeries, type ChartSpec } from "./charts.ts";
import { formatNumber } from "../model/format.ts";

/** Long side of the page copies of micrographs and strain maps, pixels. */
export const PAGE_IMAGE_SIDE = 256;

export interface SectionFile {
  path: string;
  bytes: Buffer;
}

export interface PagePicture {
  src: string;
  href: string;
  width: number;
  height: number;
  alt: string;
  caption: string;
  /** Labels of the colour bar drawn under a strain map (left end, centre, right end, and what it measures). */
  bar?: { low: string; mid: string; high: string; label: string };
}

export interface ImageBlock {
  id: string;
  title: string;
  facts: string;
  micrograph: PagePicture;
  /** The Z-contrast profile chart, when there is a profile. */
  chart: ChartSpec | null;
  maps: PagePicture[];
  /** [label, value] rows, already formatted. */
  numbers: [string, string][];
  findings: string[];
  skipped: string[];
}

export interface ImagesSectionModel {
  charts: ChartSpec[];
  images: ImageBlock[];
  files: SectionFile[];
  metricNote: string;
}

const nm = (m: number, digits = 3) => `${formatNumber(m * 1e9, digits)} nm`;
const pm = (v: number, u: number) => `${v.toFixed(3)} ± ${u.toFixed(3)} %`;

function profileChart(r: ImageResult, id: string): ChartSpec | null {
  const p = r.profile;
  if (!p.ok) return null;
  const z = p.z_m.map((v) => v * 1e9);
  const series: ChartSeries[] = [
    traceSeries("Mean intensity along the interfaces", z, p.raw, "data"),
    traceSeries("Smoothed over one lattice period", z, p.smoothed, "second"),
  ];
  for (const [name, e] of [
    ["lower", p.bottom],
    ["upper", p.top],
  ] as const) {
    series.push(
      traceSeries(
        `Logistic fit, ${name} interface`,
        e.curve.z_m.map((v) => v * 1e9),
        e.curve.value,
        "fit",
        120,
      ),
    );
  }
  return {
    id: `${id}-profile`,
    title: `${r.input.file}: Z-contrast profile along the growth axis`,
    x: { label: "Growth coordinate from image centre (nm, + toward surface)" },
    y: { label: "Intensity (normalised grey level)" },
    series,
    summary: `Profile over ${z.length} bins; the darker band is the well, ${nm(p.well.thickness_m)} thick; lower interface 10–90 % width ${nm(p.bottom.width10to90_m, 2)}, upper ${nm(p.top.width10to90_m, 2)}.`,
  };
}

function block(r: ImageResult, i: number, wafer: string, files: SectionFile[], rawHref: (file: string) => string): ImageBlock {
  const m = r.input;
  const id = `image${i + 1}`;
  const add = (name: string, bytes: Buffer) => files.push({ path: `wafers/${wafer}/images/${name}`, bytes });
  const micro = renderMicrograph(m.pixels, m.width, m.height, PAGE_IMAGE_SIDE);
  add(`${id}-micrograph.png`, micro.png);
  const micrograph: PagePicture = {
    src: `images/${id}-micrograph.png`,
    href: rawHref(m.file),
    width: micro.width,
    height: micro.height,
    alt: `${m.kind.toUpperCase()} cross-section micrograph ${m.file}, ${m.width} × ${m.height} pixels of ${formatNumber(m.pixelSize_m * 1e9, 3)} nm, growth direction ${m.growthAxis}`,
    caption: `Micrograph (shown at 1/${micro.factor} scale; the link opens the original file).`,
  };
  const maps: PagePicture[] = [];
  const numbers: [string, string][] = [];
  const skipped: string[] = [];
  const p = r.profile;
  if (p.ok) {
    numbers.push(["Interface tilt", `${p.tilt_deg.toFixed(2)}°`], ["Well thickness (between interface centres)", nm(p.well.thickness_m)]);
    if (r.widthsSkipped === null) {
      numbers.push(["Lower interface width (10–90 %)", `${nm(p.bottom.width10to90_m, 3)} ± ${nm(p.bottom.width10to90StdErr_m, 2)}`]);
      numbers.push(["Upper interface width (10–90 %)", `${nm(p.top.width10to90_m, 3)} ± ${nm(p.top.width10to90StdErr_m, 2)}`]);
    }
  }
  if (r.widthsSkipped) skipped.push(`Interface widths: ${r.widthsSkipped}.`);
  const c = r.coherence;
  if (c.ok) {
    numbers.push(["In-plane mismatch, well vs reference", pm(c.inPlaneMismatch_pct.value, c.inPlaneMismatch_pct.uncertainty)]);
    numbers.push(["Out-of-plane strain, well vs reference", pm(c.outOfPlaneStrain_pct.value, c.outOfPlaneStrain_pct.uncertainty)]);
  } else skipped.push(`Coherence: ${c.reason}.`);
  if (r.expected.ok)
    numbers.push([`Expected for a coherent well (Ge ${r.expected.wellGe} on relaxed Ge ${r.expected.barrierGe})`, `${r.expected.outOfPlane_pct.toFixed(3)} %`]);
  else skipped.push(`Expected strain: ${r.expected.reason}.`);
  const g = r.gpa;
  // A map without pixels has no picture (renderStrainMap refuses it): the page says so instead of showing an empty image.
  if (g.ok && !(m.width > 0 && m.height > 0)) skipped.push(`Strain maps: no map, the image has no pixels (${m.width} × ${m.height}).`);
  else if (g.ok) {
    numbers.push(["GPA resolution (mask)", nm(g.resolution_px * m.pixelSize_m, 2)]);
    const lim = Math.max(0.005, ...(c.ok ? [c.inPlaneMismatch_pct.value, c.outOfPlaneStrain_pct.value].map((v) => (1.5 * Math.abs(v)) / 100) : []));
    const interfaces = p.ok ? { growthAxis: m.growthAxis, tilt_deg: p.tilt_deg, positions_px: [p.well.bottom_px, p.well.top_px] } : undefined;
    for (const [key, map, label] of [
      ["inplane", g.inPlane, "In-plane strain ε∥ (along the interfaces)"],
      ["outofplane", g.outOfPlane, "Out-of-plane strain ε⊥ (along growth)"],
    ] as const) {
      const small = renderStrainMap(map, m.width, m.height, { limit: lim, maxSide: PAGE_IMAGE_SIDE, interfaces });
      const full = renderStrainMap(map, m.width, m.height, { limit: lim, interfaces });
      add(`${id}-${key}.png`, small.png);
      add(`${id}-${key}-full.png`, full.png);
      const pct = `${formatNumber(lim * 100, 2)} %`;
      maps.push({
        src: `images/${id}-${key}.png`,
        href: `images/${id}-${key}-full.png`,
        width: small.width,
        height: small.height,
        alt: `${label} map of ${m.file} relative to ${r.referenceSource}; colour bar below from −${pct} (blue, compression) to +${pct} (red, tension)${interfaces ? "; black lines mark the two interfaces" : ""}`,
        caption: `${label}. Blue: compression, red: tension${interfaces ? "; black lines: interfaces" : ""}.`,
        bar: { low: `−${pct}`, mid: "0", high: `+${pct}`, label: "strain (%)" },
      });
    }
    numbers.push(["Reference lattice", r.referenceSource]);
  } else skipped.push(`Strain maps: ${g.reason}.`);
  return {
    id,
    title: `${m.file}`,
    facts: `${m.kind.toUpperCase()}, ${m.format ? `${m.format}, ` : ""}${m.width} × ${m.height} pixels, ${formatNumber(m.pixelSize_m * 1e9, 3)} nm per pixel ${m.pixelSizeSource === "file" ? "(from the file's resolution tags)" : "(from wafer.md)"}${m.pixelSizeNote ? ` — ${m.pixelSizeNote}, so not used` : ""}, growth direction ${m.growthAxis}`,
    micrograph,
    chart: profileChart(r, id),
    maps,
    numbers,
    findings: r.findings,
    skipped,
  };
}

/** The images section of a wafer page, or undefined while the wafer has no images. */
export function imagesSection(o: WaferOutcome): ImagesSectionModel | undefined {
  const a = o.analysis?.images;
  if (!a?.images.length) return undefined;
  const files: SectionFile[] = [];
  const copies = new Map(o.provenance.files.map((f) => [f.path, rawCopyHref(f)]));
  const images = a.images.map((r, i) => block(r, i, o.folder, files, (file) => copies.get(file) ?? ""));
  const charts = images.map((b) => b.chart).filter((c): c is ChartSpec => c !== null);
  const sources = [...new Set(Object.values(a.metricSource))].map((i) => a.images[i].input.file);
  // What the ± leave out (QA review): the propagation covers pixel noise only (zContrastProfile, strainMeanUncertainty).
  const scope =
    " Each ± is one standard uncertainty from the image's pixel noise only: scan distortion and drift, relaxation of the thinned" +
    " lamella, the choice of reference region and the probe's own width are not in it (scan artefacts alone are often of order" +
    " 0.1 % in strain; common practice).";
  const metricNote = sources.length ? `The wafer's image metrics come from ${sources.join(" and ")}.${scope}` : "No image gave a metric.";
  return { charts, images, files, metricNote };
}
