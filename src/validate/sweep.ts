/**
 * Turns a raw table into a typed magnetotransport sweep (SI units), checking
 * everything the analysis relies on: known columns and units, the columns the
 * device geometry needs, a monotonic sweep axis without repeats, a non-zero
 * current, the metadata each kind of sweep must carry.
 */
import { numericColumn, type ColumnHeader, type RawTable } from "../read/table.ts";
import { didYouMean, InputError, ProblemList, type Problem } from "../model/problem.ts";
import { acceptedUnits, COLUMN_UNITS, splitValueUnit, unitFactor, type Dimension } from "./units.ts";
import { suggestUnit } from "./unitSpelling.ts";
import type { ConditionSource } from "../model/conditionSource.ts";

export type Geometry = "hall-bar" | "van-der-pauw";

export interface Sweep {
  file: string;
  kind: "field" | "gate";
  geometry: Geometry;
  /** Gate voltage of a field sweep, V. */
  gate_V?: number;
  /** Field of a gate sweep, T. */
  field_T?: number;
  temperature_K?: number;
  current_A?: number;
  /** Sweep axis: B in T (field sweep) or Vg in V (gate sweep), as measured (not re-ordered). */
  x: Float64Array;
  /** Longitudinal resistance (Hall bar), Ω. */
  rxx?: Float64Array;
  /** Hall resistance, Ω: always present on a field sweep; optional on a gate sweep, which does not use it. */
  rxy?: Float64Array;
  /** van der Pauw four-terminal resistances, Ω. */
  ra?: Float64Array;
  rb?: Float64Array;
  direction: "up" | "down";
  rows: number;
  warnings: Problem[];
  /** Where each condition the sweep carries (gate, field, temperature, current) came from, in that order, then a field sweep's field range (its B column). */
  conditions?: ConditionSource[];
}

export const SWEEP_COLUMNS: Record<string, { dim: Dimension; meaning: string }> = {
  B: { dim: "field", meaning: "magnetic field" },
  Vg: { dim: "voltage", meaning: "gate voltage" },
  Rxx: { dim: "resistance", meaning: "longitudinal resistance" },
  Rxy: { dim: "resistance", meaning: "Hall resistance" },
  Vxx: { dim: "voltage", meaning: "longitudinal voltage" },
  Vxy: { dim: "voltage", meaning: "Hall voltage" },
  I: { dim: "current", meaning: "source current" },
  Ra: { dim: "resistance", meaning: "van der Pauw resistance R_A" },
  Rb: { dim: "resistance", meaning: "van der Pauw resistance R_B" },
};

const META: Record<string, Dimension> = { gate: "voltage", field: "field", temperature: "temperature", current: "current" };

function metaValue(t: RawTable, key: string): number | undefined {
  const entry = t.meta.get(key);
  if (!entry) return undefined;
  const dim = META[key];
  // A table with decimal commas has them in its metadata too: "# gate: 0,35 V".
  const vu = splitValueUnit(t.decimal === "," ? entry.value.replace(/^(\s*[-+]?\d*),(\d)/, "$1.$2") : entry.value);
  const factor = vu ? unitFactor(dim, vu.unit) : undefined;
  if (!vu || factor === undefined) {
    throw new InputError({
      file: t.file,
      line: entry.line,
      field: entry.rule ?? `# ${key}`,
      message: `cannot read the ${key} ${entry.rule ? `condition given by ${entry.rule}` : "metadata"}`,
      expected: `a number and one of ${acceptedUnits(dim)}`,
      found: JSON.stringify(entry.value),
      fix: `write for example "# ${key}: ${dim === "voltage" ? "0.35 V" : dim === "field" ? "0 T" : dim === "temperature" ? "1.6 K" : "10 nA"}"`,
    });
  }
  return vu.value * factor;
}

function column(t: RawTable, name: string): ColumnHeader | undefined {
  return t.columns.find((c) => c.name === name);
}

function readColumn(t: RawTable, c: ColumnHeader): Float64Array {
  const spec = SWEEP_COLUMNS[c.name];
  const factor = unitFactor(spec.dim, c.unit);
  if (factor === undefined) {
    throw new InputError({
      file: t.file,
      line: t.headerLine,
      field: `column ${c.name}`,
      message: `unit of the ${spec.meaning} is not accepted`,
      expected: acceptedUnits(spec.dim),
      found: c.unit === "" ? "no unit" : JSON.stringify(c.unit),
      fix: `write the header as "${c.name} [${suggestUnit(c.unit, Object.keys(COLUMN_UNITS[spec.dim])) ?? acceptedUnits(spec.dim).split(", ")[0]}]"`,
    });
  }
  return numericColumn(t, c, factor);
}

