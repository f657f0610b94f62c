/**
 * Reads waferbook's measurement table format (docs/formats.md):
 *
 *   # key: value unit        ← metadata lines, before the header
 *   B [T],Rxx [ohm],Rxy [ohm] ← one header row, units in square brackets
 *   -1.0,612.3,-6241.5        ← rows, comma or tab separated
 *
 * Plain numeric bodies are read in one pass (src/read/plainTable.ts); any
 * other body is split by csv-parse (RFC 4180 quoting, CRLF). Lines end in LF
 * or CRLF; a file whose lines all end in a lone CR is read as if they were LF.
 * Numbers are decimal only (no 0x, 0b, 0o). This module knows nothing about
 * physics: it returns located cells; src/validate gives them meaning and units.
 */
import { parse } from "csv-parse/sync";
import { InputError, ProblemList } from "../model/problem.ts";
import { UNIT_LIMITS } from "../physics/unitTable.ts";
import { scanPlainBody, splitPlainBody } from "./plainTable.ts";
import { cellCountProblem, decimalFix, numberText, tableDialect, type DecimalMark, type Separator } from "./tableDialect.ts";

export interface MetaEntry {
  value: string;
  line: number;
  /** The wafer.md rule that supplied the value when the file itself does not carry it ("gate.file_name (wafers/X/wafer.md:17)"). */
  rule?: string;
  /** Set when a wafer.md reading rule supplied the value (src/read/instrumentTable.ts): which kind of rule, written as `<key>.<source>`, and where it is. */
  via?: { source: "file_name" | "line" | "value"; rule: string; at: string };
}

export interface ColumnHeader {
  name: string;
  /** Unit text inside the brackets, or "" when none was given. */
  unit: string;
  index: number;
}

export interface RawTable {
  file: string;
  meta: Map<string, MetaEntry>;
  columns: ColumnHeader[];
  headerLine: number;
  delimiter: Separator;
  /** Decimal mark of the numbers (tableDialect.ts); cell text keeps it as written. */
  decimal: DecimalMark;
  /** Cell text, row-major (on the fast path split from the text only when first read). */
  rows: string[][];
  /** 1-based file line number of each row; its length is the number of rows. */
  rowLines: number[];
  /**
   * Cell values, column-major (`numeric[col.index][row]`), present when every
   * cell is a plain finite number (src/read/plainTable.ts); unitless, as written.
   */
  numeric?: Float64Array[];
  /** Read by wafer.md's reading instructions (src/read/instrumentTable.ts): notes on the reading, e.g. a rule the file's own line overrode. */
  readingNotes?: import("../model/problem.ts").Problem[];
  /** Conditions a rule could not find in this file, with the reason ("file name `x.dat` does not match `gate.file_name` (…:17)"). */
  conditionMisses?: Map<string, string>;
  /** Header names the `columns` mapping leaves out (ignored). */
  ignoredColumns?: string[];
}

const HEADER_CELL = /^([A-Za-z_][A-Za-z0-9_.]*)\s*(?:\[([^\]]*)\])?$/;

