/**
 * Inline SVG pictures of the structure section: the layer stack drawn to a
 * logarithmic thickness scale (so a 10 nm well shows beside a 3 µm buffer;
 * the substrate is cut), and a reciprocal-space map as a binned heat map in
 * (Qx, Qz) with the layer peaks and, for asymmetric maps, the R = 0 / R = 1
 * lines and the relaxation line of the measured buffer composition. All text
 * is escaped; each figure has a <title> and <desc>.
 */
import { A_SI, biaxialRatio, latticeDismukes, strainedPerpendicular } from "../physics/sige.ts";
import { anglesToQ, layerPeakQ } from "../analyse/structure/reciprocalSpace.ts";
import type { XrdFileResult } from "../analyse/structure/xrdAnalysis.ts";
import { escapeXml } from "./waferMapSvg.ts";
import { formatNumber } from "../model/format.ts";

export interface StackRow {
  name: string;
  role: string;
  ge?: number;
  thickness_nm?: number;
  /** Measured values to print beside the design, already formatted. */
  measured?: string;
}

const n1 = (v: number) => (Math.round(v * 10) / 10).toString();
const SUBSTRATE_SHOWN_NM = 5000;
/** Height of a layer, px: 28·log10(1 + t/nm), the substrate cut at 5 µm. */
const layerHeight = (t: number | undefined, role: string) => 28 * Math.log10(1 + Math.min(t ?? 1, role === "substrate" ? SUBSTRATE_SHOWN_NM : Infinity)) + 6;

/** The layer stack, surface at the top (see module comment). */
export function stackSvg(rows: readonly StackRow[], id: string): string {
  const W = 640;
  let y = 24;
  const parts: string[] = [];
  for (const l of rows) {
    const h = layerHeight(l.thickness_nm, l.role);
    const ge = l.ge ?? 0;
    const fill = l.role === "well" ? "#d9822b" : `hsl(210, 45%, ${Math.round(88 - 120 * ge)}%)`;
    const design = [l.thickness_nm !== undefined ? `${formatNumber(l.thickness_nm, 3)} nm` : "", l.ge !== undefined ? `Ge ${formatNumber(l.ge, 3)}` : ""].filter(Boolean).join(", ");
    parts.push(`<rect x="150" y="${n1(y)}" width="170" height="${n1(h)}" fill="${fill}" stroke="#333" stroke-width="0.6"><title>${escapeXml(`${l.name} (${l.role}): ${design}`)}</title></rect>`);
    const cy = y + h / 2 + 4;
    parts.push(`<text x="142" y="${n1(cy)}" text-anchor="end" font-size="12">${escapeXml(l.name)}</text>`);
    parts.push(`<text x="330" y="${n1(cy)}" font-size="12">${escapeXml(`design ${design || "—"}`)}${l.measured ? `<tspan font-weight="bold">${escapeXml(` · measured ${l.measured}`)}</tspan>` : ""}</text>`);
    if (l.role === "substrate" && (l.thickness_nm ?? 0) > SUBSTRATE_SHOWN_NM) {
      const by = y + h * 0.55;
      parts.push(`<path d="M146 ${n1(by)} l10 -6 l10 12 l10 -12 l10 12 l10 -12 l10 12 l10 -12 l10 12 l10 -12 l10 12 l10 -12 l10 12 l10 -12 l10 12 l10 -12 l10 12 l10 -6" fill="none" stroke="#fff" stroke-width="4"/>`);
    }
    y += h;
  }
  const H = y + 30;
  const desc = rows.map((l) => `${l.name}: ${l.thickness_nm ?? "?"} nm, Ge ${l.ge ?? "?"}${l.measured ? `, measured ${l.measured}` : ""}`).join("; ");
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${n1(H)}" width="${W}" height="${n1(H)}" role="img" aria-labelledby="${id}-t ${id}-d" class="stack-svg">`,
    `<title id="${id}-t">Layer stack, surface at the top</title><desc id="${id}-d">${escapeXml(desc)}</desc>`,
    `<text x="150" y="15" font-size="11">surface ↓</text>`,
    ...parts,
    `<text x="10" y="${n1(H - 10)}" font-size="11">${escapeXml("Heights on a logarithmic scale (28 px × log₁₀(1 + t/nm)); the substrate is cut at 5 µm (zig-zag).")}</text>`,
    `</svg>`,
  ].join("");
}

