/**
 * A reciprocal-space map for the wafer page: the intensity as a smooth
 * picture in (Qx, Qz) (a PNG the page shows inside an inline SVG), with a
 * colour bar of the counts, axis ticks in nm⁻¹ (Q = 4π sin θ/λ, the 2π
 * included), the fitted peaks, and on asymmetric maps the two limiting lines:
 * full strain (R = 0, pseudomorphic: the same Qx as the substrate) and full
 * relaxation (R = 1: cubic, on the line through the origin and the substrate
 * peak), plus the relaxation line of the measured buffer composition.
 *
 * Picture: every measured point's logarithmic level, log10(counts/floor)/top
 * with floor = background + 3·noise, is put in its cell of a fine grid and the
 * grid is filled by normalized convolution (Knutsson & Westin, CVPR 1993: a
 * Gaussian-smoothed sum of values divided by the Gaussian-smoothed count of
 * points, σ ≈ 0.8 × the mean point spacing), which works for maps on a grid in
 * (ω, 2θ) and for scattered points alike; cells far from any point stay
 * transparent. Colours: viridis (colourScales.ts) in 255 levels, written as
 * an indexed-colour PNG (indexedPng.ts). All text is escaped.
 */
import { A_SI, biaxialRatio, latticeDismukes, strainedPerpendicular } from "../physics/sige.ts";
import { anglesToQ, layerPeakQ } from "../analyse/structure/reciprocalSpace.ts";
import type { XrdFileResult } from "../analyse/structure/xrdAnalysis.ts";
import { escapeXml } from "./waferMapSvg.ts";
import { formatNumber } from "../model/format.ts";
import { gradientStops, sequentialRgb } from "./colourScales.ts";
import { encodeIndexedPng } from "./indexedPng.ts";

export interface RsmFigure {
  svg: string;
  png: Buffer;
}

const W = 470;
const H = 390;
const PAD = { l: 64, r: 92, t: 14, b: 46 };
const PW = W - PAD.l - PAD.r;
const PH = H - PAD.t - PAD.b;
/** Picture cells: one per 2 px of the plot (the browser smooths the rest). */
const GX = Math.round(PW / 2);
const GZ = Math.round(PH / 2);
/** Colour levels of the picture: 255 (an indexed PNG holds 256 entries, one of them transparent). */
const LEVELS = 255;
const PALETTE = new Uint8Array(3 * (LEVELS + 1));
for (let l = 0; l < LEVELS; l++) PALETTE.set(sequentialRgb(l / (LEVELS - 1)), 3 * (l + 1));
const ALPHA = Uint8Array.from({ length: LEVELS + 1 }, (_, i) => (i === 0 ? 0 : 255));
const n1 = (v: number) => (Math.round(v * 10) / 10).toString();

