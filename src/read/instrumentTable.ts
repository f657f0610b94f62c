/**
 * Reads a measurement file exactly as an instrument's software wrote it, by
 * the reading instructions of its wafer.md entry (docs/formats.md, "Files as
 * the instruments write them"): `columns` maps the file's own header text to
 * the quantities the analysis knows, `layout` gives the separator, the decimal
 * mark and the line of the column names, `conditions` supplies what the file
 * does not carry as `# key: value` lines (from its name, a preamble line, or a
 * fixed value).
 *
 * The result is the same RawTable that waferbook's own format gives
 * (src/read/table.ts), so every later check is shared. The file's bytes are
 * never changed: this only reads them (the published copy and its SHA-256 are
 * the instrument's file).
 *
 * Rules come compiled from the record's validation (src/validate/readingRules.ts):
 * their regular expressions are built once, with V8's linear-time engine
 * where the runtime has it, and matched only against a file's base name and
 * its preamble lines of at most MAX_MATCH_CHARS characters.
 */
import path from "node:path";
import { InputError, ProblemList, type Problem } from "../model/problem.ts";
import { readTable, type ColumnHeader, type MetaEntry, type RawTable } from "./table.ts";
import { decimalFix, numberText, type DecimalMark, type Separator } from "./tableDialect.ts";

/** Where a rule was written: wafer.md and its line, for messages. */
export interface RuleSite {
  file: string;
  line?: number;
  /** The field path, e.g. `devices[0].conditions.gate.file_name`. */
  field: string;
}

export interface ColumnRule {
  /** The header text exactly as the file has it. */
  header: string;
  /** The quantity the analysis knows (B, Rxx, depth, …). */
  name: string;
  unit: string;
  /** A text column (an X-ray peak table's layer names): kept as text, not read as numbers. */
  text?: boolean;
  at: RuleSite;
}

export interface ConditionRule {
  /** The metadata key it supplies (gate, field, temperature, current, …). */
  key: string;
  source: "file_name" | "line" | "value";
  pattern?: RegExp;
  /** The regular expression as written, for messages. */
  patternText?: string;
  /** A fixed value (source "value"), with its unit when given apart. */
  value?: string;
  unit?: string;
  at: RuleSite;
}

export interface ReadingRules {
  columns?: ColumnRule[];
  separator?: "comma" | "semicolon" | "tab" | "whitespace";
  decimal?: "point" | "comma";
  headerRow?: number;
  layoutAt?: RuleSite;
  conditions: ConditionRule[];
}

/** Lines longer than this are not matched by a `line` rule (a bound on regular-expression work). */
export const MAX_MATCH_CHARS = 1000;
/** Only this many lines before the header are searched by `line` rules. */
export const MAX_PREAMBLE_LINES = 2000;

const SEP: Record<NonNullable<ReadingRules["separator"]>, Separator | "ws"> = { comma: ",", semicolon: ";", tab: "\t", whitespace: "ws" };

/** "wafer.md:17" for a rule. */
export function ruleRef(at: RuleSite): string {
  return `${at.file}${at.line ? `:${at.line}` : ""}`;
}

function splitLines(text: string): string[] {
  if (text.indexOf("\n") < 0 && text.indexOf("\r") >= 0) return text.split("\r");
  return text.split("\n").map((l) => (l.endsWith("\r") ? l.slice(0, -1) : l));
}

function unquote(cell: string): string {
  const c = cell.trim();
  return c.length >= 2 && c.startsWith('"') && c.endsWith('"') ? c.slice(1, -1).replace(/""/g, '"').trim() : c;
}

function splitCells(line: string, sep: Separator | "ws", header = false): string[] {
  if (sep === "ws")
    return line
      .trim()
      .split(header ? /\t|\s{2,}/ : /\s+/)
      .map(unquote);
  return line.split(sep).map(unquote);
}

function detectSeparator(header: string): Separator | "ws" {
  if (header.includes("\t")) return "\t";
  if (header.includes(";")) return ";";
  if (header.includes(",")) return ",";
  return "ws";
}

/** A condition's value text with the file's decimal mark made a point. */
function pointDecimal(v: string, decimal: DecimalMark): string {
  return decimal === "," ? v.replace(/^(\s*[-+]?\d*),(\d)/, "$1.$2") : v;
}

