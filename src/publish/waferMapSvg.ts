/**
 * Wafer map as an accessible inline SVG string (pure: no I/O, no dependencies).
 *
 * Geometry: wafer coordinates in mm with the origin at the wafer centre, x to the right and y up
 * (devices' `at_mm: [x, y]`). The outline is a circle of the given diameter with a straight
 * orientation flat at the bottom (−y side), a chord 30 % of the diameter long (this program's own
 * simple marker of orientation, not a standard flat length). The SVG viewBox is in mm (y flipped).
 *
 * Colour: viridis (perceptually uniform; colourScales.ts, from d3-scale-chromatic), linear in
 * value between the smallest and largest finite value (or a given domain); brighter (yellow)
 * means larger. Each marker carries its value as a text label below it (on a white halo, at
 * least `labelPx` on screen at the rendered width) and a <title> for hover; a colour bar under
 * the wafer shows the scale with its range and unit. The whole figure has role="img" with
 * <title> and <desc>. All text escaped.
 */
import { hex, sequentialRgb, gradientStops } from "./colourScales.ts";

export interface WaferMapDevice {
  id: string;
  /** Position on the wafer in mm, [x, y], origin at the centre, y towards the top (away from the flat). */
  atMm: readonly [number, number];
  /** Value in display units; null when not measured (drawn grey, labelled "–"). */
  value: number | null;
}

export interface WaferMapOptions {
  /** Accessible title, e.g. "Mobility across wafer W-042". */
  title: string;
  /** Extra sentence(s) for <desc>; a summary of devices and value range is always added. */
  description?: string;
  /** Display unit for labels and the legend, e.g. "cm²/(V·s)". */
  unit?: string;
  /** Wafer diameter in mm; default 100. */
  diameterMm?: number;
  /** Marker radius in mm; default diameter/25. */
  markerRadiusMm?: number;
  /** Value → label text; default 3 significant figures. */
  format?: (value: number) => string;
  /** Fixed colour-scale domain [low, high]; default the data's min and max. */
  domain?: readonly [number, number];
  /** Prefix for element ids (unique per page when several maps are shown); default "wafer-map". */
  idPrefix?: string;
  /** Rendered width in px (height follows the aspect ratio); default 360. */
  widthPx?: number;
  /** Height of the label text on screen at `widthPx`, px; default 12 (≥ 11 px for reading). */
  labelPx?: number;
}

const MISSING_FILL = "#c8c8c8";

/** Escapes text for SVG/XML element content and attribute values. */
export function escapeXml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}

/** Colour for t in [0, 1] (clamped) on the sequential scale, as "#rrggbb". */
export function sequentialColour(t: number): string {
  return hex(sequentialRgb(Number.isFinite(t) ? t : 0.5));
}

function defaultFormat(v: number): string {
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e5 || a < 1e-2)) return v.toExponential(2);
  return String(Number(v.toPrecision(3)));
}

const n2 = (x: number): string => String(Math.round(x * 100) / 100);

/** Outline path: circle of radius r (SVG coordinates, y down) with a flat chord at the bottom. */
function outlinePath(r: number): string {
  const half = 0.15 * 2 * r;
  const yFlat = Math.sqrt(r * r - half * half);
  return `M ${n2(-half)} ${n2(yFlat)} A ${n2(r)} ${n2(r)} 0 1 1 ${n2(half)} ${n2(yFlat)} Z`;
}

/**
 * Builds the wafer-map SVG. Devices with non-finite positions are left out (and counted in <desc>).
 * Throws RangeError for a non-positive diameter (programming error).
 */
