/**
 * Checks a drawn wafer page read back from a cache folder (src/cli/drawnPages.ts)
 * before it is published: a cache folder merged from CI jobs is only as
 * trustworthy as whoever could write into it, and a drawn page is published
 * as it is (docs/scaling.md, "Trust"). Everything is checked against an
 * allow-list of what waferbook's own drawing writes (waferPages.ts
 * drawWaferPage), not against a list of known tricks:
 *
 *   - the page model (waferPage.ts waferPageModel): its id is the wafer's
 *     folder (the page's path is made from it); it has every top-level
 *     field the drawing writes, of its type (PAGE_MODEL_FIELDS: the
 *     templates throw on an undefined output, so a field left out would fail
 *     the whole build); it holds only plain objects, lists and primitives,
 *     as the drawing writes (a Set, Map, Date, typed array… is refused:
 *     v8.deserialize rebuilds them and Nunjucks iterates them, so a Set could
 *     carry markup past a check that reads only objects); every field the templates
 *     place unescaped is markup the renderers write (preparedMarkup.ts:
 *     `notesHtml` and every `…svg` field) or chart JSON as jsonForScript
 *     writes it (`chartsJson`, `json`), and every link field (`href`, `src`,
 *     chart `links`) is a relative link (safeUrl.ts relativeLinkProblem: the
 *     drawing links only within the site), and the notes carry no `id`
 *     (preparedMarkup.ts: an id could take the name of an element the page's
 *     scripts look up). The other
 *     strings are escaped by the templates (autoescape), whatever they hold.
 *     test/publish/drawnPageCheck.test.ts reads the templates and fails when
 *     a new unescaped or link field is not covered here;
 *   - the files: only `wafers/<id>/compare.js` (the comparison data,
 *     compareData.ts: exactly its frame around JSON holding no "<", for this
 *     wafer) and PNG pictures under `wafers/<id>/images/` and
 *     `wafers/<id>/structure/` (a PNG signature, well-formed chunks with
 *     their CRC, IHDR first, nothing after IEND). A script, an HTML page or
 *     an SVG file is refused whatever its name.
 *
 * Each check returns why the page is refused (what was found and where), or
 * undefined.
 */
import { crc32 } from "node:zlib";
import { compareScriptFrame } from "./compareData.ts";
import { markupProblem, scriptJsonProblem } from "./preparedMarkup.ts";
import { relativeLinkProblem } from "./safeUrl.ts";

/** Model fields the templates place unescaped as markup. */
export const MARKUP_FIELD = (key: string) => key === "notesHtml" || /svg$/i.test(key);
/** Model fields the templates place unescaped inside `<script type="application/json">`. */
export const JSON_FIELD = (key: string) => key === "chartsJson" || key === "json";
/** Model fields the templates or the chart script use as a link (`links`: a chart point's link, charts.js). */
export const URL_FIELD = (key: string) => key === "href" || key === "src";

/**
 * The top-level fields of the page model as waferPageModel (waferPage.ts)
 * writes them, with their kinds: "?" after a kind means the field may be
 * undefined (or absent, which the templates see alike), "|null" that it may
 * be null. test/publish/drawnPageCheck.test.ts checks that a freshly drawn
 * model has exactly these fields, of these kinds.
 */
export const PAGE_MODEL_FIELDS: Readonly<Record<string, string>> = {
  toc: "list",
  id: "text",
  run: "text",
  grown: "text",
  grade: "text",
  reactor: "text",
  title: "text?",
  verdict: "text",
  reasons: "list",
  decision: "object|null",
  metrics: "list",
  checks: "object",
  legend: "list",
  devices: "list",
  growth: "object?",
  stack: "list",
  notesHtml: "text",
  problems: "list",
  files: "list",
  settings: "list",
  transportCharts: "list",
  transportDepth: "object?",
  structure: "object?",
  images: "object?",
  uniformity: "object?",
  charts: "list",
  chartsJson: "text",
  units: "object",
};

/** The kind of a value as PAGE_MODEL_FIELDS names it ("undefined" and "null" for those). */
export function kindOf(v: unknown): string {
  if (v === undefined) return "undefined";
  if (v === null) return "null";
  if (Array.isArray(v)) return "list";
  if (typeof v === "string") return "text";
  return typeof v;
}

function shapeProblem(model: Record<string, unknown>): string | undefined {
  for (const [key, kinds] of Object.entries(PAGE_MODEL_FIELDS)) {
    const found = kindOf(model[key]);
    const base = kinds.replace(/\?$/, "").split("|");
    if (base.includes(found) || (found === "undefined" && kinds.endsWith("?"))) continue;
    return found === "undefined"
      ? `the page model has no field ${key}, which every drawn page has (the page could not be rendered)`
      : `the page model's field ${key} is ${found === "undefined" || found === "null" ? found : `a ${found}`}, not ${kinds.replace(/\?$/, " (or undefined)").replace("|", " or ")}`;
  }
  return undefined;
}

/** Why a drawn page's model is refused; undefined when it holds only what waferbook draws. */
export function pageModelProblem(model: unknown, folder: string): string | undefined {
  if (typeof model !== "object" || model === null || Array.isArray(model)) return "the page model is not an object";
  const id = (model as { id?: unknown }).id;
  if (id !== folder) return `the page model is for ${JSON.stringify(id)}, not for ${JSON.stringify(folder)}`;
  return walk(model, "", new Set()) ?? shapeProblem(model as Record<string, unknown>);
}