export function readTable(text: string, file: string): RawTable {
  // Carriage returns alone end the lines of files from some older instruments and classic Mac OS: read each as a line end.
  if (text.indexOf("\n") < 0 && text.indexOf("\r") >= 0) text = text.replace(/\r/g, "\n");
  const meta = new Map<string, MetaEntry>();
  let pos = 0;
  let line = 0;
  let headerText: string | undefined;
  /** Last non-blank line read (1 when there is none), for locating a missing header. */
  let lastContent = 1;
  while (pos < text.length) {
    let end = text.indexOf("\n", pos);
    if (end < 0) end = text.length;
    const raw = text.slice(pos, end).replace(/\r$/, "");
    line++;
    pos = end + 1;
    const trimmed = raw.trim();
    if (trimmed === "") continue;
    lastContent = line;
    if (trimmed.startsWith("#")) {
      const m = /^#\s*([A-Za-z_][A-Za-z0-9_ ]*?)\s*:\s*(.*)$/.exec(trimmed);
      if (m) {
        const key = m[1].toLowerCase();
        if (meta.has(key)) {
          throw new InputError({
            file,
            line,
            message: `metadata "${key}" is given twice`,
            expected: "each key once",
            found: `a second "${key}" (first on line ${meta.get(key)!.line})`,
            fix: "keep one of the two lines",
          });
        }
        meta.set(key, { value: m[2].trim(), line });
      }
      continue;
    }
    headerText = raw;
    break;
  }
  if (headerText === undefined) {
    // Located at the last metadata line: the header belongs right after it.
    throw new InputError({
      file,
      line: lastContent,
      message: "no header row",
      expected: 'a header such as "B [T],Rxx [ohm],Rxy [ohm]" after the # metadata lines',
      found: "only metadata or blank lines",
      fix: "add the column header and the data rows",
    });
  }
  const headerLine = line;
  const bodyStart = Math.min(pos, text.length);
  const { delimiter, decimal } = tableDialect(file, meta, headerText, headerLine, text.slice(bodyStart));
  // Every bad header cell and every repeated name is reported, not just the first.
  const headerProblems = new ProblemList(file);
  const columns: ColumnHeader[] = [];
  headerText.split(delimiter).forEach((cell, index) => {
    const c = cell.trim();
    const m = HEADER_CELL.exec(c);
    if (!m) {
      headerProblems.add({
        file,
        line: headerLine,
        message: `cannot read column header ${JSON.stringify(c)}`,
        expected: 'a name with its unit in brackets, such as "Rxx [ohm]"',
        found: JSON.stringify(c),
        fix: "write each column as name [unit]",
      });
      return;
    }
    const unit = (m[2] ?? "").trim();
    if (unit.length > UNIT_LIMITS.length) {
      headerProblems.add({
        file,
        line: headerLine,
        message: `the unit of column ${m[1]} is too long to be a unit`,
        expected: `a unit of at most ${UNIT_LIMITS.length} characters, such as "${m[1]} [T]"`,
        found: `${JSON.stringify(unit.slice(0, 40))}… (${unit.length} characters)`,
        fix: "write the unit alone inside the brackets; a ']' may be missing",
      });
      return;
    }
    columns.push({ name: m[1], unit, index });
  });
  const seen = new Map<string, number>();
  for (const c of columns) {
    if (seen.has(c.name)) {
      headerProblems.add({
        file,
        line: headerLine,
        message: `column "${c.name}" appears twice`,
        expected: "each column once",
        found: `columns ${seen.get(c.name)! + 1} and ${c.index + 1}`,
        fix: "rename or remove one of them",
      });
    }
    seen.set(c.name, c.index);
  }
  headerProblems.done();
  const plain = scanPlainBody(text, bodyStart, delimiter, columns.length, decimal);
  if (plain) {
    if (plain.bodyLines.length === 0) throw noRows(file, headerLine);
    const rowLines = plain.bodyLines;
    for (let i = 0; i < rowLines.length; i++) rowLines[i] += headerLine;
    return plainTable({ file, meta, columns, headerLine, delimiter, decimal, rowLines, numeric: plain.numeric }, text, bodyStart);
  }
  const body = text.slice(bodyStart);
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(body, {
      delimiter,
      relax_column_count: true,
      skip_empty_lines: true,
      comment: "#",
      trim: true,
      info: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (err) {
    const e = err as { message: string; lines?: number };
    throw new InputError({
      file,
      line: e.lines !== undefined ? headerLine + e.lines : headerLine,
      message: "cannot split rows",
      expected: "comma- or tab-separated values",
      found: e.message.split("\n")[0],
      fix: "check quoting and separators",
    });
  }
  const rows: string[][] = [];
  const rowLines: number[] = [];
  for (const r of records) {
    const rowLine = headerLine + r.info.lines;
    if (r.record.length !== columns.length) {
      const dialect = cellCountProblem(r.record, columns.length, delimiter);
      throw new InputError({
        file,
        line: rowLine,
        message: dialect?.message ?? "row has the wrong number of cells",
        expected: `${columns.length} cells as in the header`,
        found: `${r.record.length}`,
        fix: dialect?.fix ?? "fill or remove the incomplete row",
      });
    }
    rows.push(r.record);
    rowLines.push(rowLine);
  }
  if (rows.length === 0) throw noRows(file, headerLine);
  return { file, meta, columns, headerLine, delimiter, decimal, rows, rowLines };
}

function noRows(file: string, headerLine: number): InputError {
  return new InputError({
    file,
    line: headerLine,
    message: "no data rows after the header",
    expected: "at least one row of numbers",
    found: "the header only",
    fix: "add the measured rows or remove the file",
  });
}

/**
 * A table read by the fast path: `numeric` holds every cell; the cell text
 * (`rows`, wanted only by error messages and text columns) is split from the
 * body the first time it is asked for.
 */
function plainTable(t: Omit<RawTable, "rows">, text: string, bodyStart: number): RawTable {
  let rows: string[][] | undefined;
  return Object.defineProperty(t, "rows", {
    enumerable: true,
    get: () => (rows ??= splitPlainBody(text.slice(bodyStart), t.delimiter)),
  }) as RawTable;
}

/** A cell's number syntax: decimal only, the same as the fast path's (src/read/plainTable.ts). */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
/** Hexadecimal, binary and octal literals, which Number() would read (0x7D0 → 2000). */
const NON_DECIMAL = /^[+-]?0[xXbBoO]/;

/** Parses a numeric column; non-decimal, non-numeric, NaN and infinite cells are errors naming row and column. */
export function numericColumn(table: RawTable, col: ColumnHeader, factor = 1, offset = 0): Float64Array {
  const values = table.numeric?.[col.index];
  if (values) {
    const out = new Float64Array(values.length);
    for (let i = 0; i < values.length; i++) out[i] = values[i] * factor + offset;
    return out;
  }
  const out = new Float64Array(table.rows.length);
  // Every bad cell of the column is reported (up to the per-file cap), not just the first.
  const list = new ProblemList(table.file);
  for (let i = 0; i < table.rows.length; i++) {
    const cell = table.rows[i][col.index];
    const text = cell === "" ? "" : numberText(cell, table.decimal);
    const v = DECIMAL.test(text) ? Number(text) : NaN;
    if (NON_DECIMAL.test(text)) {
      list.add({
        file: table.file,
        line: table.rowLines[i],
        field: `column ${col.index + 1} (${col.name})`,
        message: "cell is not a decimal number",
        expected: "decimal digits such as 2000 or 2.0e3",
        found: JSON.stringify(cell),
        fix: "write the value in decimal; hexadecimal (0x), binary (0b) and octal (0o) numbers are not read",
      });
    } else if (!Number.isFinite(v)) {
      list.add({
        file: table.file,
        line: table.rowLines[i],
        field: `column ${col.index + 1} (${col.name})`,
        message: "cell is not a finite number",
        expected: "a number such as 1.25e-3",
        found: JSON.stringify(cell),
        fix:
          decimalFix(cell, table.decimal) ??
          (/nan|inf/i.test(cell) ? "remove the row, or leave out points the instrument could not measure" : "correct the cell"),
      });
    }
    out[i] = v * factor + offset;
  }
  list.done();
  return out;
}