/** The conditions of one file, merged into `meta` (the file's own `# key:` lines win, and a disagreement is a warning). */
function applyConditions(t: RawTable, rules: ReadingRules, preamble: { text: string; line: number }[], notes: Problem[], misses: Map<string, string>): void {
  const base = path.posix.basename(t.file);
  for (const c of rules.conditions) {
    let value: string | undefined;
    let line: number | undefined;
    if (c.source === "value") value = c.value;
    else if (c.source === "file_name") {
      const m = base.length <= MAX_MATCH_CHARS ? c.pattern!.exec(base) : null;
      if (m?.groups?.value !== undefined) value = m.groups.value;
      else misses.set(c.key, `file name \`${base}\` does not match \`${c.key}.file_name\` (${ruleRef(c.at)})`);
    } else {
      for (const p of preamble) {
        if (p.text.length > MAX_MATCH_CHARS) continue;
        const m = c.pattern!.exec(p.text);
        if (m?.groups?.value !== undefined) {
          value = m.groups.value;
          line = p.line;
          break;
        }
      }
      if (value === undefined) misses.set(c.key, `no line above the column names of \`${base}\` matches \`${c.key}.line\` (${ruleRef(c.at)})`);
    }
    if (value === undefined) continue;
    const text = `${pointDecimal(value.trim(), t.decimal)}${c.unit ? ` ${c.unit}` : ""}`;
    const own = t.meta.get(c.key);
    if (own) {
      if (own.value.replace(/\s+/g, " ") !== text) {
        notes.push({
          severity: "warning",
          file: t.file,
          line: own.line,
          field: `# ${c.key}`,
          message: `the file's own "# ${c.key}:" line and the rule \`${c.key}.${c.source}\` (${ruleRef(c.at)}) disagree; the file's line is used`,
          expected: "one value",
          found: `${JSON.stringify(own.value)} in the file, ${JSON.stringify(text)} by the rule`,
          fix: "correct the file's export or the rule in wafer.md",
        });
      }
      continue;
    }
    const via = { source: c.source, rule: `${c.key}.${c.source}`, at: ruleRef(c.at) };
    t.meta.set(c.key, {
      value: text,
      line: line ?? t.headerLine,
      ...(line === undefined ? { rule: `${c.key}.${c.source} (${ruleRef(c.at)})` } : {}),
      via,
    } as MetaEntry);
  }
}

/**
 * Reads `text` (the file `file`, relative to the data folder) by `rules`.
 * Without a `columns` mapping the file is in waferbook's own format and only
 * the conditions are added.
 */
