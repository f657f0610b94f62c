/**
 * Turns a wafer.md front matter (unknown) into a typed WaferRecord, once.
 * Shape is checked with Ajv against WAFER_SCHEMA; each Ajv error becomes a
 * located problem with a plain-words message and, for near-miss keys, a
 * "did you mean" hint. Semantic checks (id equals folder, real and past dates,
 * settings) follow.
 */
import { readDecision, type Decision } from "./decision.ts";
import type { ReadingRules } from "../read/instrumentTable.ts";
import { compileReadingRules, deviceReading, PROFILE_READING, xrdReading, type ReadingContext } from "./readingRules.ts";
import { SWEEP_COLUMNS } from "./sweep.ts";
import { MAP_COLUMNS, PEAK_COLUMNS } from "./xrd.ts";
import { isRealDate } from "./dates.ts";
import { Ajv, type ErrorObject } from "ajv";
import { lineOfField, type FrontMatterDoc } from "../read/frontMatter.ts";
import { checkRelativePath } from "../read/dataFiles.ts";
import { applySettings, type AnalysisSettings } from "./settings.ts";
import { checkDeviceDimensions, checkFiniteNumbers } from "./recordNumbers.ts";
import { siteNameProblem } from "./siteNames.ts";
import { didYouMean, InputError, ProblemList, show } from "../model/problem.ts";
import { METRIC_BY_KEY } from "../model/metrics.ts";
import { FINDING_KEYS, isFindingKey } from "./findingKeys.ts";
import { FIELD_HINTS, WAFER_SCHEMA } from "./waferSchema.ts";
import { unitInKey } from "./unitInKey.ts";
import { readGrowth, type GrowthConditions } from "./growth.ts";

export type LayerRole = "substrate" | "buffer" | "barrier" | "well" | "cap" | "other";
export interface Layer {
  name: string;
  role: LayerRole;
  material?: string;
  ge?: number;
  thickness_nm?: number;
}
export interface DeviceSpec {
  id: string;
  geometry: "hall-bar" | "van-der-pauw";
  length_um?: number;
  width_um?: number;
  at_mm?: [number, number];
  files: string;
  /** Compiled reading instructions (columns, layout, conditions), when given; not enumerable, so never serialised. */
  reading?: ReadingRules;
}
export interface ImageSpec {
  file: string;
  /** nm per pixel; may be left out for a TIFF whose resolution tags give it (src/read/tiffMicrograph.ts). */
  pixel_nm?: number;
  kind: "haadf" | "hrtem";
  growth_axis: "up" | "down" | "left" | "right";
  reference?: [number, number, number, number];
}
/** A recorded waiver: it names a metric or a finding (src/judge/findings.ts), never both. */
export interface Waiver {
  metric?: string;
  finding?: string;
  reason: string;
  approved_by: string;
  date: string;
}
export interface WaferRecord {
  wafer: string;
  run: string;
  grown: string;
  grade?: string;
  reactor?: string;
  title?: string;
  stack: Layer[];
  devices: DeviceSpec[];
  xrd?: { files: string; reading?: ReadingRules };
  profiles?: { files: string; reading?: ReadingRules };
  images: ImageSpec[];
  waivers: Waiver[];
  /** The lab's decision on the wafer (src/validate/decision.ts), when recorded. */
  decision?: Decision;
  /** Growth conditions (src/validate/growth.ts), when recorded. */
  growth?: GrowthConditions;
  /** Settings in force for this wafer: defaults ← analysis.yaml ← the wafer's `analysis:` block. */
  settings: AnalysisSettings;
  /** Only the keys this wafer overrides, as typed. */
  settingOverrides: Record<string, unknown>;
  notes: string;
  /** Path of wafer.md relative to the data folder. */
  file: string;
}

const ajv = new Ajv({ allErrors: true, strict: false });
const validateShape = ajv.compile(WAFER_SCHEMA);

/** YAML turns unquoted dates into Date objects; records keep ISO strings. */
function datesToStrings(v: unknown): unknown {
  if (v instanceof Date) return Number.isNaN(v.getTime()) ? String(v) : v.toISOString().slice(0, 10);
  if (Array.isArray(v)) return v.map(datesToStrings);
  if (v && typeof v === "object") return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, datesToStrings(x)]));
  return v;
}

function fieldPath(instancePath: string): string {
  return instancePath
    .split("/")
    .filter(Boolean)
    .map((p) => (/^\d+$/.test(p) ? `[${p}]` : `.${p}`))
    .join("")
    .replace(/^\./, "");
}

