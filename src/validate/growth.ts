/**
 * Growth conditions of a wafer: the `growth:` block of wafer.md (docs/formats.md,
 * section 1, Growth conditions). Every quantity is typed with its unit and
 * converted here, once, to the unit the site shows: temperatures to °C, growth
 * rates to nm/min, gas flows to sccm, anneal times to s.
 * Units are read through parseQuantity (units.ts) from the closed unit table
 * (src/physics/unitTable.ts), which holds the growers' spellings: °C, °F, K,
 * sccm, slm, Torr, mTorr, mbar, Pa. Every problem is located (file, line,
 * field) and reported with the others of the file.
 *
 * Gas flows are standard flows: sccm and slm (also mol/min), referenced to
 * 0 °C (273.15 K) and 101.325 kPa. An actual volume flow (L/min, cm³/min) is
 * refused with the reason and the conversion, since it depends on the gas's
 * pressure and temperature. A lab whose mass-flow controllers use a 20 °C
 * reference must convert its readings (× 273.15/293.15) first.
 * The growth figures are records of the process, nothing more: the lab's own
 * gas-safety procedures govern every process gas (docs/formats.md).
 */
import { didYouMean, InputError, ProblemList, show } from "../model/problem.ts";
import { parseQuantity } from "./units.ts";

export interface GrowthLayer {
  /** The stack layer's name (stack[].name). */
  layer: string;
  /** Substrate (susceptor) temperature during the layer, °C. */
  temperature_C?: number;
  /** Growth rate, nm/min. */
  rate_nm_per_min?: number;
  /** Chamber pressure, Torr. */
  pressure_Torr?: number;
  /** Precursor and carrier flows, gas name → sccm, in the order written. */
  flows_sccm: [string, number][];
}

export interface GrowthAnneal {
  name: string;
  temperature_C: number;
  time_s: number;
}

export interface GrowthConditions {
  /** The reactor's recipe name. */
  recipe?: string;
  layers: GrowthLayer[];
  anneals: GrowthAnneal[];
}

/** A quantity's target unit (in the unit table), the unit shown, and its plausible range in the shown unit. */
const QUANTITIES = {
  temperature: { target: "degC", shown: "°C", min: -50, max: 1500, what: "substrate temperature" },
  rate: { target: "nm/min", shown: "nm/min", min: 0, max: 1e5, what: "growth rate" },
  pressure: { target: "torr", shown: "Torr", min: 0, max: 1e4, what: "chamber pressure" },
  flow: { target: "sccm", shown: "sccm", min: 0, max: 1e6, what: "gas flow" },
  time: { target: "s", shown: "s", min: 0, max: 1e6, what: "anneal time" },
} as const;
type QuantityName = keyof typeof QUANTITIES;

const LAYER_KEYS = ["layer", "temperature", "rate", "pressure", "flows"];
const ANNEAL_KEYS = ["name", "temperature", "time"];
const TOP_KEYS = ["recipe", "layers", "anneals"];

export interface GrowthWhere {
  file: string;
  lineOf: (field: string) => number | undefined;
  /** Names of the record's stack layers: a growth layer must name one of them (when the stack is given). */
  stackNames: readonly string[];
}

/**
 * Validates the `growth:` block; undefined when absent. Throws an InputError
 * holding every problem of the block.
 */
