/**
 * Reads a compound unit ("cm^2/(V s)", "uF/cm^2", "/cm^2", "nm/min") into
 * its dimension (exponents of the SI base units) and its factor to the
 * coherent SI unit, from the closed table of src/physics/unitTable.ts.
 *
 * The text is the one spelling of unitSpelling.ts (normaliseUnit): micro is
 * "u", Ω is "ohm", superscripts and "cm2" are "cm^2", "Vs" and "V·s" are
 * "(V s)". The grammar:
 *
 *   unit    = product? ["/" (factor | "(" product ")")]     one "/" at most
 *   product = factor { (" " | "*") factor }
 *   factor  = name ["^" integer] | "(" product ")" ["^" integer]
 *   name    = a unit of the table, alone or after one prefix it takes
 *
 * A unit of the table is matched as written first ("min", "Pa", "sccm"),
 * then as prefix + unit ("mT", "kΩ" → "kohm", "mbar"); a prefix the unit
 * does not take ("MT", "mcm", "kmin") is refused. °C and °F (degC, degF)
 * carry an offset and are read only on their own: "°C/min" is refused
 * (a rate of temperature is written in K/min).
 *
 * Limits (UNIT_LIMITS, checked before reading, each refusal says which): at most
 * 200 characters, brackets at most 8 deep, powers integers within ±12, each base
 * dimension's exponent within ±12, and a factor to SI that is a normal, finite,
 * non-zero double (so "mm^100/km^100" is never read as 0).
 */
import { BASE_UNITS, PREFIXES, UNIT_LIMITS, UNITS, type UnitDefinition } from "../physics/unitTable.ts";

export interface ParsedUnit {
  /** Exponents of BASE_UNITS (m, kg, s, A, K, mol). */
  dim: number[];
  /** The factor to SI is mantissa × 10^decade (prefixes and decimal multiples in the decade, exactly). */
  mantissa: number;
  decade: number;
  /** Set when the unit is one temperature scale with an offset (°C, °F) on its own. */
  offset?: number;
}

export type UnitRead = { ok: true; unit: ParsedUnit } | { ok: false; reason: string; name?: string };

/** °C, ° C, ℃ → degC (and °F): the table's names. */
function temperatureNames(text: string): string {
  return text.replace(/°\s*C(?![A-Za-z])|\u2103/g, "degC").replace(/°\s*F(?![A-Za-z])|\u2109/g, "degF");
}

type Token = { kind: "name"; text: string } | { kind: "power"; value: number; text: string } | { kind: "op"; text: string };

