/**
 * Wafer map as an accessible inline SVG string (pure: no I/O, no dependencies).
 *
 * Geometry: wafer coordinates in mm with the origin at the wafer centre, x to the right and y up
 * (devices' `at_mm: [x, y]`). The outline is a circle of the given diameter with a straight
 * orientation flat at the bottom (−y side), a chord 30 % of the diameter long (this program's own
 * simple marker of orientation, not a standard flat length). The SVG viewBox is in mm (y flipped).
 *
 * Colour: a sequential scale of three stops, pale sand → teal → deep indigo, linear in value
 * between the smallest and largest finite value (or a given domain); darker means larger. Each
 * marker carries its value as a text label (dark or light text chosen for contrast) and a
 * <title> for hover; the whole figure has role="img" with <title> and <desc>. All text escaped.
 */

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
}

const STOPS: readonly [number, number, number][] = [
  [0xf6, 0xec, 0xc9], // pale sand
  [0x3e, 0x9c, 0x96], // teal
  [0x23, 0x24, 0x5e], // deep indigo
];
const MISSING_FILL = "#c8c8c8";

/** Escapes text for SVG/XML element content and attribute values. */
export function escapeXml(text: string): string {
  return text
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** Colour for t in [0, 1] (clamped) on the sequential scale, as "#rrggbb". */
export function sequentialColour(t: number): string {
  const u = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0.5)) * (STOPS.length - 1);
  const i = Math.min(STOPS.length - 2, Math.floor(u));
  const f = u - i;
  const rgb = STOPS[i].map((c, k) => Math.round(c + (STOPS[i + 1][k] - c) * f));
  return `#${rgb.map((c) => c.toString(16).padStart(2, "0")).join("")}`;
}

function defaultFormat(v: number): string {
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e5 || a < 1e-2)) return v.toExponential(2);
  return String(Number(v.toPrecision(3)));
}

function textColourFor(hex: string): string {
  const [r, g, b] = [1, 3, 5].map((k) => parseInt(hex.slice(k, k + 2), 16) / 255);
  const luminance = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  return luminance > 0.45 ? "#1a1a1a" : "#ffffff";
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
  const legendH = d * 0.16;
  const vb = [-r - margin, -r - margin, d + 2 * margin, d + 2 * margin + legendH];
  const width = options.widthPx ?? 360;
  const height = Math.round((width * vb[3]) / vb[2]);
  const fontMm = Math.max(mr * 0.75, d * 0.022);

  const markers = placed.map((dev) => deviceMarker(dev, mr, fontMm, fmt, unit, toT));
  const omitted = devices.length - placed.length;
  const rangeText = finite.length
    ? `values from ${fmt(Math.min(...finite))} to ${fmt(Math.max(...finite))}${unit}`
    : "no measured values";
  const desc = [
    options.description ?? "",
    `${placed.length} device${placed.length === 1 ? "" : "s"} on a ${n2(d)} mm wafer, ${rangeText}.`,
    "Darker fill means a larger value; the straight edge at the bottom marks the wafer orientation.",
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

function deviceMarker(
  dev: WaferMapDevice,
  mr: number,
  fontMm: number,
  fmt: (v: number) => string,
  unit: string,
  toT: (v: number) => number,
): string {
  const x = dev.atMm[0];
  const y = -dev.atMm[1];
  const has = dev.value !== null && Number.isFinite(dev.value);
  const fill = has ? sequentialColour(toT(dev.value as number)) : MISSING_FILL;
  const label = has ? fmt(dev.value as number) : "–";
  const tip = `${dev.id}: ${has ? label + unit : "not measured"}`;
  // Shrink long labels to fit the marker (≈0.58 em per character of a sans-serif font).
  const size = Math.min(fontMm, (1.9 * mr) / (0.58 * Math.max(1, label.length)));
  return (
    `<g class="device" data-device="${escapeXml(dev.id)}"><title>${escapeXml(tip)}</title>` +
    `<circle cx="${n2(x)}" cy="${n2(y)}" r="${n2(mr)}" fill="${fill}" stroke="#333333" stroke-width="${n2(mr * 0.08)}"/>` +
    `<text x="${n2(x)}" y="${n2(y)}" font-size="${n2(size)}" text-anchor="middle" dominant-baseline="central" fill="${textColourFor(fill)}">${escapeXml(label)}</text></g>`
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
  const y = r + margin * 1.2;
  const h = fontMm * 1.4;
  const stops = [0, 0.25, 0.5, 0.75, 1]
    .map((t) => `<stop offset="${t}" stop-color="${sequentialColour(t)}"/>`)
    .join("");
  return (
    `<g class="wafer-legend" aria-hidden="true"><defs><linearGradient id="${gid}">${stops}</linearGradient></defs>` +
    `<rect x="${n2(-r * 0.6)}" y="${n2(y)}" width="${n2(r * 1.2)}" height="${n2(h)}" fill="url(#${gid})" stroke="#555555" stroke-width="${n2(r * 0.005)}"/>` +
    `<text x="${n2(-r * 0.62)}" y="${n2(y + h / 2)}" font-size="${n2(fontMm)}" text-anchor="end" dominant-baseline="central">${escapeXml(fmt(lo))}</text>` +
    `<text x="${n2(r * 0.62)}" y="${n2(y + h / 2)}" font-size="${n2(fontMm)}" text-anchor="start" dominant-baseline="central">${escapeXml(fmt(hi))}</text>` +
    (unit ? `<text x="0" y="${n2(y + h + fontMm * 1.2)}" font-size="${n2(fontMm)}" text-anchor="middle" dominant-baseline="central">${escapeXml(unit.trim())}</text>` : "") +
    `</g>`
  );
}