/** The parts of a JSON Schema node that schemaAt walks. */
interface SchemaNode {
  items?: SchemaNode;
  properties?: Record<string, SchemaNode>;
}

function schemaAt(path: string[]): { properties?: Record<string, unknown> } | undefined {
  let s: SchemaNode | undefined = WAFER_SCHEMA as SchemaNode;
  for (const p of path) {
    if (!s) return undefined;
    s = /^\d+$/.test(p) ? s.items : s.properties?.[p];
  }
  return s;
}

function ajvToInputError(e: ErrorObject, doc: FrontMatterDoc, file: string, data: unknown): InputError {
  const segs = e.instancePath.split("/").filter(Boolean);
  const base = fieldPath(e.instancePath);
  const valueAt = segs.reduce<unknown>((v, k) => (v == null ? v : (v as Record<string, unknown>)[k]), data);
  const lineOf = (f: string) => lineOfField(doc.matterText, f, doc.firstLine);
  const last = segs[segs.length - 1] ?? "";
  switch (e.keyword) {
    case "additionalProperties": {
      const key = (e.params as { additionalProperty: string }).additionalProperty;
      const known = Object.keys(schemaAt(segs)?.properties ?? {});
      const hint = didYouMean(key, known);
      const field = base ? `${base}.${key}` : key;
      return new InputError({
        file,
        line: lineOf(field),
        field,
        message: "unknown key",
        expected: `one of ${known.join(", ")}`,
        found: JSON.stringify(key),
        fix: hint ? `did you mean "${hint}"?` : "remove it, or see docs/formats.md for the keys a record may have",
      });
    }
    case "required": {
      const key = (e.params as { missingProperty: string }).missingProperty;
      const field = base ? `${base}.${key}` : key;
      // A missing field has no line of its own. A top-level one is located at the
      // opening "---" (always present, unlike the line after it, which may be the
      // closing "---" of an empty block); a nested one at the mapping that lacks it.
      const opening = doc.firstLine - 1;
      const line = base ? (lineOf(base) ?? opening) : opening;
      const fix = base ? `add "${key}: …" to ${base}` : `add a line "${key}: …" between the two "---" lines`;
      return new InputError({
        file,
        line,
        field,
        message: "required field is missing",
        expected: FIELD_HINTS[key] ?? `a value for "${key}"`,
        found: "nothing",
        fix,
      });
    }
    case "enum":
      return new InputError({
        file,
        line: lineOf(base),
        field: base,
        message: "value is not one of the allowed choices",
        expected: (e.params as { allowedValues: unknown[] }).allowedValues.join(" | "),
        found: show(valueAt),
        fix: FIELD_HINTS[last] ? `use ${FIELD_HINTS[last]}` : "use one of the listed values",
      });
    case "pattern": {
      const isDate = /grown|date/.test(last);
      return new InputError({
        file,
        line: lineOf(base),
        field: base,
        message: isDate ? "not a date" : "not a valid id",
        expected: isDate ? "a date written YYYY-MM-DD" : 'letters, digits, ".", "-" or "_" (up to 64, starting with a letter or digit, no "..")',
        found: show(valueAt),
        fix: isDate ? "write the date as 2025-03-14" : "rename it using only the allowed characters",
      });
    }
    case "type": {
      const slip = (e.params as { type: string }).type === "number" ? unitInKey(last, valueAt) : undefined;
      if (slip) return new InputError({ file, line: lineOf(base), field: base, ...slip, found: show(valueAt) });
      return new InputError({
        file,
        line: lineOf(base),
        field: base,
        message: "wrong type",
        expected: `${(e.params as { type: string }).type === "array" ? "a list" : (e.params as { type: string }).type === "object" ? "a mapping" : `a ${(e.params as { type: string }).type}`}`,
        found: show(valueAt),
        fix: "see docs/formats.md for this field",
      });
    }
    default:
      return new InputError({
        file,
        line: lineOf(base),
        field: base,
        message: `value is out of range (${e.message})`,
        expected: e.message ?? "a valid value",
        found: show(valueAt),
        fix: "see docs/formats.md for this field",
      });
  }
}

export interface WaferContext {
  /** Folder name the record lives in. */
  folder: string;
  /** Path of wafer.md relative to the data folder. */
  file: string;
  /** Today's date (YYYY-MM-DD), passed in so tests can pin it. */
  today: string;
  siteSettings: AnalysisSettings;
}