/** Checks that an axis runs one way without repeats; returns the direction. */
function checkAxis(t: RawTable, x: Float64Array, name: string): "up" | "down" {
  if (x.length < 2) return "up";
  const up = x[1] > x[0];
  for (let i = 1; i < x.length; i++) {
    if (x[i] === x[i - 1]) {
      throw new InputError({
        file: t.file,
        line: t.rowLines[i],
        field: `column ${name}`,
        message: `${name} value repeats`,
        expected: `${name} changing from row to row`,
        found: `${x[i]} twice in a row`,
        fix: "average or remove the repeated reading",
      });
    }
    if (x[i] > x[i - 1] !== up) {
      throw new InputError({
        file: t.file,
        line: t.rowLines[i],
        field: `column ${name}`,
        message: `${name} is not sorted`,
        expected: `${name} ${up ? "increasing" : "decreasing"} throughout, as in the first rows`,
        found: `${x[i - 1]} then ${x[i]}`,
        fix: "split up and down sweeps into separate files",
      });
    }
  }
  return up ? "up" : "down";
}

/**
 * Every problem of the file is reported (up to MAX_PROBLEMS_PER_FILE): each
 * unknown column, each column's unit and bad cells, each metadata line; only
 * the checks that need a column that could not be read are left out.
 */