/** Why `value` (an object) is not a plain object or list as the drawing writes, or undefined. */
function plainProblem(value: object, where: string): string | undefined {
  const proto: unknown = Object.getPrototypeOf(value);
  if (Array.isArray(value) ? proto === Array.prototype : proto === Object.prototype || proto === null) return undefined;
  const kind = Object.prototype.toString.call(value).slice(8, -1);
  // "an Int8Array", "an Object" but "a Uint8Array" (said "you-int"): the constructor names that reach here start with A, E, I, O or U.
  return `${where || "the page model"} is ${/^[AEIO]/.test(kind) ? "an" : "a"} ${kind}, which waferbook's drawing never writes (a page model holds plain objects, lists, text, numbers and true/false)`;
}

function walk(value: unknown, where: string, seen: Set<object>): string | undefined {
  if (typeof value === "function") return `${where} is a function`;
  if (typeof value !== "object" || value === null) return undefined;
  if (seen.has(value)) return undefined;
  seen.add(value);
  const notPlain = plainProblem(value, where);
  if (notPlain) return notPlain;
  const entries: [string, unknown][] = Array.isArray(value) ? value.map((v, i) => [String(i), v]) : Object.entries(value);
  for (const [key, v] of entries) {
    const at = where ? `${where}.${key}` : key;
    const problem = Array.isArray(value) ? walk(v, at, seen) : field(key, v, at, seen);
    if (problem) return problem;
  }
  return undefined;
}

function field(key: string, v: unknown, at: string, seen: Set<object>): string | undefined {
  const text = (check: (s: string) => string | undefined) =>
    v === undefined || v === null ? undefined : typeof v !== "string" ? `${at} is a ${typeof v}, not text` : check(v);
  if (MARKUP_FIELD(key)) return text((s) => inField(at, markupProblem(s, { ids: key !== "notesHtml" })));
  if (URL_FIELD(key)) return text((s) => inField(at, relativeLinkProblem(s)));
  if (key === "links") {
    if (!Array.isArray(v) || Object.getPrototypeOf(v) !== Array.prototype) return v === undefined ? undefined : `${at} is not a list of links`;
    for (const [i, l] of v.entries()) {
      const why = typeof l === "string" ? relativeLinkProblem(l) : "a link that is not text";
      if (why) return inField(`${at}.${i}`, why);
    }
    return undefined;
  }
  if (JSON_FIELD(key)) {
    return text((s) => {
      const parsed = scriptJsonProblem(s);
      return "problem" in parsed ? inField(at, parsed.problem) : walk(parsed.value, at, seen);
    });
  }
  return walk(v, at, seen);
}

const inField = (at: string, why: string | undefined) => why && `${at}: ${why}`;

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
const PICTURE = /^(images|structure)\/[A-Za-z0-9_-]+\.png$/;

/** Why a file of a drawn page is refused; `rel` is its path from the site root, which the caller has checked starts with `wafers/<folder>/`. */
export function drawnFileProblem(rel: string, bytes: Uint8Array, folder: string): string | undefined {
  const inWafer = rel.slice(`wafers/${folder}/`.length);
  if (inWafer === "compare.js") return compareFileProblem(Buffer.from(bytes).toString("utf8"), folder);
  if (PICTURE.test(inWafer)) return pngProblem(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), rel);
  return `the file ${rel}, which waferbook never draws (a drawn page holds compare.js and PNG pictures under images/ and structure/)`;
}

function compareFileProblem(text: string, folder: string): string | undefined {
  const { before, after } = compareScriptFrame(folder);
  if (!text.startsWith(before) || !text.endsWith(after) || text.length < before.length + after.length)
    return `wafers/${folder}/compare.js is not the comparison data waferbook writes for this wafer: it starts ${JSON.stringify(text.slice(0, 80))}`;
  const json = text.slice(before.length, text.length - after.length);
  if (json.includes("<")) return `wafers/${folder}/compare.js holds a raw "<" at character ${before.length + json.indexOf("<")}`;
  let data: unknown;
  try {
    data = JSON.parse(json);
  } catch (e) {
    return `wafers/${folder}/compare.js holds more than one JSON value (${(e as Error).message}): whatever follows the data would run as script`;
  }
  if ((data as { id?: unknown } | null)?.id !== folder)
    return `wafers/${folder}/compare.js holds the data of ${JSON.stringify((data as { id?: unknown } | null)?.id)}`;
  return undefined;
}

function pngProblem(b: Buffer, rel: string): string | undefined {
  if (b.length < 8 || !b.subarray(0, 8).equals(PNG_SIGNATURE))
    return `${rel} is not a PNG picture: it starts ${JSON.stringify(b.subarray(0, 16).toString("latin1"))}`;
  let at = 8;
  let first = true;
  while (at + 12 <= b.length) {
    const length = b.readUInt32BE(at);
    const type = b.toString("latin1", at + 4, at + 8);
    if (!/^[A-Za-z]{4}$/.test(type) || at + 12 + length > b.length) return `${rel}: a broken PNG chunk at byte ${at}`;
    if (first && type !== "IHDR") return `${rel}: the PNG does not start with its IHDR chunk`;
    first = false;
    if (crc32(b.subarray(at + 4, at + 8 + length)) !== b.readUInt32BE(at + 8 + length)) return `${rel}: the PNG chunk ${type} at byte ${at} fails its CRC`;
    at += 12 + length;
    if (type === "IEND") return at === b.length ? undefined : `${rel}: ${b.length - at} bytes after the PNG's end (IEND), which a picture never has`;
  }
  return `${rel}: the PNG has no end chunk (IEND)`;
}