export function readGrowth(raw: unknown, where: GrowthWhere): GrowthConditions | undefined {
  if (raw === undefined || raw === null) return undefined;
  const { file, lineOf } = where;
  const list = new ProblemList(file);
  const fail = (field: string, message: string, expected: string, found: string, fix: string) =>
    list.add({ file, line: lineOf(field), field, message, expected, found, fix });
  if (typeof raw !== "object" || Array.isArray(raw)) {
    throw new InputError({
      file,
      line: lineOf("growth"),
      field: "growth",
      message: "growth conditions must be a mapping",
      expected: "recipe:, layers: and anneals: indented under growth:",
      found: show(raw),
      fix: "see docs/formats.md, section Growth conditions",
    });
  }
  const r = raw as Record<string, unknown>;
  unknownKeys(r, TOP_KEYS, "growth", fail);
  let recipe: string | undefined;
  if (r.recipe !== undefined) {
    if (typeof r.recipe === "string" && r.recipe.trim()) recipe = r.recipe.trim();
    else fail("growth.recipe", "recipe name is not text", 'the reactor\'s recipe name, such as "QW-625-v2"', show(r.recipe), "write the recipe name in quotes");
  }
  const quantity = (value: unknown, q: QuantityName, field: string, required: boolean): number | undefined => {
    const spec = QUANTITIES[q];
    if (value === undefined) {
      if (required)
        fail(
          field,
          `${spec.what} is missing`,
          `a value with a unit, such as "1 ${spec.shown}"`,
          "nothing",
          `add ${field.split(".").at(-1)}: "… ${spec.shown}"`,
        );
      return undefined;
    }
    const parsed = parseQuantity(value, spec.target);
    if (!parsed.ok) {
      fail(
        field,
        `cannot read the ${spec.what}`,
        `a value with a unit convertible to ${spec.shown}, such as "${q === "temperature" ? "625 °C" : `1 ${spec.shown}`}"`,
        parsed.found,
        `write the number with its unit, in quotes (units: ${unitsOf(q)})`,
      );
      return undefined;
    }
    if (!(parsed.value >= spec.min && parsed.value <= spec.max) || (q !== "temperature" && q !== "flow" && parsed.value === 0)) {
      fail(
        field,
        `${spec.what} is out of range`,
        `${q === "temperature" || q === "flow" ? "from" : "above"} ${spec.min} up to ${spec.max} ${spec.shown}`,
        `${show(value)} (${Number(parsed.value.toPrecision(6))} ${spec.shown})`,
        "check the number and its unit",
      );
      return undefined;
    }
    return Number(parsed.value.toPrecision(12));
  };
  const layers: GrowthLayer[] = [];
  const layerIndex: number[] = [];
  const seen = new Set<string>();
  listOf(r.layers, "growth.layers", fail).forEach((item, i) => {
    const at = `growth.layers[${i}]`;
    if (!item)
      return fail(
        at,
        "a growth layer must be a mapping",
        "layer:, temperature:, rate:, pressure: and flows:",
        "something else",
        'write { layer: well, temperature: "625 °C", … }',
      );
    unknownKeys(item, LAYER_KEYS, at, fail);
    const name = item.layer;
    if (typeof name !== "string" || !name.trim())
      return fail(`${at}.layer`, "growth layer does not name its layer", "the name of a layer of stack:", show(name), "add layer: <name of a stack layer>");
    if (where.stackNames.length && !where.stackNames.includes(name)) {
      const hint = didYouMean(name, [...where.stackNames]);
      fail(
        `${at}.layer`,
        "growth layer names no layer of the stack",
        `one of ${where.stackNames.join(", ")}`,
        JSON.stringify(name),
        hint ? `did you mean "${hint}"?` : "use a name from stack:",
      );
    }
    if (seen.has(name)) fail(`${at}.layer`, "layer has two growth entries", "one entry per layer", JSON.stringify(name), "merge the two entries");
    seen.add(name);
    const flows: [string, number][] = [];
    if (item.flows !== undefined) {
      if (!item.flows || typeof item.flows !== "object" || Array.isArray(item.flows))
        fail(
          `${at}.flows`,
          "flows must be a mapping of gas to flow",
          '{ SiH4: "20 sccm", GeH4: "8 sccm" }',
          show(item.flows),
          "write one gas: flow pair per gas",
        );
      else {
        for (const [gas, v] of Object.entries(item.flows as Record<string, unknown>)) {
          const f = quantity(v, "flow", `${at}.flows.${gas}`, true);
          if (f !== undefined) flows.push([gas, f]);
        }
      }
    }
    layerIndex.push(i);
    layers.push({
      layer: name,
      temperature_C: quantity(item.temperature, "temperature", `${at}.temperature`, false),
      rate_nm_per_min: quantity(item.rate, "rate", `${at}.rate`, false),
      pressure_Torr: quantity(item.pressure, "pressure", `${at}.pressure`, false),
      flows_sccm: flows,
    });
  });
  const anneals: GrowthAnneal[] = [];
  const annealIndex: number[] = [];
  listOf(r.anneals, "growth.anneals", fail).forEach((item, i) => {
    const at = `growth.anneals[${i}]`;
    if (!item)
      return fail(
        at,
        "an anneal must be a mapping",
        "name:, temperature: and time:",
        "something else",
        'write { name: post-growth, temperature: "800 °C", time: "60 s" }',
      );
    unknownKeys(item, ANNEAL_KEYS, at, fail);
    const name = typeof item.name === "string" && item.name.trim() ? item.name.trim() : undefined;
    if (!name) fail(`${at}.name`, "anneal has no name", "a short name, such as post-growth", show(item.name), "add name: …");
    const temperature = quantity(item.temperature, "temperature", `${at}.temperature`, true);
    const time = quantity(item.time, "time", `${at}.time`, true);
    if (name && temperature !== undefined && time !== undefined) {
      annealIndex.push(i);
      anneals.push({ name, temperature_C: temperature, time_s: time });
    }
  });
  const conditions = { recipe, layers, anneals };
  for (const c of columnKeyCollisions(conditions, layerIndex, annealIndex)) fail(c.field, c.message, c.expected, c.found, c.fix);
  list.done();
  return conditions;
}