export function validateSweep(t: RawTable, geometry: Geometry): Sweep {
  const warnings: Problem[] = [...(t.readingNotes ?? [])];
  const list = new ProblemList(t.file);
  for (const c of t.columns) {
    if (!(c.name in SWEEP_COLUMNS)) {
      const hint = didYouMean(c.name, Object.keys(SWEEP_COLUMNS));
      list.add({
        file: t.file,
        line: t.headerLine,
        field: `column ${c.index + 1}`,
        message: "unknown column",
        expected: Object.keys(SWEEP_COLUMNS).join(", "),
        found: JSON.stringify(c.name),
        fix: hint ? `did you mean "${hint}"?` : "rename or remove the column",
      });
    }
  }
  const hasB = column(t, "B");
  const hasVg = column(t, "Vg");
  if (hasB && hasVg) {
    list.add({
      file: t.file,
      line: t.headerLine,
      message: "both B and Vg columns",
      expected: "one sweep axis: B (field sweep) or Vg (gate sweep)",
      found: "both",
      fix: "keep the swept quantity as a column and give the fixed one as # metadata",
    });
  }
  if (!hasB && !hasVg) {
    list.add({
      file: t.file,
      line: t.headerLine,
      message: "no sweep axis",
      expected: "a B column (field sweep) or a Vg column (gate sweep)",
      found: t.columns.map((c) => c.name).join(", "),
      fix: "add the swept quantity as the first column",
    });
  }
  // Each known column is read on its own: a bad unit or cell in one does not hide another's.
  const values = new Map<string, Float64Array>();
  for (const c of t.columns) {
    if (!(c.name in SWEEP_COLUMNS)) continue;
    const v = list.attempt(() => readColumn(t, c));
    if (v) values.set(c.name, v);
  }
  const meta = (key: string) => list.attempt(() => metaValue(t, key));
  const gate_V = meta("gate");
  const field_T = meta("field");
  const temperature_K = meta("temperature");
  let current_A = meta("current");
  const kind = hasB ? "field" : "gate";
  const axis = hasB ?? hasVg;
  const x = axis ? values.get(axis.name) : undefined;
  const direction = x && axis ? list.attempt(() => checkAxis(t, x, axis.name)) : undefined;
  if (axis && kind === "field" && gate_V === undefined && !t.meta.has("gate")) {
    list.add({
      file: t.file,
      line: t.headerLine,
      field: "# gate",
      message: t.conditionMisses?.has("gate")
        ? `field sweep without its gate voltage: ${t.conditionMisses.get("gate")}`
        : "field sweep without its gate voltage",
      expected: 'a line "# gate: <value> V" before the header',
      found: "none",
      fix: "add the gate voltage the sweep was taken at",
    });
  }
  if (axis && kind === "gate" && field_T === undefined && !t.meta.has("field")) {
    list.add({
      file: t.file,
      line: t.headerLine,
      field: "# field",
      message: t.conditionMisses?.has("field") ? `gate sweep without its field: ${t.conditionMisses.get("field")}` : "gate sweep without its field",
      expected: 'a line "# field: <value> T" before the header',
      found: "none",
      fix: "add the field the sweep was taken at (0 T for zero field)",
    });
  }
  const currentCol = values.get("I");
  if (currentCol) {
    const zero = currentCol.indexOf(0);
    if (zero >= 0) {
      list.add({
        file: t.file,
        line: t.rowLines[zero],
        field: "column I",
        message: "current is zero",
        expected: "a non-zero source current",
        found: "0",
        fix: "remove rows taken with the source off",
      });
    }
  }
  if (current_A === 0) {
    list.add({
      file: t.file,
      line: t.meta.get("current")?.line,
      field: "# current",
      message: "current is zero",
      expected: "a non-zero source current",
      found: "0",
      fix: "give the current the sample was driven with",
    });
  }
  const voltagesNeedCurrent = ["Vxx", "Vxy"].filter((n) => column(t, n));
  if (voltagesNeedCurrent.length && !column(t, "I") && !t.meta.has("current")) {
    list.add({
      file: t.file,
      line: t.headerLine,
      field: voltagesNeedCurrent.length > 1 ? `columns ${voltagesNeedCurrent.join(" and ")}` : `column ${voltagesNeedCurrent[0]}`,
      message: "voltage given without the current",
      expected: 'an I column or a line "# current: 10 nA"',
      found: "neither",
      fix: "add the source current so voltages can be turned into resistances",
    });
  }
  const has = (n: string) => !!column(t, n);
  // The Hall resistance is needed only where the Hall effect is used: field sweeps. A gate sweep
  // (percolation, hysteresis) needs only the longitudinal resistance(s).
  const hall = kind === "field";
  const columnsOk = (geometry === "hall-bar" ? has("Rxx") || has("Vxx") : has("Ra") && has("Rb")) && (!hall || has("Rxy") || has("Vxy"));
  // A misspelt column is already reported as unknown (with its likely name): not again as missing.
  const unknownNames = t.columns.some((c) => !(c.name in SWEEP_COLUMNS));
  if (!columnsOk && !unknownNames) {
    const need =
      geometry === "hall-bar" ? (hall ? "Rxx and Rxy (or Vxx and Vxy with a current)" : "Rxx (or Vxx with a current)") : hall ? "Ra, Rb and Rxy" : "Ra and Rb";
    list.add({
      file: t.file,
      line: t.headerLine,
      message: `missing a column a ${geometry}${hall ? "" : " gate sweep"} needs`,
      expected: need,
      found: t.columns.map((c) => c.name).join(", "),
      fix: "add the missing column, or check the device geometry in wafer.md",
    });
  }
  if (kind === "field" && x) {
    let pos = 0;
    let neg = 0;
    for (const b of x) b > 0 ? pos++ : b < 0 ? neg++ : 0;
    if (pos + neg < 2) {
      // Located at the last data row, not the header: "found N rows" sends the
      // reader to where the data stop, which is where a cut-short export shows.
      const lastRow = t.rowLines[t.rowLines.length - 1] ?? t.headerLine;
      list.add({
        file: t.file,
        line: lastRow,
        field: "column B",
        message: "too few field values",
        expected: "at least two non-zero fields",
        found: `${x.length} rows`,
        fix: "check that the export is complete, or sweep the field through at least two non-zero values",
      });
    } else if (pos === 0 || neg === 0) {
      warnings.push({
        severity: "warning",
        file: t.file,
        field: "column B",
        message: "field has one sign only, so Rxx and Rxy cannot be (anti)symmetrised and contact misalignment is not removed",
        expected: "fields of both signs",
        found: pos === 0 ? "negative fields only" : "positive fields only",
        fix: "sweep through zero to the opposite field",
      });
    }
  }
  list.done();
  const toResistance = (name: string): Float64Array | undefined => {
    const v = values.get(name);
    if (!v) return undefined;
    if (name.startsWith("R")) return v;
    // v is this call's own array (numericColumn): divide in place.
    if (currentCol) for (let i = 0; i < v.length; i++) v[i] /= currentCol[i];
    else for (let i = 0; i < v.length; i++) v[i] /= current_A!;
    return v;
  };
  const rxx = toResistance("Rxx") ?? toResistance("Vxx");
  const rxy = toResistance("Rxy") ?? toResistance("Vxy");
  const ra = toResistance("Ra");
  const rb = toResistance("Rb");
  if (current_A === undefined && currentCol) current_A = currentCol.reduce((a, b) => a + b, 0) / currentCol.length;
  const conditions = conditionSources(t, { gate: gate_V, field: field_T, temperature: temperature_K, current: current_A }, !!currentCol);
  if (kind === "field" && x!.length) {
    let lo = Infinity;
    let hi = -Infinity;
    for (const b of x!) [lo, hi] = [Math.min(lo, b), Math.max(hi, b)];
    conditions.push({ key: "field_range", origin: "file-column", span: [lo, hi], column: "B" });
  }
  return {
    file: t.file,
    kind,
    geometry,
    gate_V,
    field_T,
    temperature_K,
    current_A,
    x: x!,
    rxx,
    rxy,
    ra,
    rb,
    direction: direction!,
    rows: x!.length,
    warnings,
    conditions,
  };
}

/** Where each condition read came from: the file's own `# key:` line, a wafer.md reading rule, or (a current) the file's I column. */
function conditionSources(t: RawTable, values: Record<keyof typeof META, number | undefined>, currentColumn: boolean): ConditionSource[] {
  const out: ConditionSource[] = [];
  for (const key of Object.keys(META) as (keyof typeof META)[]) {
    const value = values[key];
    if (value === undefined) continue;
    const entry = t.meta.get(key);
    if (!entry) {
      if (key === "current" && currentColumn) out.push({ key, origin: "file-column", value, column: "I" });
      continue;
    }
    const via = entry.via;
    if (!via) out.push({ key, origin: "file-line", value, line: entry.line });
    else if (via.source === "value") out.push({ key, origin: "record-value", value, rule: via.rule, ruleAt: via.at });
    else if (via.source === "file_name") out.push({ key, origin: "rule-file-name", value, rule: via.rule, ruleAt: via.at });
    else out.push({ key, origin: "rule-line", value, line: entry.line, rule: via.rule, ruleAt: via.at });
  }
  return out;
}