export function waferMapSvg(devices: readonly WaferMapDevice[], options: WaferMapOptions): string {
  const d = options.diameterMm ?? 100;
  if (!(d > 0)) throw new RangeError(`waferMapSvg: diameter must be positive, got ${d}`);
  const r = d / 2;
  const mr = options.markerRadiusMm ?? d / 25;
  const fmt = options.format ?? defaultFormat;
  const unit = options.unit ? ` ${options.unit}` : "";
  const id = options.idPrefix ?? "wafer-map";
  const placed = devices.filter((v) => Number.isFinite(v.atMm[0]) && Number.isFinite(v.atMm[1]));
  const finite = placed.map((v) => v.value).filter((v): v is number => v !== null && Number.isFinite(v));
  const lo = options.domain?.[0] ?? (finite.length ? Math.min(...finite) : 0);
  const hi = options.domain?.[1] ?? (finite.length ? Math.max(...finite) : 1);
  const toT = (v: number): number => (hi > lo ? (v - lo) / (hi - lo) : 0.5);

  const margin = d * 0.08;
  const width = options.widthPx ?? 360;
  // Text height in mm that renders at labelPx on screen (viewBox width d + 2·margin shown at `width` px).
  const fontMm = ((options.labelPx ?? 12) * (d + 2 * margin)) / width;
  const legendH = 2.4 * fontMm + fontMm * 1.2 + d * 0.03;
  const vb = [-r - margin, -r - margin, d + 2 * margin, d + 2 * margin + legendH];
  const height = Math.round((width * vb[3]) / vb[2]);

  const markers = placed.map((dev) => deviceMarker(dev, mr, fontMm, fmt, unit, toT));
  const omitted = devices.length - placed.length;
  const rangeText = finite.length ? `values from ${fmt(Math.min(...finite))} to ${fmt(Math.max(...finite))}${unit}` : "no measured values";
  const desc = [
    options.description ?? "",
    `${placed.length} device${placed.length === 1 ? "" : "s"} on a ${n2(d)} mm wafer, ${rangeText}.`,
    "Brighter (yellower) fill means a larger value; the straight edge at the bottom marks the wafer orientation.",
    omitted > 0 ? `${omitted} device${omitted === 1 ? "" : "s"} without a valid position not shown.` : "",
  ]
    .filter((s) => s !== "")
    .join(" ");

  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="${vb.map(n2).join(" ")}" width="${width}" height="${height}" role="img" aria-labelledby="${escapeXml(id)}-title ${escapeXml(id)}-desc" class="wafer-map">`,
    `<title id="${escapeXml(id)}-title">${escapeXml(options.title)}</title>`,
    `<desc id="${escapeXml(id)}-desc">${escapeXml(desc)}</desc>`,
    `<path class="wafer-outline" d="${outlinePath(r)}" fill="#fafafa" stroke="#555555" stroke-width="${n2(d * 0.006)}"/>`,
    `<g class="wafer-devices">${markers.join("")}</g>`,
    legend(id, lo, hi, r, margin, fontMm, fmt, unit, finite.length > 0),
    `</svg>`,
  ].join("\n");
}

function deviceMarker(dev: WaferMapDevice, mr: number, fontMm: number, fmt: (v: number) => string, unit: string, toT: (v: number) => number): string {
  const x = dev.atMm[0];
  const y = -dev.atMm[1];
  const has = dev.value !== null && Number.isFinite(dev.value);
  const fill = has ? sequentialColour(toT(dev.value as number)) : MISSING_FILL;
  const label = has ? fmt(dev.value as number) : "–";
  const tip = `${dev.id}: ${has ? label + unit : "not measured"}`;
  // The value sits below the marker on a white halo (paint-order: stroke first), at full label size.
  const ty = y + mr + fontMm * 0.95;
  return (
    `<g class="device" data-device="${escapeXml(dev.id)}"><title>${escapeXml(tip)}</title>` +
    `<circle cx="${n2(x)}" cy="${n2(y)}" r="${n2(mr)}" fill="${fill}" stroke="#333333" stroke-width="${n2(mr * 0.08)}"/>` +
    `<text x="${n2(x)}" y="${n2(ty)}" font-size="${n2(fontMm)}" text-anchor="middle" dominant-baseline="central" fill="#111111" stroke="#ffffff" stroke-width="${n2(fontMm * 0.25)}" paint-order="stroke" class="map-label">${escapeXml(label)}</text></g>`
  );
}

function legend(
  id: string,
  lo: number,
  hi: number,
  r: number,
  margin: number,
  fontMm: number,
  fmt: (v: number) => string,
  unit: string,
  hasValues: boolean,
): string {
  if (!hasValues) return "";
  const gid = `${escapeXml(id)}-scale`;
  const y = r + margin * 0.6;
  const h = fontMm * 1.2;
  const x0 = -r * 0.7;
  const x1 = r * 0.7;
  const ty = y + h + fontMm * 0.9;
  const text = (x: number, anchor: string, t: string) =>
    `<text x="${n2(x)}" y="${n2(ty)}" font-size="${n2(fontMm)}" text-anchor="${anchor}" dominant-baseline="central">${escapeXml(t)}</text>`;
  return (
    `<g class="wafer-legend" aria-hidden="true"><defs><linearGradient id="${gid}">${gradientStops(sequentialRgb, 0, 1)}</linearGradient></defs>` +
    `<rect x="${n2(x0)}" y="${n2(y)}" width="${n2(x1 - x0)}" height="${n2(h)}" fill="url(#${gid})" stroke="#555555" stroke-width="${n2(r * 0.005)}"/>` +
    text(x0, "start", fmt(lo)) +
    text(x1, "end", fmt(hi)) +
    (unit ? text(0, "middle", unit.trim()) : "") +
    `</g>`
  );
}
