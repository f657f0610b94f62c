/**
 * Checks and compiles a wafer.md entry's reading instructions — `columns`,
 * `layout` and `conditions` on a device, `xrd` or `profiles` entry
 * (docs/formats.md, "Files as the instruments write them") — into the rules
 * src/read/instrumentTable.ts applies to each file. Everything wrong is a
 * problem located at its wafer.md line, found when the record is validated,
 * before any data file is read.
 *
 * Regular expressions (`file_name`, `line`) are compiled once here. Where the
 * runtime offers V8's linear-time engine (the `l` flag behind
 * --enable-experimental-regexp-engine, switched on here for this process),
 * every pattern runs in time linear in its input, so no pattern can hang a
 * build; patterns it cannot run in linear time (backreferences, lookaround)
 * are refused with a located message. Nested unbounded quantifiers such as
 * (a+)+, exponential in a backtracking engine, are refused on every runtime. Patterns are at most
 * MAX_PATTERN_CHARS long, and matched only against bounded input
 * (instrumentTable.ts).
 */
import v8 from "node:v8";
import type { ColumnRule, ConditionRule, ReadingRules, RuleSite } from "../read/instrumentTable.ts";
import { didYouMean, type ProblemList } from "../model/problem.ts";
import { acceptedUnits, splitValueUnit, unitFactor, type Dimension } from "./units.ts";
import { suggestUnit } from "./unitSpelling.ts";
import { COLUMN_UNITS } from "./units.ts";

export const MAX_PATTERN_CHARS = 200;

/** What an entry's files may hold: the quantities (name → dimension, or text) and the conditions. */
export interface ReadingContext {
  /** "device", "xrd" or "profiles", for messages. */
  what: string;
  quantity(name: string): Dimension | "text" | undefined;
  quantityNames: readonly string[];
  conditions: Record<string, Dimension | "text">;
}

let linear: boolean | undefined;
/** True when this runtime can compile patterns for V8's linear-time engine (checked once). */
export function linearEngine(): boolean {
  if (linear === undefined) {
    try {
      v8.setFlagsFromString("--enable-experimental-regexp-engine");
      new RegExp("a", "l" as string);
      linear = true;
    } catch {
      linear = false;
    }
  }
  return linear;
}

/** A quantified group whose body holds an unbounded quantifier, e.g. (a+)+ or (\d*x)*: exponential backtracking in a backtracking engine. */
function nestedQuantifier(src: string): boolean {
  const stack: boolean[] = [];
  let inClass = false;
  for (let i = 0; i < src.length; i++) {
    const ch = src[i];
    if (ch === "\\") {
      i++;
      continue;
    }
    if (inClass) {
      if (ch === "]") inClass = false;
      continue;
    }
    if (ch === "[") inClass = true;
    else if (ch === "(") stack.push(false);
    else if (ch === ")") {
      const inner = stack.pop() ?? false;
      const next = src[i + 1];
      const unbounded = next === "*" || next === "+" || (next === "{" && /^\{\d*,\}/.test(src.slice(i + 1)));
      if (inner && unbounded) return true;
      if (stack.length && (inner || unbounded)) stack[stack.length - 1] = true;
    } else if ((ch === "*" || ch === "+" || (ch === "{" && /^\{\d*,\}/.test(src.slice(i)))) && stack.length) stack[stack.length - 1] = true;
    else if (ch === "|" && stack.length) stack[stack.length - 1] = true;
  }
  return false;
}

export function compilePattern(src: string, at: RuleSite, list: ProblemList): RegExp | undefined {
  const base = { file: at.file, line: at.line, field: at.field };
  if (src.length > MAX_PATTERN_CHARS) {
    list.add({
      ...base,
      message: "regular expression is too long",
      expected: `at most ${MAX_PATTERN_CHARS} characters`,
      found: `${src.length} characters`,
      fix: "match only the part of the name or line that holds the value",
    });
    return undefined;
  }
  if (!src.includes("(?<value>")) {
    list.add({
      ...base,
      message: "regular expression has no value group",
      expected: 'a named group (?<value>…) around the number, such as "Vg=(?<value>[-0-9.]+)V"',
      found: JSON.stringify(src),
      fix: "put (?<value> … ) around the part that is the value",
    });
    return undefined;
  }
  let re: RegExp;
  try {
    re = new RegExp(src, linearEngine() ? "l" : "");
  } catch (e) {
    const msg = (e as Error).message;
    const slow = /linear time/.test(msg);
    list.add({
      ...base,
      message: slow ? "regular expression cannot be matched in linear time" : "regular expression is malformed",
      expected: slow
        ? "a pattern without backreferences (\\1, \\k<…>), lookaround ((?=…), (?<=…)) or large nested repeats such as (?:[0-9]{0,1000}){0,1000}"
        : "a JavaScript regular expression",
      found: `${JSON.stringify(src)}: ${msg.replace(/^Invalid regular expression: /, "")}`,
      fix: slow ? "rewrite it with plain groups and character classes" : "check the brackets and escapes (in YAML double quotes a backslash is written \\\\)",
    });
    return undefined;
  }
  // Refused on every runtime, so a wafer.md that builds here builds everywhere (and the linear engine is a second guard).
  if (nestedQuantifier(src)) {
    list.add({
      ...base,
      message: "regular expression could take exponential time (a repeated group holds a repeat or an alternative)",
      expected: "no nested repeats such as (a+)+ or (x|y)*",
      found: JSON.stringify(src),
      fix: "use one character class instead, e.g. [-0-9.,]+",
    });
    return undefined;
  }
  return re;
}