/** Where a column key comes from: the field that names it, and the name as the lab wrote it. */
interface KeyOrigin {
  /** The field whose name makes the key: growth.layers[i].layer, growth.layers[i].flows.<gas> or growth.anneals[i].name. */
  field: string;
  /** What it is, for the message: layer "upper barrier", gas "GeH4" of layer "well", anneal "post-growth". */
  what: string;
}

/**
 * Two different names that become the same column key (slug: lower case, other
 * characters as "_"), such as layers "upper barrier" and "upper-barrier", gases
 * "GeH4" and "geh4" of one layer, or a layer "x flow y" beside gas "y" of layer
 * "x": one column would silently overwrite the other in results.csv, results.json
 * and the relation page. Each colliding pair is reported once, at the later of
 * the two naming fields, naming both originals.
 */
function columnKeyCollisions(g: GrowthConditions, layerIndex: readonly number[], annealIndex: readonly number[]) {
  const origins = new Map<string, KeyOrigin>();
  const reported = new Set<string>();
  const out: { field: string; message: string; expected: string; found: string; fix: string }[] = [];
  const claim = (key: string, origin: KeyOrigin) => {
    const first = origins.get(key);
    if (!first) return void origins.set(key, origin);
    const pair = `${first.field}|${origin.field}`;
    if (first.field === origin.field || reported.has(pair)) return;
    reported.add(pair);
    if (first.what === origin.what) {
      // The same name twice: a layer's is reported above ("layer has two growth entries"); an anneal's here.
      if (origin.field.endsWith(".name"))
        out.push({
          field: origin.field,
          message: "anneal has two entries",
          expected: "one entry per anneal name",
          found: `${origin.what.slice(7)} also at ${first.field}`,
          fix: "give the second anneal its own name (such as post-growth-2), or merge the two",
        });
      return;
    }
    out.push({
      field: origin.field,
      message: `${origin.what} and ${first.what} (${first.field}) give the same column key`,
      expected: 'names that stay different in lower case with other characters as "_" (column keys such as growth_<layer>_temperature)',
      found: `both become ${key}`,
      fix: "rename one of them so that the two differ by more than case, spaces or punctuation, or merge them if they are one",
    });
  };
  g.layers.forEach((l, i) => {
    const at = `growth.layers[${layerIndex[i]}]`;
    const layer: KeyOrigin = { field: `${at}.layer`, what: `layer ${JSON.stringify(l.layer)}` };
    const s = slug(l.layer);
    if (l.temperature_C !== undefined) claim(`growth_${s}_temperature`, layer);
    if (l.rate_nm_per_min !== undefined) claim(`growth_${s}_rate`, layer);
    if (l.pressure_Torr !== undefined) claim(`growth_${s}_pressure`, layer);
    for (const [gas] of l.flows_sccm)
      claim(`growth_${s}_flow_${slug(gas)}`, { field: `${at}.flows.${gas}`, what: `gas ${JSON.stringify(gas)} of layer ${JSON.stringify(l.layer)}` });
  });
  g.anneals.forEach((a, i) => {
    const anneal: KeyOrigin = { field: `growth.anneals[${annealIndex[i]}].name`, what: `anneal ${JSON.stringify(a.name)}` };
    claim(`anneal_${slug(a.name)}_temperature`, anneal);
    claim(`anneal_${slug(a.name)}_time`, anneal);
  });
  return out;
}

