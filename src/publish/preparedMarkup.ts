/**
 * The markup waferbook itself prepares for a page and the templates place
 * unescaped (`| safe`): Markdown notes (markdown.ts: markdown-it with raw
 * HTML off) and the SVG figures (structureSvg.ts, rsmFigure.ts,
 * waferMapSvg.ts, colourScales.ts). `markupProblem` checks a string against
 * an allow-list of exactly what those renderers write, so a drawn page read
 * back from a cache folder (drawnPageCheck.ts) that holds anything else —
 * <script>, an on…= handler, <iframe>, <object>, <embed>, <meta>, <base>,
 * <style>, a comment, an unquoted attribute, a javascript: link, an
 * unbalanced tag that would swallow the rest of the page — is refused.
 *
 * The grammar is the renderers' own, which is stricter than HTML's: every
 * tag is `<name attr="value" …>` with double-quoted values that hold no "<"
 * (both renderers escape it), every element not void is closed in order,
 * "/>" only on SVG elements, and text never holds a bare "<".
 */
import { urlProblem } from "./safeUrl.ts";

/** Elements the Markdown renderer writes (markdown-it's CommonMark set with tables; no raw HTML). */
const MARKDOWN = [
  "p",
  "h1",
  "h2",
  "h3",
  "h4",
  "h5",
  "h6",
  "em",
  "strong",
  "s",
  "code",
  "pre",
  "blockquote",
  "ul",
  "ol",
  "li",
  "a",
  "img",
  "hr",
  "br",
  "table",
  "thead",
  "tbody",
  "tr",
  "th",
  "td",
];
/** Elements the SVG figures use. */
const SVG = ["svg", "g", "defs", "title", "desc", "rect", "line", "path", "circle", "text", "image", "lineargradient", "stop", "clippath"];
const ELEMENTS = new Set([...MARKDOWN, ...SVG]);
const SVG_ELEMENTS = new Set(SVG);
const VOID = new Set(["br", "hr", "img"]);

/** Attributes, by the renderer that writes them (names compared in lower case). */
const ATTRIBUTES = new Set([
  // Markdown
  "href",
  "title",
  "src",
  "alt",
  "class",
  "start",
  // SVG
  "xmlns",
  "viewbox",
  "width",
  "height",
  "x",
  "y",
  "x1",
  "x2",
  "y1",
  "y2",
  "cx",
  "cy",
  "r",
  "d",
  "fill",
  "stroke",
  "stroke-width",
  "stroke-dasharray",
  "opacity",
  "transform",
  "text-anchor",
  "font-size",
  "font-weight",
  "dominant-baseline",
  "paint-order",
  "preserveaspectratio",
  "role",
  "aria-hidden",
  "aria-labelledby",
  "aria-label",
  "id",
  "clip-path",
  "data-device",
  "offset",
  "stop-color",
]);
const URL_ATTRIBUTES = new Set(["href", "src"]);

const TAG = /<(\/?)([A-Za-z][A-Za-z0-9]*)((?:\s+[A-Za-z][A-Za-z0-9:-]*="[^"<]*")*)\s*(\/?)>/y;
const ATTRIBUTE = /\s+([A-Za-z][A-Za-z0-9:-]*)="([^"<]*)"/g;

/** A short quotation of `text` at `at`, for messages. */
function near(text: string, at: number): string {
  const s = text.slice(at, at + 60);
  return JSON.stringify(s.length < text.length - at ? `${s}…` : s);
}

/**
 * Why `html` is not markup waferbook's renderers write, naming what was found
 * and where (character offset); undefined when it is. `ids: false` for the
 * notes: markdown-it writes no id (nor name), and one there could take the
 * name of an element the page's scripts look up (the chart data).
 */
export function markupProblem(html: string, options: { ids?: boolean } = {}): string | undefined {
  const ids = options.ids ?? true;
  const open: string[] = [];
  let at = html.indexOf("<");
  while (at !== -1) {
    TAG.lastIndex = at;
    const m = TAG.exec(html);
    if (!m) return `markup that is not a plain tag at character ${at}: ${near(html, at)}`;
    const [whole, closing, rawName, attrs, selfClosing] = m;
    const name = rawName.toLowerCase();
    if (!ELEMENTS.has(name)) return `the element <${rawName}> at character ${at}, which waferbook never writes there`;
    if (closing) {
      if (attrs || selfClosing) return `a closing tag with attributes at character ${at}: ${near(html, at)}`;
      const expected = open.pop();
      if (expected !== name) return `</${rawName}> at character ${at} where ${expected ? `</${expected}>` : "no closing tag"} was expected`;
    } else {
      for (const a of attrs.matchAll(ATTRIBUTE)) {
        const attr = a[1].toLowerCase();
        if (!ATTRIBUTES.has(attr) || (attr === "id" && !ids))
          return `the attribute ${a[1]}="…" on <${rawName}> at character ${at}, which waferbook never writes${attr.startsWith("on") ? " (an event handler runs script)" : ""}`;
        if (URL_ATTRIBUTES.has(attr)) {
          const why = urlProblem(a[2]);
          if (why) return `${why}, on <${rawName}> at character ${at}`;
        }
      }
      if (selfClosing && !SVG_ELEMENTS.has(name) && !VOID.has(name)) return `a self-closing <${rawName}/> at character ${at}, which HTML leaves open`;
      if (!selfClosing && !VOID.has(name)) open.push(name);
    }
    at = html.indexOf("<", at + whole.length);
  }
  if (open.length) return `<${open.at(-1)}> is never closed`;
  return undefined;
}

/**
 * Why `json` is not JSON as jsonForScript (charts.ts) writes it for a
 * `<script type="application/json">` block: it must parse, and hold no "<",
 * ">", "&", U+2028 or U+2029 (written as \u escapes), so it can never close
 * its script element. Returns the parsed value when it is.
 */
export function scriptJsonProblem(json: string): { problem: string } | { value: unknown } {
  const bad = /[<>&\u2028\u2029]/.exec(json);
  if (bad)
    return {
      problem: `the chart data hold a raw ${JSON.stringify(bad[0])} at character ${bad.index} (waferbook writes it as a \\u escape): ${near(json, Math.max(0, bad.index - 20))}`,
    };
  try {
    return { value: JSON.parse(json) as unknown };
  } catch (e) {
    return { problem: `the chart data are not JSON (${(e as Error).message})` };
  }
}