function site(file: string, field: string, lineOf: (f: string) => number | undefined): RuleSite {
  return { file, field, line: lineOf(field) };
}

/**
 * The compiled rules of one entry (`prefix` is its field path, e.g.
 * `devices[2]` or `xrd`), or undefined when it gives none. Problems go to
 * `list`, each at its wafer.md line.
 */
export function compileReadingRules(
  entry: Record<string, unknown>,
  prefix: string,
  ctx: ReadingContext,
  file: string,
  lineOf: (f: string) => number | undefined,
  list: ProblemList,
): ReadingRules | undefined {
  const { columns, layout, conditions } = entry as {
    columns?: Record<string, unknown>;
    layout?: Record<string, unknown>;
    conditions?: Record<string, Record<string, unknown>>;
  };
  if (columns === undefined && layout === undefined && conditions === undefined) return undefined;
  const rules: ReadingRules = { conditions: [] };
  if (columns && typeof columns === "object") {
    const out: ColumnRule[] = [];
    const targets = new Map<string, string>();
    for (const [header, target] of Object.entries(columns)) {
      const field = `${prefix}.columns.${header}`;
      const at = { ...site(file, `${prefix}.columns`, lineOf), field };
      at.line = lineOf(field) ?? lineOf(`${prefix}.columns`);
      const m = typeof target === "string" ? /^\s*([A-Za-z_][A-Za-z0-9_.]*)\s*(?:\[([^\]]*)\])?\s*$/.exec(target) : null;
      if (!m) {
        list.add({
          ...at,
          message: "cannot read the column mapping",
          expected: `a quantity and its unit, such as "Rxx [kohm]" (${ctx.what} quantities: ${ctx.quantityNames.join(", ")})`,
          found: JSON.stringify(target),
          fix: "write the quantity name and its unit in square brackets",
        });
        continue;
      }
      const [, name, unitRaw] = m;
      const unit = (unitRaw ?? "").trim();
      const dim = ctx.quantity(name);
      if (dim === undefined) {
        const hint = didYouMean(name, ctx.quantityNames);
        list.add({
          ...at,
          message: `column ${JSON.stringify(header)} is mapped to an unknown quantity`,
          expected: `one of ${ctx.quantityNames.join(", ")}`,
          found: JSON.stringify(name),
          fix: hint ? `did you mean "${hint}"?` : "map it to a quantity the analysis reads, or leave the column out (unmapped columns are ignored)",
        });
        continue;
      }
      if (dim !== "text" && unitFactor(dim, unit) === undefined) {
        const hint = suggestUnit(unit, Object.keys(COLUMN_UNITS[dim]));
        list.add({
          ...at,
          message: `unit of ${name} is not accepted`,
          expected: acceptedUnits(dim),
          found: unit === "" ? "no unit" : JSON.stringify(unit),
          fix: hint
            ? `did you mean "${hint}"? Write "${name} [${hint}]"`
            : `write "${name} [${acceptedUnits(dim).split(", ")[0]}]" with the unit the file uses`,
        });
        continue;
      }
      if (targets.has(name)) {
        list.add({
          ...at,
          message: `two columns are mapped to ${name}`,
          expected: "each quantity from one column",
          found: `${JSON.stringify(targets.get(name))} and ${JSON.stringify(header)}`,
          fix: "map only one of them",
        });
        continue;
      }
      targets.set(name, header);
      out.push({ header: header.trim(), name, unit, text: dim === "text", at });
    }
    if (out.length) rules.columns = out;
  }
  if (layout && typeof layout === "object") {
    rules.layoutAt = site(file, `${prefix}.layout`, lineOf);
    rules.separator = layout.separator as ReadingRules["separator"];
    rules.decimal = layout.decimal as ReadingRules["decimal"];
    rules.headerRow = layout.header_row as number | undefined;
    if (rules.separator === "comma" && rules.decimal === "comma") {
      list.add({
        ...rules.layoutAt,
        message: "a decimal comma with commas between cells cannot be read",
        expected: "separator semicolon, tab or whitespace with decimal: comma",
        found: "separator: comma, decimal: comma",
        fix: "set the separator the file really uses",
      });
    }
  }
  if (conditions && typeof conditions === "object") {
    for (const [key, spec] of Object.entries(conditions)) {
      const field = `${prefix}.conditions.${key}`;
      const at = site(file, field, lineOf);
      const dim = ctx.conditions[key];
      if (dim === undefined) {
        const hint = didYouMean(key, Object.keys(ctx.conditions));
        list.add({
          ...at,
          message: `unknown condition for a ${ctx.what}`,
          expected: Object.keys(ctx.conditions).join(", "),
          found: JSON.stringify(key),
          fix: hint ? `did you mean "${hint}"?` : "remove it, or give it as a column",
        });
        continue;
      }
      if (!spec || typeof spec !== "object") continue; // the schema has reported it
      const sources = (["file_name", "line", "value"] as const).filter((s) => spec[s] !== undefined);
      if (sources.length !== 1) {
        list.add({
          ...at,
          message: `condition ${key} needs exactly one source`,
          expected: "one of file_name: (a pattern), line: (a pattern) or value:",
          found: sources.length ? sources.join(" and ") : "none",
          fix: "keep one of them",
        });
        continue;
      }
      const source = sources[0];
      const unit = typeof spec.unit === "string" ? spec.unit.trim() : undefined;
      const unitAt = site(file, `${field}.unit`, lineOf);
      if (unit !== undefined && dim !== "text" && unitFactor(dim, unit) === undefined) {
        const hint = suggestUnit(unit, Object.keys(COLUMN_UNITS[dim]));
        list.add({
          ...unitAt,
          message: `unit of the ${key} condition is not accepted`,
          expected: acceptedUnits(dim),
          found: JSON.stringify(unit),
          fix: hint ? `did you mean "${hint}"?` : `write one of ${acceptedUnits(dim)}`,
        });
        continue;
      }
      const rule: ConditionRule = { key, source, unit, at: site(file, `${field}.${source}`, lineOf) };
      if (source === "value") {
        const text = `${String(spec.value).trim()}${unit ? ` ${unit}` : ""}`;
        if (dim !== "text") {
          const vu = splitValueUnit(text);
          if (!vu || unitFactor(dim, vu.unit) === undefined) {
            list.add({
              ...rule.at,
              message: `cannot read the ${key} condition's value`,
              expected: `a number and one of ${acceptedUnits(dim)}, such as ${JSON.stringify(key === "current" ? "10 nA" : key === "temperature" ? "1.6 K" : key === "gate" ? "0.3 V" : "0 T")}`,
              found: JSON.stringify(text),
              fix: "give the number with its unit",
            });
            continue;
          }
        }
        rule.value = String(spec.value).trim();
      } else {
        if (typeof spec[source] !== "string") continue; // the schema has reported it
        const re = compilePattern(spec[source] as string, rule.at, list);
        if (!re) continue;
        rule.pattern = re;
        rule.patternText = spec[source] as string;
      }
      rules.conditions.push(rule);
    }
  }
  return rules;
}

/** What a device's sweep files may hold (src/validate/sweep.ts). */
export function deviceReading(sweepColumns: Record<string, { dim: Dimension }>): ReadingContext {
  return {
    what: "device",
    quantity: (n) => sweepColumns[n]?.dim,
    quantityNames: Object.keys(sweepColumns),
    conditions: { gate: "voltage", field: "field", temperature: "temperature", current: "current" },
  };
}

/** What X-ray files may hold (src/validate/xrd.ts): map and peak-table columns. */
export function xrdReading(columns: Record<string, Dimension | "text">): ReadingContext {
  return { what: "xrd entry", quantity: (n) => columns[n], quantityNames: Object.keys(columns), conditions: { reflection: "text", wavelength: "length" } };
}

/** What depth profiles may hold (src/validate/depthProfile.ts): depth, Ge and contaminants by element symbol. */
export const PROFILE_READING: ReadingContext = {
  what: "profiles entry",
  quantity: (n) => (n === "depth" ? "length" : n === "Ge" ? "fraction" : /^[A-Z][a-z]?$/.test(n) && n !== "Si" ? "concentration" : undefined),
  quantityNames: ["depth", "Ge", "an element symbol such as O or C"],
  conditions: { method: "text" },
};