function unitsOf(q: QuantityName): string {
  return {
    temperature: "°C, K or °F",
    rate: "nm/min, nm/s, µm/h or Å/s",
    pressure: "Torr, mTorr, mbar or Pa",
    flow: "sccm or slm, standard flows referenced to 0 °C and 101.325 kPa",
    time: "s, min or h",
  }[q];
}

type Fail = (field: string, message: string, expected: string, found: string, fix: string) => void;

function unknownKeys(obj: Record<string, unknown>, known: readonly string[], at: string, fail: Fail): void {
  for (const k of Object.keys(obj)) {
    if (known.includes(k)) continue;
    const hint = didYouMean(k, [...known]);
    fail(
      `${at}.${k}`,
      "unknown key",
      `one of ${known.join(", ")}`,
      JSON.stringify(k),
      hint ? `did you mean "${hint}"?` : "remove it, or see docs/formats.md, section Growth conditions",
    );
  }
}

/** The items of a list field (a mapping each, or null for an item that is not); a non-list is reported. */
function listOf(v: unknown, field: string, fail: Fail): (Record<string, unknown> | null)[] {
  if (v === undefined || v === null) return [];
  if (!Array.isArray(v)) {
    fail(field, "wrong type", "a list", show(v), 'write one "- …" item per line');
    return [];
  }
  return v.map((x) => (x && typeof x === "object" && !Array.isArray(x) ? (x as Record<string, unknown>) : null));
}

/** One numeric growth condition, flattened for the exports and the relation page. */
export interface GrowthVariable {
  /** Column key: growth_<layer>_temperature, growth_<layer>_flow_<gas>, anneal_<name>_time… */
  key: string;
  label: string;
  /** Unit as shown (°C, nm/min, Torr, sccm, s). */
  unit: string;
  value: number;
}

/**
 * Lower-case letters, digits and underscores: "upper barrier" → "upper_barrier".
 * Accented letters lose their accents (Unicode canonical decomposition, NFD, then
 * the combining marks dropped: "é" → "e", "Ü" → "u"); any other character beyond
 * ASCII that is a letter or a digit is kept as its code point, after lower case ("Ω" → "u3c9",
 * "层" → "u5c42"), so a non-Latin name gives a key of its own, readable in a
 * collision message, rather than "x".
 */
export function slug(text: string): string {
  return (
    text
      .normalize("NFD")
      .replace(/\p{M}+/gu, "")
      .toLowerCase()
      .replace(/\P{ASCII}/gu, (c) => (/[\p{L}\p{N}]/u.test(c) ? `_u${c.codePointAt(0)!.toString(16)}_` : "_"))
      .replace(/[^a-z0-9]+/g, "_")
      .replace(/^_|_$/g, "") || "x"
  );
}

/** The numeric conditions of a wafer, flattened in a fixed order (layers as written, then anneals). */
export function growthVariables(g: GrowthConditions | undefined): GrowthVariable[] {
  if (!g) return [];
  const out: GrowthVariable[] = [];
  for (const l of g.layers) {
    const s = slug(l.layer);
    if (l.temperature_C !== undefined)
      out.push({ key: `growth_${s}_temperature`, label: `${l.layer}: growth temperature`, unit: "°C", value: l.temperature_C });
    if (l.rate_nm_per_min !== undefined) out.push({ key: `growth_${s}_rate`, label: `${l.layer}: growth rate`, unit: "nm/min", value: l.rate_nm_per_min });
    if (l.pressure_Torr !== undefined) out.push({ key: `growth_${s}_pressure`, label: `${l.layer}: pressure`, unit: "Torr", value: l.pressure_Torr });
    for (const [gas, f] of l.flows_sccm) out.push({ key: `growth_${s}_flow_${slug(gas)}`, label: `${l.layer}: ${gas} flow`, unit: "sccm", value: f });
  }
  for (const a of g.anneals) {
    const s = slug(a.name);
    out.push({ key: `anneal_${s}_temperature`, label: `${a.name} anneal: temperature`, unit: "°C", value: a.temperature_C });
    out.push({ key: `anneal_${s}_time`, label: `${a.name} anneal: time`, unit: "s", value: a.time_s });
  }
  return out;
}