/** Ticks at 1, 2 or 5 × 10^k steps, about `target` of them, inside [lo, hi]. */
export function linearTicks(lo: number, hi: number, target = 5): number[] {
  if (!(hi > lo)) return [];
  const raw = (hi - lo) / target;
  const p = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? 10 * p;
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + 1e-9 * step; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

/**
 * Separable Gaussian blur of GX × GZ grids, in place (σ in cells, kernel to 3σ;
 * taps beyond the grid's edge are left out). Each output cell adds its taps in
 * the same order (offset −r … r) as a cell-by-cell loop would, so the result is
 * the same to the bit; the loops run along rows so they stay simple and fast.
 */
function blur(grids: Float64Array[], sigma: number): void {
  const r = Math.max(1, Math.ceil(3 * sigma));
  const g = Array.from({ length: 2 * r + 1 }, (_, i) => Math.exp(-((i - r) ** 2) / (2 * sigma * sigma)));
  const norm = g.reduce((a, b) => a + b, 0);
  const k = Float64Array.from(g, (v) => v / norm);
  const tmp = new Float64Array(GX * GZ);
  for (const a of grids) {
    tmp.fill(0);
    // Along x: tmp[j, i] = Σ_d k[d]·a[j, i + d] over 0 ≤ i + d < GX, scattered from the cells that hold
    // points (most are empty); each tmp cell still receives its taps in the order d = −r … r.
    for (let j = 0; j < GZ; j++) {
      const row = j * GX;
      for (let p = 0; p < GX; p++) {
        const v = a[row + p];
        if (v === 0) continue;
        for (let i = Math.max(0, p - r); i <= Math.min(GX - 1, p + r); i++) tmp[row + i] += k[p - i + r] * v;
      }
    }
    // Along z: a[j, i] = Σ_d k[d]·tmp[j + d, i] over 0 ≤ j + d < GZ.
    a.fill(0);
    for (let j = 0; j < GZ; j++) {
      const row = j * GX;
      for (let d = Math.max(-r, -j); d <= Math.min(r, GZ - 1 - j); d++) {
        const kd = k[d + r];
        const src = (j + d) * GX;
        for (let i = 0; i < GX; i++) a[row + i] += kd * tmp[src + i];
      }
    }
  }
}

/** The map figure (see module comment); undefined for peak tables or failed maps. `href` is the PNG's address from the page. */
export function rsmFigure(f: XrdFileResult, geFraction: number | undefined, id: string, href: string): RsmFigure | undefined {
  if (!f.points || !f.peaks.ok || f.points.length === 0) return undefined;
  const pk = f.peaks;
  const n = f.points.length;
  const qxs = new Float64Array(n);
  const qzs = new Float64Array(n);
  let [x0, x1, z0, z1] = [Infinity, -Infinity, Infinity, -Infinity];
  for (let k = 0; k < n; k++) {
    const p = f.points[k];
    const { qx, qz } = anglesToQ(p.omega + pk.offset.omega, p.twoTheta + pk.offset.twoTheta, pk.wavelength);
    qxs[k] = qx;
    qzs[k] = qz;
    [x0, x1, z0, z1] = [Math.min(x0, qx), Math.max(x1, qx), Math.min(z0, qz), Math.max(z1, qz)];
  }
  if (x1 - x0 < 1e-3 * z1) {
    const mid = (x0 + x1) / 2;
    const half = (z1 - z0) / 2;
    [x0, x1] = [mid - half, mid + half];
  }
  const px = (qx: number) => PAD.l + ((qx - x0) / (x1 - x0)) * PW;
  const pz = (qz: number) => PAD.t + PH - ((qz - z0) / (z1 - z0)) * PH;

  // Levels on a log scale of counts above the noise floor.
  const floor = Math.max(1, pk.background + 3 * pk.noise);
  let highest = floor * 10;
  for (const p of f.points) highest = Math.max(highest, p.counts);
  const top = Math.log10(highest / floor);
  const sum = new Float64Array(GX * GZ);
  const weight = new Float64Array(GX * GZ);
  for (let k = 0; k < n; k++) {
    const i = Math.min(GX - 1, Math.max(0, Math.floor(((qxs[k] - x0) / (x1 - x0)) * GX)));
    const j = Math.min(GZ - 1, Math.max(0, Math.floor(((z1 - qzs[k]) / (z1 - z0)) * GZ)));
    const c = f.points[k].counts;
    sum[j * GX + i] += c > floor ? Math.min(1, Math.log10(c / floor) / top) : 0;
    weight[j * GX + i] += 1;
  }
  // Mean spacing of the points in cells, as if they covered the plot evenly.
  const spacing = Math.sqrt((GX * GZ) / n);
  const sigma = Math.max(0.7, Math.min(6, 0.8 * spacing));
  blur([sum, weight], sigma);
  // The smoothed weight is the local number of points per cell; keep cells with a quarter of the mean.
  const inside = n / (GX * GZ);
  // Palette picture: entry 0 transparent, entries 1 … LEVELS the viridis levels of 0 … 1.
  const indices = new Uint8Array(GX * GZ);
  for (let c = 0; c < weight.length; c++) {
    const w = weight[c];
    if (w < 0.25 * inside) continue;
    indices[c] = 1 + Math.round(Math.min(1, Math.max(0, sum[c] / w)) * (LEVELS - 1));
  }

  const hkl = pk.reflection;
  const asym = Math.hypot(hkl[0], hkl[1]) > 0;
  const lines: string[] = [];
  const labels: string[] = [];
  const halo = `fill="#111" stroke="#fff" stroke-width="3" paint-order="stroke" font-size="11"`;
  if (asym) {
    const sx = Math.sign(pk.peaks[0]?.qx ?? 1) || 1;
    const sub = layerPeakQ(A_SI, A_SI, hkl);
    const s = { qx: sx * sub.qx, qz: sub.qz };
    const seg = (a: { qx: number; qz: number }, b: { qx: number; qz: number }, dash: string, title: string) =>
      `<line x1="${n1(px(a.qx))}" y1="${n1(pz(a.qz))}" x2="${n1(px(b.qx))}" y2="${n1(pz(b.qz))}" stroke="#fff" stroke-width="3.2" opacity="0.8"/>` +
      `<line x1="${n1(px(a.qx))}" y1="${n1(pz(a.qz))}" x2="${n1(px(b.qx))}" y2="${n1(pz(b.qz))}" stroke="#111" stroke-width="1.4" stroke-dasharray="${dash}"><title>${escapeXml(title)}</title></line>`;
    // R = 0: the substrate's Qx at every Qz of the map.
    lines.push(seg({ qx: s.qx, qz: z1 }, { qx: s.qx, qz: z0 }, "3 3", "R = 0: fully strained (pseudomorphic, same Qx as the substrate)"));
    // R = 1: cubic lattices lie on the line from the origin through the substrate peak, Qz/Qx = l/√(h²+k²).
    const slope = s.qz / s.qx;
    lines.push(seg({ qx: z1 / slope, qz: z1 }, { qx: z0 / slope, qz: z0 }, "8 4", "R = 1: fully relaxed (cubic, on the line through the origin)"));
    const inPlot = (qx: number) => qx >= x0 && qx <= x1;
    if (inPlot(s.qx)) labels.push(`<text x="${n1(px(s.qx) + 4)}" y="${n1(PAD.t + 12)}" ${halo}>R = 0 (strained)</text>`);
    const zl = z0 + 0.12 * (z1 - z0);
    if (inPlot(zl / slope))
      labels.push(
        `<text x="${n1(px(zl / slope) + (sx > 0 ? -4 : 4))}" y="${n1(pz(zl))}" text-anchor="${sx > 0 ? "end" : "start"}" ${halo}>R = 1 (relaxed)</text>`,
      );
    if (geFraction !== undefined) {
      const aR = latticeDismukes(geFraction);
      const relaxed = layerPeakQ(aR, aR, hkl);
      const pseudo = layerPeakQ(A_SI, strainedPerpendicular(aR, A_SI, biaxialRatio(geFraction)), hkl);
      lines.push(
        seg(
          { qx: sx * pseudo.qx, qz: pseudo.qz },
          { qx: sx * relaxed.qx, qz: relaxed.qz },
          "",
          `Relaxation line of Si${formatNumber(1 - geFraction, 3)}Ge${formatNumber(geFraction, 3)} (from R = 0 to R = 1)`,
        ),
      );
    }
  }
  const marks = pk.peaks.map(
    (p) =>
      `<g><circle cx="${n1(px(p.qx))}" cy="${n1(pz(p.qz))}" r="6" fill="none" stroke="#fff" stroke-width="3"/><circle cx="${n1(px(p.qx))}" cy="${n1(pz(p.qz))}" r="6" fill="none" stroke="#d62728" stroke-width="1.6"/><text x="${n1(px(p.qx) + 9)}" y="${n1(pz(p.qz) - 7)}" ${halo}>${escapeXml(p.layer)}</text></g>`,
  );

  const nm = (v: number) => v * 1e-9;
  // Tick labels as short as the step allows ("45.8", "0", "−0.5"), with a true minus sign.
  const tickText = (v: number) => String(Number(v.toPrecision(6))).replace("-", "−");
  const xt = linearTicks(nm(x0), nm(x1), 6);
  const zt = linearTicks(nm(z0), nm(z1), 6);
  const axes = [
    `<rect x="${PAD.l}" y="${PAD.t}" width="${PW}" height="${PH}" fill="none" stroke="#444"/>`,
    ...xt.map((v) => {
      const x = n1(px(v * 1e9));
      return `<line x1="${x}" y1="${PAD.t + PH}" x2="${x}" y2="${PAD.t + PH + 5}" stroke="#444"/><text x="${x}" y="${PAD.t + PH + 17}" font-size="11" text-anchor="middle">${tickText(v)}</text>`;
    }),
    ...zt.map((v) => {
      const y = n1(pz(v * 1e9));
      return `<line x1="${PAD.l - 5}" y1="${y}" x2="${PAD.l}" y2="${y}" stroke="#444"/><text x="${PAD.l - 7}" y="${n1(pz(v * 1e9) + 4)}" font-size="11" text-anchor="end">${tickText(v)}</text>`;
    }),
    `<text x="${PAD.l + PW / 2}" y="${H - 8}" font-size="12" text-anchor="middle">Qx (nm⁻¹)</text>`,
    `<text transform="translate(14 ${PAD.t + PH / 2}) rotate(-90)" font-size="12" text-anchor="middle">Qz (nm⁻¹)</text>`,
  ];
  // Colour bar: level 0 (the floor) at the bottom, 1 (the highest count) at the top; ticks at whole decades of counts.
  const bx = PAD.l + PW + 16;
  const bw = 14;
  const decades: number[] = [];
  for (let e = Math.ceil(Math.log10(floor)); 10 ** e <= highest * (1 + 1e-9); e++) decades.push(10 ** e);
  const by = (c: number) => PAD.t + PH - (Math.log10(c / floor) / top) * PH;
  const bar = [
    `<defs><linearGradient id="${id}-bar" x1="0" y1="1" x2="0" y2="0">${gradientStops(sequentialRgb, 0, 1, 16)}</linearGradient></defs>`,
    `<rect x="${bx}" y="${PAD.t}" width="${bw}" height="${PH}" fill="url(#${id}-bar)" stroke="#444"/>`,
    ...decades.map(
      (c) =>
        `<line x1="${bx + bw}" y1="${n1(by(c))}" x2="${bx + bw + 4}" y2="${n1(by(c))}" stroke="#444"/><text x="${bx + bw + 6}" y="${n1(by(c) + 4)}" font-size="11">${escapeXml(formatNumber(c, 1))}</text>`,
    ),
    `<text transform="translate(${W - 6} ${PAD.t + PH / 2}) rotate(-90)" font-size="12" text-anchor="middle">counts (log scale)</text>`,
  ];
  const title = `Reciprocal-space map ${hkl.join(" ")} (${f.file})`;
  const desc = `Intensity on a logarithmic colour scale from ${formatNumber(floor, 2)} to ${formatNumber(highest, 3)} counts, offset-corrected, in Qx and Qz (nm⁻¹, Q = 4π sin θ/λ). Peaks: ${pk.peaks.map((p) => `${p.layer} at Qx ${formatNumber(nm(p.qx), 5)}, Qz ${formatNumber(nm(p.qz), 5)} nm⁻¹`).join("; ")}.${asym ? " Dotted line: R = 0, fully strained (same Qx as the substrate); dashed line: R = 1, fully relaxed (through the origin)." : ""}`;
  const svg = [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-labelledby="${id}-t ${id}-d" class="rsm-svg">`,
    `<title id="${id}-t">${escapeXml(title)}</title><desc id="${id}-d">${escapeXml(desc)}</desc>`,
    `<clipPath id="${id}-clip"><rect x="${PAD.l}" y="${PAD.t}" width="${PW}" height="${PH}"/></clipPath>`,
    `<image href="${escapeXml(href)}" x="${PAD.l}" y="${PAD.t}" width="${PW}" height="${PH}" preserveAspectRatio="none"/>`,
    `<g clip-path="url(#${id}-clip)">${lines.join("")}${labels.join("")}</g>`,
    ...marks,
    ...axes,
    ...bar,
    `</svg>`,
  ].join("");
  return { svg, png: encodeIndexedPng(indices, GX, GZ, PALETTE, ALPHA) };
}