export function readInstrumentTable(text: string, file: string, rules: ReadingRules): RawTable {
  const notes: Problem[] = [];
  const misses = new Map<string, string>();
  if (!rules.columns?.length && rules.headerRow !== undefined) {
    // waferbook's own "name [unit]" column names below a preamble: map each to itself.
    const header = splitLines(text)[rules.headerRow - 1];
    if (header !== undefined) {
      const sep = rules.separator ? SEP[rules.separator] : detectSeparator(header);
      const own = splitCells(header, sep, true).flatMap((cell) => {
        const m = /^([A-Za-z_][A-Za-z0-9_.]*)\s*(?:\[([^\]]*)\])?$/.exec(cell);
        return m ? [{ header: cell, name: m[1], unit: (m[2] ?? "").trim(), text: m[1] === "layer", at: rules.layoutAt! }] : [];
      });
      if (own.length) rules = { ...rules, columns: own };
    }
  }
  if (!rules.columns?.length) {
    const t = readTable(text, file);
    const preamble: { text: string; line: number }[] = [];
    const lines = splitLines(text);
    for (let i = 0; i < Math.min(t.headerLine - 1, MAX_PREAMBLE_LINES); i++) preamble.push({ text: lines[i], line: i + 1 });
    applyConditions(t, rules, preamble, notes, misses);
    return Object.assign(t, { readingNotes: notes, conditionMisses: misses });
  }
  const lines = splitLines(text);
  const columns = rules.columns;
  const where = rules.layoutAt ?? columns[0].at;
  let headerIndex: number;
  if (rules.headerRow !== undefined) {
    if (rules.headerRow > lines.length || (rules.headerRow === lines.length && lines[lines.length - 1] === "")) {
      throw new InputError({
        file,
        line: lines.length,
        field: "layout.header_row",
        message: `the column names should be on line ${rules.headerRow} (layout.header_row, ${ruleRef(where)}), past the end of the file`,
        expected: `a file of more than ${rules.headerRow} lines`,
        found: `${lines.length - (lines[lines.length - 1] === "" ? 1 : 0)} lines`,
        fix: "check header_row against the file, or whether the export was cut short",
      });
    }
    headerIndex = rules.headerRow - 1;
  } else {
    // The first line that holds at least two of the mapped column names (all of them when fewer are mapped).
    const want = Math.min(2, columns.length);
    headerIndex = lines.findIndex((l, i) => {
      if (i >= MAX_PREAMBLE_LINES || l.length > 100 * MAX_MATCH_CHARS) return false;
      const cells = splitCells(l, rules.separator ? SEP[rules.separator] : detectSeparator(l), true);
      return columns.filter((c) => cells.includes(c.header)).length >= want;
    });
    if (headerIndex < 0) {
      throw new InputError({
        file,
        field: columns[0].at.field,
        message: `no line holds the column names of \`columns\` (${ruleRef(columns[0].at)})`,
        expected: `a header line with ${want === 2 ? "at least two of " : ""}${columns.map((c) => JSON.stringify(c.header)).join(", ")}`,
        found: `none in the first ${Math.min(lines.length, MAX_PREAMBLE_LINES)} lines`,
        fix: "copy the names exactly as the file writes them, or give layout.header_row",
      });
    }
  }
  const headerLine = headerIndex + 1;
  const headerText = lines[headerIndex];
  const sep = rules.separator ? SEP[rules.separator] : detectSeparator(headerText);
  const cells = splitCells(headerText, sep, true);
  const problems = new ProblemList(file);
  const mapped: { rule: ColumnRule; at: number }[] = [];
  // A mapping names every column the files may have; a file may lack some (a field sweep has no gate column).
  // A missing name that differs from a header cell only in letter case or spaces is a slip, and an error.
  for (const rule of columns) {
    const at = cells.indexOf(rule.header);
    if (at < 0) {
      const loose = (c: string) => c.toLowerCase().replace(/\s+/g, "");
      const near = cells.find((c) => loose(c) === loose(rule.header));
      if (near !== undefined)
        problems.add({
          file,
          line: headerLine,
          field: rule.at.field,
          message: `column ${JSON.stringify(rule.header)} named in ${rule.at.field} (${ruleRef(rule.at)}) is not in the header, but ${JSON.stringify(near)} is`,
          expected: JSON.stringify(rule.header),
          found: JSON.stringify(near),
          fix: "write the name exactly as the file does (letter case and spaces count)",
        });
    } else if (cells.indexOf(rule.header, at + 1) >= 0) {
      problems.add({
        file,
        line: headerLine,
        field: rule.at.field,
        message: `column ${JSON.stringify(rule.header)} appears twice in the header`,
        expected: "each mapped name once",
        found: `columns ${at + 1} and ${cells.indexOf(rule.header, at + 1) + 1}`,
        fix: "rename one of them in the export",
      });
    } else mapped.push({ rule, at });
  }
  if (mapped.length === 0 && problems.ok) {
    problems.add({
      file,
      line: headerLine,
      field: columns[0].at.field,
      message: `none of the column names of \`columns\` (${ruleRef(columns[0].at)}) is on line ${headerLine}`,
      expected: columns.map((c) => JSON.stringify(c.header)).join(", "),
      found:
        cells
          .slice(0, 12)
          .map((c) => JSON.stringify(c))
          .join(", ") + (cells.length > 12 ? ", …" : ""),
      fix: "check layout.header_row and layout.separator against the file",
    });
  }
  problems.done();
  const ignored = cells.filter((c, i) => c !== "" && !mapped.some((m) => m.at === i));
  // The body: lines after the header, blank lines and # comment lines skipped.
  const bodyIndex: number[] = [];
  for (let i = headerIndex + 1; i < lines.length; i++) {
    const s = lines[i].trim();
    if (s !== "" && !s.startsWith("#")) bodyIndex.push(i);
  }
  if (bodyIndex.length === 0) {
    throw new InputError({
      file,
      line: headerLine,
      message: "no data rows after the header",
      expected: "at least one row of numbers",
      found: "the header only",
      fix: "check that the export is complete, or layout.header_row",
    });
  }
  const sample = bodyIndex
    .slice(0, 50)
    .map((i) => lines[i])
    .join("\n");
  const decimal: DecimalMark = rules.decimal
    ? rules.decimal === "comma"
      ? ","
      : "."
    : sep !== "," && sample.includes(",") && !/\d\.\d|\.\d/.test(sample)
      ? ","
      : ".";
  if (decimal === "," && sep === ",") {
    throw new InputError({
      file,
      line: headerLine,
      field: "layout",
      message: `a decimal comma with commas between cells cannot be read (layout, ${ruleRef(where)})`,
      expected: "semicolons, tabs or spaces between cells when numbers use a decimal comma",
      found: "comma separator and decimal comma",
      fix: "set layout.separator to the file's real separator",
    });
  }
  const rowLines = bodyIndex.map((i) => i + 1);
  // A text column (peak-table layer names) leaves the numbers to numericColumn, which reads them from the cell text.
  const allNumeric = !mapped.some((m) => m.rule.text);
  const numeric = mapped.map(() => new Float64Array(allNumeric ? bodyIndex.length : 0));
  const need = Math.max(...mapped.map((m) => m.at)) + 1;
  const rows: string[][] = new Array(bodyIndex.length);
  const bad = new ProblemList(file);
  bodyIndex.forEach((li, r) => {
    const parts = splitCells(lines[li], sep);
    if (parts.length < need) {
      bad.add({
        file,
        line: li + 1,
        message: "row has the wrong number of cells",
        expected: `at least ${need} cells (the mapped columns reach column ${need})`,
        found: `${parts.length}`,
        fix:
          parts.length === 1 && sep !== "ws"
            ? `check layout.separator (${ruleRef(where)}): the row holds no ${sep === "\t" ? "tab" : JSON.stringify(sep)}`
            : "fill or remove the incomplete row",
      });
      rows[r] = mapped.map(() => "");
      return;
    }
    rows[r] = mapped.map((m) => parts[m.at]);
    if (allNumeric)
      mapped.forEach((m, k) => {
        const cell = parts[m.at];
        const txt = numberText(cell, decimal);
        const v = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/.test(txt) ? Number(txt) : NaN;
        if (!Number.isFinite(v)) {
          bad.add({
            file,
            line: li + 1,
            field: `column ${m.at + 1} (${JSON.stringify(m.rule.header)} → ${m.rule.name})`,
            message: "cell is not a finite number",
            expected: "a number such as 1.25e-3",
            found: JSON.stringify(cell),
            fix: decimalFix(cell, decimal)
              ? `the cell's decimal mark differs from the one the file is read with: set layout.decimal (${ruleRef(where)}) to ${decimal === "." ? "comma" : "point"}`
              : "correct the cell, or remove the row",
          });
        }
        numeric[k][r] = v;
      });
  });
  bad.done();
  const cols: ColumnHeader[] = mapped.map((m, k) => ({ name: m.rule.name, unit: m.rule.unit, index: k }));
  const meta = new Map<string, MetaEntry>();
  const preamble: { text: string; line: number }[] = [];
  for (let i = 0; i < Math.min(headerIndex, MAX_PREAMBLE_LINES); i++) {
    preamble.push({ text: lines[i], line: i + 1 });
    // waferbook's own "# key: value" lines are read in a preamble too.
    const m = /^#\s*([A-Za-z_][A-Za-z0-9_ ]*?)\s*:\s*(.*)$/.exec(lines[i].trim());
    if (!m) continue;
    const key = m[1].toLowerCase();
    if (meta.has(key)) {
      throw new InputError({
        file,
        line: i + 1,
        message: `metadata "${key}" is given twice`,
        expected: "each key once",
        found: `a second "${key}" (first on line ${meta.get(key)!.line})`,
        fix: "keep one of the two lines",
      });
    }
    meta.set(key, { value: m[2].trim(), line: i + 1 });
  }
  const t: RawTable = {
    file,
    meta,
    columns: cols,
    headerLine,
    delimiter: sep === "ws" ? "\t" : sep,
    decimal,
    rows,
    rowLines,
    ...(allNumeric ? { numeric } : {}),
  };
  applyConditions(t, rules, preamble, notes, misses);
  return Object.assign(t, { readingNotes: notes, conditionMisses: misses, ignoredColumns: ignored });
}