/**
 * Every problem of the record is reported (up to MAX_PROBLEMS_PER_FILE): each
 * schema error once per field, then the semantic checks, each on its own, on
 * the parts whose shape is valid.
 */
export function validateWafer(doc: FrontMatterDoc, ctx: WaferContext): WaferRecord {
  const data = datesToStrings(doc.data ?? {});
  const { file } = ctx;
  const lineOf = (f: string) => lineOfField(doc.matterText, f, doc.firstLine);
  if (typeof data !== "object" || Array.isArray(data)) {
    throw new InputError({
      file,
      line: doc.firstLine,
      message: "front matter must be a mapping of fields",
      expected: "key: value lines",
      found: show(data),
      fix: 'write one "key: value" per line between the two "---" lines, such as "wafer: <id>"; see docs/formats.md',
    });
  }
  const list = new ProblemList(file);
  /** Fields whose value failed the schema: semantic checks skip them. */
  const badFields = new Set<string>();
  if (!validateShape(data)) {
    // One message per field, the most specific: unknown keys and missing fields before type noise.
    const order = ["additionalProperties", "required", "type", "enum", "pattern"];
    const rank = (k: string) => (order.includes(k) ? order.indexOf(k) : order.length);
    const errors = [...(validateShape.errors ?? [])].sort((a, b) => rank(a.keyword) - rank(b.keyword));
    const seen = new Set<string>();
    for (const e of errors) {
      const err = ajvToInputError(e, doc, file, data);
      const key = err.problem.field ?? "";
      if (seen.has(key)) continue;
      seen.add(key);
      badFields.add(fieldPath(e.instancePath));
      list.add(err.problem);
    }
  }
  const shapeOk = list.ok;
  const bad = (field: string) =>
    [...badFields].some((b) =>
      b === "" ? false : field === b || field.startsWith(`${b}.`) || field.startsWith(`${b}[`) || b.startsWith(`${field}.`) || b.startsWith(`${field}[`),
    );
  // biome-ignore lint/suspicious/noExplicitAny: the record before validation; each field is checked before use below
  const r = data as Record<string, any>;
  if (typeof r.wafer === "string" && !bad("wafer") && r.wafer !== ctx.folder) {
    list.add({
      file,
      line: lineOf("wafer"),
      field: "wafer",
      message: "wafer id does not match its folder",
      expected: JSON.stringify(ctx.folder),
      found: JSON.stringify(r.wafer),
      fix: "make the id and the folder name the same (rename one of them)",
    });
  }
  const reservedRun =
    typeof r.run !== "string"
      ? undefined
      : siteNameProblem(r.run, "run", { file, line: lineOf("run"), field: "run", rename: "run (and its runs/<id>.md file)" });
  if (reservedRun && !bad("run")) list.add(reservedRun);
  list.attempt(() => checkFiniteNumbers(r, file, lineOf));
  const waivers = (Array.isArray(r.waivers) ? r.waivers : []) as Record<string, unknown>[];
  const dates: [string, unknown][] = [["grown", r.grown], ...waivers.map((w, i): [string, unknown] => [`waivers[${i}].date`, w?.date])];
  for (const [key, value] of dates) {
    if (typeof value !== "string" || bad(key)) continue;
    if (!isRealDate(value)) {
      list.add({
        file,
        line: lineOf(key),
        field: key,
        message: "not a calendar date",
        expected: "a real date YYYY-MM-DD",
        found: JSON.stringify(value),
        fix: "correct the month or day",
      });
    } else if (value > ctx.today) {
      list.add({
        file,
        line: lineOf(key),
        field: key,
        message: "date is in the future",
        expected: `a date on or before ${ctx.today}`,
        found: value,
        fix: "correct the year or month",
      });
    }
  }
  waivers.forEach((w, i) => {
    if (!w || typeof w !== "object") return;
    const field = `waivers[${i}]`;
    const named = ["metric", "finding"].filter((k) => k in w);
    if (named.length !== 1) {
      list.add({
        file,
        line: lineOf(field),
        field,
        message: "a waiver names exactly one metric or one finding",
        expected: "metric: <metric key> or finding: <finding key>",
        found: named.length ? "both" : "neither",
        fix: "keep one of metric: or finding:",
      });
      return;
    }
    const [k] = named;
    const value = w[k];
    if (typeof value !== "string" || bad(`${field}.${k}`)) return;
    const known = k === "metric" ? [...METRIC_BY_KEY.keys()] : [...FINDING_KEYS];
    if (!(k === "metric" ? METRIC_BY_KEY.has(value) : isFindingKey(value))) {
      const hint = didYouMean(value, known);
      list.add({
        file,
        line: lineOf(`${field}.${k}`),
        field: `${field}.${k}`,
        message: `waiver names an unknown ${k}`,
        expected: `a ${k} key from docs/formats.md`,
        found: JSON.stringify(value),
        fix: hint ? `did you mean "${hint}"?` : `correct the ${k} key or remove the waiver`,
      });
    }
  });
  const devices = (Array.isArray(r.devices) ? r.devices : []) as DeviceSpec[];
  const ids = new Set<string>();
  devices.forEach((d, i) => {
    if (!d || typeof d !== "object" || bad(`devices[${i}]`)) return;
    if (ids.has(d.id))
      list.add({
        file,
        line: lineOf(`devices[${i}].id`),
        field: `devices[${i}].id`,
        message: "device id is used twice",
        expected: "a unique id per device",
        found: JSON.stringify(d.id),
        fix: "rename one of the devices",
      });
    ids.add(d.id);
    if (d.geometry === "hall-bar" && (d.length_um === undefined || d.width_um === undefined)) {
      list.add({
        file,
        line: lineOf(`devices[${i}]`),
        field: `devices[${i}]`,
        message: "a Hall bar needs its dimensions",
        expected: "length_um (voltage-probe spacing) and width_um (bar width)",
        found: `length_um ${show(d.length_um)}, width_um ${show(d.width_um)}`,
        fix: "add both, in micrometres",
      });
    }
  });
  // Reading instructions for files as the instruments write them: compiled once, each problem at its wafer.md line.
  const attach = (entry: unknown, prefix: string, ctx: ReadingContext) => {
    if (!entry || typeof entry !== "object" || bad(prefix)) return;
    const rules = compileReadingRules(entry as Record<string, unknown>, prefix, ctx, file, lineOf, list);
    if (rules) Object.defineProperty(entry, "reading", { value: rules, enumerable: false, configurable: true });
  };
  devices.forEach((d, i) => attach(d, `devices[${i}]`, deviceReading(SWEEP_COLUMNS)));
  attach(r.xrd, "xrd", xrdReading({ ...MAP_COLUMNS, ...PEAK_COLUMNS }));
  attach(r.profiles, "profiles", PROFILE_READING);
  list.attempt(() =>
    checkDeviceDimensions(
      devices.filter((d, i) => d && typeof d === "object" && !bad(`devices[${i}]`)),
      file,
      lineOf,
    ),
  );
  const images = (Array.isArray(r.images) ? r.images : []) as ImageSpec[];
  images.forEach((im, i) => {
    if (im && typeof im.file === "string" && !bad(`images[${i}].file`))
      list.attempt(() => checkRelativePath(im.file, { file, field: `images[${i}].file`, line: lineOf(`images[${i}].file`) }));
  });
  const settings = bad("analysis")
    ? ctx.siteSettings
    : list.attempt(() =>
        applySettings(ctx.siteSettings, r.analysis, { file, field: "analysis", line: lineOf("analysis"), lineOf: (k) => lineOf(`analysis.${k}`) }),
      );
  const stackNames = (Array.isArray(r.stack) ? r.stack : []).map((l: { name?: unknown }) => l?.name).filter((n: unknown): n is string => typeof n === "string");
  const growth = bad("growth") ? undefined : list.attempt(() => readGrowth(r.growth, { file, lineOf, stackNames }));
  const decision = bad("decision") ? undefined : list.attempt(() => readDecision(r.decision, { file, grown: r.grown, today: ctx.today, lineOf }));
  list.done();
  if (!shapeOk || !settings) throw new Error("validateWafer: problems recorded but not thrown"); // unreachable: done() threw
  return {
    wafer: r.wafer,
    run: r.run,
    grown: r.grown,
    grade: r.grade,
    reactor: r.reactor,
    title: r.title,
    stack: r.stack ?? [],
    devices,
    xrd: r.xrd,
    profiles: r.profiles,
    images: r.images ?? [],
    waivers: r.waivers ?? [],
    decision,
    growth,
    settings,
    settingOverrides: (r.analysis as Record<string, unknown>) ?? {},
    notes: doc.body,
    file,
  };
}
