/**
 * The layer stack of the structure section as an inline SVG, drawn to a
 * logarithmic thickness scale (so a 10 nm well shows beside a 3 µm buffer;
 * the substrate is cut), design values beside each layer and measured values
 * on a second line. The figure is sized to its text (textWidth, an upper
 * estimate), so nothing is clipped. All text is escaped; the figure has a
 * <title> and <desc>. (The reciprocal-space maps are in rsmFigure.ts.)
 */
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
const FONT = 12;
const LINE = 15;
/**
 * Width of a text line in px, an upper estimate: 0.62 em per character (sans-serif digits and
 * lower-case letters are 0.5–0.6 em; bold a little wider), so the figure is sized to hold it.
 */
export const textWidth = (text: string, size = FONT) => [...text].length * 0.62 * size;
/** Height of a layer, px: 28·log10(1 + t/nm) + 6, the substrate cut at 5 µm, and at least its lines of text. */
const layerHeight = (t: number | undefined, role: string, lines: number) =>
  Math.max(28 * Math.log10(1 + Math.min(t ?? 1, role === "substrate" ? SUBSTRATE_SHOWN_NM : Infinity)) + 6, lines * LINE + 3);

/** The layer stack, surface at the top (see module comment); the figure is as wide as its longest text. */
export function stackSvg(rows: readonly StackRow[], id: string): string {
  const texts = rows.map((l) => {
    const design = [l.thickness_nm !== undefined ? `${formatNumber(l.thickness_nm, 3)} nm` : "", l.ge !== undefined ? `Ge ${formatNumber(l.ge, 3)}` : ""]
      .filter(Boolean)
      .join(", ");
    return { design, lines: [`design ${design || "—"}`, ...(l.measured ? [`measured ${l.measured}`] : [])] };
  });
  const note = ["Heights on a logarithmic scale: 28 px × log₁₀(1 + t/nm),", "at least one text line per layer; the substrate is cut at 5 µm (zig-zag)."];
  const nameW = Math.max(60, ...rows.map((l) => textWidth(l.name)));
  const barX = Math.ceil(nameW + 18);
  const barW = 170;
  const textX = barX + barW + 10;
  const W = Math.ceil(
    Math.max(
      textX + Math.max(0, ...texts.flatMap((t) => t.lines.map((s, k) => textWidth(s, FONT) * (k ? 1.06 : 1)))),
      10 + Math.max(...note.map((s) => textWidth(s, 11))),
    ) + 12,
  );
  let y = 24;
  const parts: string[] = [];
  rows.forEach((l, k) => {
    const { design, lines } = texts[k];
    const h = layerHeight(l.thickness_nm, l.role, lines.length);
    const ge = l.ge ?? 0;
    const fill = l.role === "well" ? "#d9822b" : `hsl(210, 45%, ${Math.round(88 - 120 * ge)}%)`;
    parts.push(
      `<rect x="${barX}" y="${n1(y)}" width="${barW}" height="${n1(h)}" fill="${fill}" stroke="#333" stroke-width="0.6"><title>${escapeXml(`${l.name} (${l.role}): ${design}`)}</title></rect>`,
    );
    const mid = y + h / 2;
    parts.push(`<text x="${barX - 8}" y="${n1(mid + 4)}" text-anchor="end" font-size="${FONT}">${escapeXml(l.name)}</text>`);
    const first = mid + 4 - ((lines.length - 1) * LINE) / 2;
    lines.forEach((s, i) =>
      parts.push(`<text x="${textX}" y="${n1(first + i * LINE)}" font-size="${FONT}"${i ? ' font-weight="bold"' : ""}>${escapeXml(s)}</text>`),
    );
    if (l.role === "substrate" && (l.thickness_nm ?? 0) > SUBSTRATE_SHOWN_NM) {
      const by = y + h * 0.55;
      parts.push(`<path d="M${barX - 4} ${n1(by)} l10 -6${" l10 12 l10 -12".repeat(8)} l10 -6" fill="none" stroke="#fff" stroke-width="4"/>`);
    }
    y += h;
  });
  const H = y + 14 + 2 * 14;
  const desc = rows.map((l) => `${l.name}: ${l.thickness_nm ?? "?"} nm, Ge ${l.ge ?? "?"}${l.measured ? `, measured ${l.measured}` : ""}`).join("; ");
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${n1(H)}" width="${W}" height="${n1(H)}" role="img" aria-labelledby="${id}-t ${id}-d" class="stack-svg">`,
    `<title id="${id}-t">Layer stack, surface at the top</title><desc id="${id}-d">${escapeXml(desc)}</desc>`,
    `<text x="${barX}" y="15" font-size="11">surface ↓</text>`,
    ...parts,
    ...note.map((s, i) => `<text x="10" y="${n1(y + 20 + i * 14)}" font-size="11">${escapeXml(s)}</text>`),
    `</svg>`,
  ].join("");
}