function tokens(text: string): Token[] | string {
  const out: Token[] = [];
  const re = /([A-Za-z]+)|\^\s*([-+]?\d+)|([/*()])|(\s+)|(.)/gy;
  let space = false;
  let depth = 0;
  let m: RegExpExecArray | null;
  // biome-ignore lint/suspicious/noAssignInExpressions: the usual RegExp.exec loop
  while (re.lastIndex < text.length && (m = re.exec(text))) {
    if (m[4]) {
      space = true;
      continue;
    }
    if (m[5] !== undefined) return `the character ${JSON.stringify(m[5])} is not part of a unit`;
    if (m[3] === "(" && ++depth > UNIT_LIMITS.bracketDepth) return `brackets more than ${UNIT_LIMITS.bracketDepth} deep inside one another`;
    if (m[3] === ")") depth--;
    if (m[2] !== undefined && !(Math.abs(Number(m[2])) <= UNIT_LIMITS.power)) {
      return `the power ^${m[2]} is beyond ±${UNIT_LIMITS.power} (powers are whole numbers from -${UNIT_LIMITS.power} to ${UNIT_LIMITS.power})`;
    }
    const tok: Token = m[1]
      ? { kind: "name", text: m[1] }
      : m[2] !== undefined
        ? { kind: "power", value: Number(m[2]), text: m[2] }
        : { kind: "op", text: m[3] };
    // A space between two factors multiplies them ("V s", "cm^2 V^-1"), as does a factor right after a power or a bracket ("cm^2V^-1").
    const prev = out.at(-1);
    const endsFactor = prev && (prev.kind !== "op" || prev.text === ")");
    const startsFactor = tok.kind === "name" || (tok.kind === "op" && tok.text === "(");
    if (endsFactor && startsFactor && (space || prev.kind !== "name")) out.push({ kind: "op", text: "*" });
    out.push(tok);
    space = false;
  }
  return out;
}

/** The table's unit for a name, with the prefix's power of ten; a string says why not. */
export function lookUpName(name: string): { def: UnitDefinition; prefix: number } | string {
  if (Object.hasOwn(UNITS, name)) return { def: UNITS[name], prefix: 0 };
  const prefix = name[0];
  const rest = name.slice(1);
  if (rest && Object.hasOwn(UNITS, rest) && Object.hasOwn(PREFIXES, prefix)) {
    const def = UNITS[rest];
    if (def.prefixes.includes(prefix)) return { def, prefix: PREFIXES[prefix] };
    return def.prefixes ? `${rest} takes the prefixes ${[...def.prefixes].join(", ")}, not ${prefix}` : `${rest} takes no prefix`;
  }
  return `"${name}" is not a unit waferbook knows`;
}

class Reader {
  private i = 0;
  constructor(private readonly toks: Token[]) {}
  peek(): Token | undefined {
    return this.toks[this.i];
  }
  next(): Token | undefined {
    return this.toks[this.i++];
  }
  atOp(text: string): boolean {
    const t = this.peek();
    return t?.kind === "op" && t.text === text;
  }
}

class UnitError extends Error {
  constructor(
    message: string,
    readonly unitName?: string,
  ) {
    super(message);
  }
}

type Acc = { dim: number[]; mantissa: number; decade: number; terms: { def: UnitDefinition; power: number; prefix: number }[] };

function power(r: Reader): number {
  const t = r.peek();
  if (t?.kind !== "power") return 1;
  r.next();
  return t.value;
}

function factor(r: Reader, acc: Acc, sign: number): void {
  const t = r.next();
  if (t?.kind === "name") {
    const found = lookUpName(t.text);
    if (typeof found === "string") throw new UnitError(found, t.text);
    const p = power(r) * sign;
    acc.terms.push({ def: found.def, power: p, prefix: found.prefix });
    return;
  }
  if (t?.kind === "op" && t.text === "(") {
    const inner: Acc = { dim: [0, 0, 0, 0, 0, 0], mantissa: 1, decade: 0, terms: [] };
    product(r, inner, 1);
    if (!r.atOp(")")) throw new UnitError("a bracket is not closed");
    r.next();
    const p = power(r) * sign;
    for (const term of inner.terms) acc.terms.push({ ...term, power: term.power * p });
    return;
  }
  throw new UnitError(t ? `a unit name was expected where ${t.kind === "power" ? "a power" : JSON.stringify(t.text)} is` : "the unit ends too early");
}

function product(r: Reader, acc: Acc, sign: number): void {
  factor(r, acc, sign);
  while (r.atOp("*")) {
    r.next();
    factor(r, acc, sign);
  }
}

/** Reads a unit (in normaliseUnit's spelling); the reason names what was wrong. */
export function readUnit(text: string): UnitRead {
  const cached = CACHE.get(text);
  if (cached) return cached;
  const result = readUncached(text);
  if (CACHE.size < 1000) CACHE.set(text, result);
  return result;
}
const CACHE = new Map<string, UnitRead>();

function readUncached(text: string): UnitRead {
  if (text.length > UNIT_LIMITS.length)
    return { ok: false, reason: `the unit has ${text.length} characters, more than the ${UNIT_LIMITS.length} a unit may have` };
  try {
    return readWithinLimits(text);
  } catch (err) {
    // A refusal, never a crash: whatever goes wrong in reading one unit stays with that unit.
    return { ok: false, reason: `the unit could not be read (${err instanceof Error ? err.message : String(err)})` };
  }
}

function readWithinLimits(text: string): UnitRead {
  const toks = tokens(temperatureNames(text).trim());
  if (typeof toks === "string") return { ok: false, reason: toks };
  if (toks.length === 0) return { ok: false, reason: "there is no unit" };
  const r = new Reader(toks);
  const acc: Acc = { dim: [0, 0, 0, 0, 0, 0], mantissa: 1, decade: 0, terms: [] };
  try {
    if (!r.atOp("/")) product(r, acc, 1);
    if (r.atOp("/")) {
      r.next();
      factor(r, acc, -1);
    }
    if (r.atOp("/")) throw new UnitError(`one "/" at most: write the rest of the denominator in brackets or with negative powers (m/s^2, cm^-2 V^-1)`);
    const rest = r.peek();
    if (rest) throw new UnitError(`${rest.kind === "power" ? "a power" : JSON.stringify(rest.kind === "op" ? rest.text : rest.text)} is out of place`);
  } catch (err) {
    if (err instanceof UnitError) return { ok: false, reason: err.message, ...(err.unitName ? { name: err.unitName } : {}) };
    throw err;
  }
  const offsetTerms = acc.terms.filter((t) => t.def.offset !== undefined);
  if (offsetTerms.length > 0 && (acc.terms.length !== 1 || acc.terms[0].power !== 1)) {
    return { ok: false, reason: "°C and °F are read only on their own (a temperature); a rate or a difference of temperature is written in K (K/min)" };
  }
  for (const { def, power: p, prefix } of acc.terms) {
    def.dim.forEach((e, k) => (acc.dim[k] += e * p));
    acc.mantissa *= def.mantissa ** p;
    acc.decade += (def.decade + prefix) * p;
  }
  const big = acc.dim.findIndex((e) => !(Math.abs(e) <= UNIT_LIMITS.power));
  if (big >= 0) return { ok: false, reason: `the power of ${BASE_UNITS[big]} comes to ${acc.dim[big]}, beyond ±${UNIT_LIMITS.power}` };
  const toSI = timesTen(acc.mantissa, acc.decade);
  if (!Number.isFinite(toSI) || Math.abs(toSI) < MIN_NORMAL) {
    return {
      ok: false,
      reason: `its factor to SI units (${acc.mantissa}e${acc.decade}) is beyond the range of numbers waferbook computes with (about 1e-308 to 1e308)`,
    };
  }
  const unit: ParsedUnit = { dim: acc.dim, mantissa: acc.mantissa, decade: acc.decade };
  if (offsetTerms.length) unit.offset = offsetTerms[0].def.offset;
  return { ok: true, unit };
}

/** The smallest normal double, 2^-1022 (IEEE 754): a factor below it has lost its precision. */
const MIN_NORMAL = 2 ** -1022;

export function sameDimension(a: ParsedUnit, b: ParsedUnit): boolean {
  return a.dim.every((e, k) => e === b.dim[k]);
}

/** value × 10^decade, by one exact power of ten (a division for negative decades, so 1e-3 is never rounded on the way). */
function timesTen(value: number, decade: number): number {
  return decade >= 0 ? value * 10 ** decade : value / 10 ** -decade;
}

/**
 * `value` in unit `from`, expressed in unit `to` (same dimension: check with
 * sameDimension first). Offsets: kelvin = (value + offset) × mantissa.
 */
export function convertUnit(value: number, from: ParsedUnit, to: ParsedUnit): number {
  if (from.offset !== undefined || to.offset !== undefined) {
    if (from.offset === to.offset && from.mantissa === to.mantissa) return value;
    const kelvin = timesTen((value + (from.offset ?? 0)) * from.mantissa, from.decade);
    return timesTen(kelvin / to.mantissa, -to.decade) - (to.offset ?? 0);
  }
  const ratio = from.mantissa === to.mantissa ? 1 : from.mantissa / to.mantissa;
  return timesTen(value * ratio, from.decade - to.decade);
}

/** A dimension as SI base units: [2, 1, -3, -1, 0] → "m^2 kg s^-3 A^-1". */
export function dimensionText(dim: readonly number[]): string {
  const parts = dim.flatMap((e, k) => (e === 0 ? [] : [e === 1 ? BASE_UNITS[k] : `${BASE_UNITS[k]}^${e}`]));
  return parts.length ? parts.join(" ") : "no dimension";
}