interface Box {
  x0: number;
  x1: number;
  z0: number;
  z1: number;
}

const W = 420;
const H = 340;
const PAD = { l: 58, r: 12, t: 12, b: 42 };

/** Binned heat map of one map in (Qx, Qz), nm⁻¹, with peaks and relaxation lines; undefined for peak tables or failed maps. */
export function rsmSvg(f: XrdFileResult, geFraction: number | undefined, id: string, bins = 44): string | undefined {
  if (!f.points || !f.peaks.ok) return undefined;
  const pk = f.peaks;
  // One pass into typed arrays (maps hold tens of thousands of points).
  const n = f.points.length;
  const qxs = new Float64Array(n);
  const qzs = new Float64Array(n);
  const box: Box = { x0: Infinity, x1: -Infinity, z0: Infinity, z1: -Infinity };
  for (let k = 0; k < n; k++) {
    const p = f.points[k];
    const { qx, qz } = anglesToQ(p.omega + pk.offset.omega, p.twoTheta + pk.offset.twoTheta, pk.wavelength);
    qxs[k] = qx;
    qzs[k] = qz;
    if (qx < box.x0) box.x0 = qx;
    if (qx > box.x1) box.x1 = qx;
    if (qz < box.z0) box.z0 = qz;
    if (qz > box.z1) box.z1 = qz;
  }
  if (box.x1 - box.x0 < 1e-3 * box.z1) {
    const mid = (box.x0 + box.x1) / 2;
    const half = (box.z1 - box.z0) / 2;
    box.x0 = mid - half;
    box.x1 = mid + half;
  }
  const px = (qx: number) => PAD.l + ((qx - box.x0) / (box.x1 - box.x0)) * (W - PAD.l - PAD.r);
  const pz = (qz: number) => H - PAD.b - ((qz - box.z0) / (box.z1 - box.z0)) * (H - PAD.t - PAD.b);
  // Highest count per bin; bins listed in the order first reached (the order the cells are drawn).
  const binMax = new Float64Array(bins * bins).fill(-Infinity);
  const order: number[] = [];
  for (let k = 0; k < n; k++) {
    const i = Math.min(bins - 1, Math.floor(((qxs[k] - box.x0) / (box.x1 - box.x0)) * bins));
    const j = Math.min(bins - 1, Math.floor(((qzs[k] - box.z0) / (box.z1 - box.z0)) * bins));
    const key = i * bins + j;
    if (binMax[key] === -Infinity) {
      order.push(key);
      binMax[key] = Math.max(0, f.points[k].counts);
    } else binMax[key] = Math.max(binMax[key], f.points[k].counts);
  }
  const floor = Math.max(1, pk.background + 3 * pk.noise);
  let highest = floor * 10;
  for (const key of order) highest = Math.max(highest, binMax[key]);
  const top = Math.log10(highest / floor);
  const cw = (W - PAD.l - PAD.r) / bins;
  const ch = (H - PAD.t - PAD.b) / bins;
  const cells: string[] = [];
  for (const k of order) {
    const c = binMax[k];
    if (c <= floor) continue;
    const level = Math.min(1, Math.log10(c / floor) / top);
    const i = Math.floor(k / bins);
    const j = k % bins;
    cells.push(`<rect x="${n1(PAD.l + i * cw)}" y="${n1(H - PAD.b - (j + 1) * ch)}" width="${n1(cw + 0.3)}" height="${n1(ch + 0.3)}" fill="hsl(${Math.round(250 - 200 * level)},70%,${Math.round(85 - 40 * level)}%)"/>`);
  }
  const lines: string[] = [];
  const hkl = pk.reflection;
  const asym = Math.hypot(hkl[0], hkl[1]) > 0;
  if (asym && geFraction !== undefined) {
    const aR = latticeDismukes(geFraction);
    const relaxed = layerPeakQ(aR, aR, hkl);
    const pseudo = layerPeakQ(A_SI, strainedPerpendicular(aR, A_SI, biaxialRatio(geFraction)), hkl);
    const sub = layerPeakQ(A_SI, A_SI, hkl);
    const sx = Math.sign(pk.peaks[0]?.qx ?? 1) || 1;
    const seg = (a: { qx: number; qz: number }, b: { qx: number; qz: number }, dash: string, label: string) =>
      `<line x1="${n1(px(sx * a.qx))}" y1="${n1(pz(a.qz))}" x2="${n1(px(sx * b.qx))}" y2="${n1(pz(b.qz))}" stroke="#222" stroke-width="1" stroke-dasharray="${dash}"><title>${escapeXml(label)}</title></line>`;
    const far = { qx: sub.qx * (box.z0 / sub.qz), qz: box.z0 };
    lines.push(seg(sub, { qx: sub.qx, qz: box.z0 }, "2 3", "R = 0: pseudomorphic (same Qx as the substrate)"));
    lines.push(seg(sub, far, "6 3", "R = 1: fully relaxed (on the line through the origin)"));
    lines.push(seg(pseudo, relaxed, "", `Relaxation line of Si${formatNumber(1 - geFraction, 3)}Ge${formatNumber(geFraction, 3)}`));
  }
  const marks = pk.peaks.map((p) => `<g><circle cx="${n1(px(p.qx))}" cy="${n1(pz(p.qz))}" r="5" fill="none" stroke="#000" stroke-width="1.5"/><text x="${n1(px(p.qx) + 7)}" y="${n1(pz(p.qz) - 6)}" font-size="11">${escapeXml(p.layer)}</text></g>`);
  const tick = (v: number) => formatNumber(v * 1e-9, 4);
  const axes = [
    `<rect x="${PAD.l}" y="${PAD.t}" width="${W - PAD.l - PAD.r}" height="${H - PAD.t - PAD.b}" fill="none" stroke="#555"/>`,
    `<text x="${PAD.l}" y="${H - PAD.b + 14}" font-size="10">${tick(box.x0)}</text><text x="${W - PAD.r}" y="${H - PAD.b + 14}" font-size="10" text-anchor="end">${tick(box.x1)}</text>`,
    `<text x="${PAD.l - 4}" y="${H - PAD.b}" font-size="10" text-anchor="end">${tick(box.z0)}</text><text x="${PAD.l - 4}" y="${PAD.t + 10}" font-size="10" text-anchor="end">${tick(box.z1)}</text>`,
    `<text x="${(W + PAD.l) / 2}" y="${H - 8}" font-size="11" text-anchor="middle">Qx (nm⁻¹, includes 2π)</text>`,
    `<text transform="translate(14 ${(H - PAD.b + PAD.t) / 2}) rotate(-90)" font-size="11" text-anchor="middle">Qz (nm⁻¹)</text>`,
  ];
  const title = `Reciprocal-space map ${hkl.join(" ")} (${f.file})`;
  const desc = `Logarithmic intensity, offset-corrected. Peaks: ${pk.peaks.map((p) => `${p.layer} at Qx ${tick(p.qx)}, Qz ${tick(p.qz)} nm⁻¹`).join("; ")}.`;
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${id}-t ${id}-d" class="rsm-svg">`,
    `<title id="${id}-t">${escapeXml(title)}</title><desc id="${id}-d">${escapeXml(desc)}</desc>`,
    `<clipPath id="${id}-clip"><rect x="${PAD.l}" y="${PAD.t}" width="${W - PAD.l - PAD.r}" height="${H - PAD.t - PAD.b}"/></clipPath>`,
    ...cells,
    `<g clip-path="url(#${id}-clip)">${lines.join("")}</g>`,
    ...marks,
    ...axes,
    `</svg>`,
  ].join("");
}
