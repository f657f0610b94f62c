/**
 * The separator and decimal mark of a measurement table, as instruments export
 * them: comma, tab or semicolon between cells; a decimal point or a decimal
 * comma in numbers.
 *
 * Declared by metadata lines before the header, which always win:
 *   # separator: ;        (or "semicolon", "comma", ",", "tab")
 *   # decimal: ,          (or "comma", "point", ".")
 * Otherwise read from the file when it is unambiguous: the header's separator
 * (a tab, else a semicolon in a header without commas, else a comma); a
 * decimal comma when cells are separated by tabs or semicolons and the body
 * holds commas but no point. A decimal comma in a comma-separated file cannot
 * be told from a separator, and is refused with a message that says so.
 */
import { InputError } from "../model/problem.ts";
import type { MetaEntry } from "./table.ts";

export type Separator = "," | "\t" | ";";
export type DecimalMark = "." | ",";

const SEPARATORS: Record<string, Separator> = { ",": ",", comma: ",", ";": ";", semicolon: ";", tab: "\t", "\\t": "\t" };
const DECIMALS: Record<string, DecimalMark> = { ".": ".", point: ".", dot: ".", ",": ",", comma: "," };
const NAME: Record<string, string> = { ",": "comma", ";": "semicolon", "\t": "tab", ".": "point" };

function declared<T>(file: string, entry: MetaEntry | undefined, words: Record<string, T>, key: string): T | undefined {
  if (!entry) return undefined;
  const v = words[entry.value.toLowerCase()];
  if (v === undefined) {
    throw new InputError({
      file,
      line: entry.line,
      field: `# ${key}`,
      message: `cannot read the ${key} declaration`,
      expected: Object.keys(words)
        .map((w) => JSON.stringify(w))
        .join(", "),
      found: JSON.stringify(entry.value),
      fix: key === "separator" ? 'write "# separator: ;" or "# separator: tab"' : 'write "# decimal: ," or "# decimal: ."',
    });
  }
  return v;
}

/** The table's separator and decimal mark; throws a located InputError for a bad or contradictory declaration. */
export function tableDialect(
  file: string,
  meta: Map<string, MetaEntry>,
  headerText: string,
  headerLine: number,
  body: string,
): { delimiter: Separator; decimal: DecimalMark } {
  const sepEntry = meta.get("separator");
  const decEntry = meta.get("decimal");
  let delimiter = declared(file, sepEntry, SEPARATORS, "separator");
  if (delimiter === undefined) {
    if (headerText.includes("\t")) delimiter = "\t";
    else if (headerText.includes(";")) {
      if (headerText.includes(",")) {
        throw new InputError({
          file,
          line: headerLine,
          message: "the header holds both semicolons and commas, so the separator is unclear",
          expected: "one separator between column names: comma, tab or semicolon",
          found: JSON.stringify(headerText.trim()),
          fix: 'use one separator throughout, or declare it before the header, e.g. "# separator: ;"',
        });
      }
      delimiter = ";";
    } else delimiter = ",";
  }
  let decimal = declared(file, decEntry, DECIMALS, "decimal");
  if (decimal === "," && delimiter === ",") {
    throw new InputError({
      file,
      line: decEntry!.line,
      field: "# decimal",
      message: "a decimal comma with commas between cells cannot be read",
      expected: "semicolons or tabs between cells when numbers use a decimal comma",
      found: "comma separator and decimal comma",
      fix: 'export with semicolons (then "# separator: ;") or tabs between cells, or with decimal points',
    });
  }
  decimal ??= delimiter !== "," && body.includes(",") && !/\d\.\d|\.\d/.test(body) ? "," : ".";
  return { delimiter, decimal };
}

const COMMA_NUMBER = /^[-+]?(?:\d+,\d*|,\d+)(?:[eE][-+]?\d+)?$/;

/** A cell's text ready for Number(): a decimal comma made a point; a decimal point in a decimal-comma table left unreadable. */
export function numberText(cell: string, decimal: DecimalMark): string {
  if (decimal === ".") return cell;
  return cell.includes(".") ? "not a number" : cell.replace(",", ".");
}

/** The fix for a cell that is not a number, when the decimal mark explains it; undefined otherwise. */
export function decimalFix(cell: string, decimal: DecimalMark): string | undefined {
  if (decimal === "." && COMMA_NUMBER.test(cell))
    return 'the cell has a decimal comma but the file uses decimal points elsewhere: write every number the same way, or declare "# decimal: ," (with semicolons or tabs between cells)';
  if (decimal === "," && /^[-+]?\d*\.\d*(?:[eE][-+]?\d+)?$/.test(cell))
    return "the cell has a decimal point but the file uses decimal commas: write every number the same way";
  return undefined;
}

/**
 * For a row whose cell count differs from the header's: a message naming the
 * separator or decimal problem when that explains it, else undefined.
 */
export function cellCountProblem(cells: string[], columns: number, delimiter: Separator): { message: string; fix: string } | undefined {
  const other = ([";", "\t", ","] as const).find((s) => s !== delimiter && cells.length < columns && cells.some((c) => c.split(s).length >= columns));
  if (other) {
    return {
      message: `row is separated by ${NAME[other]}s but the header by ${NAME[delimiter]}s`,
      fix: `use one separator throughout (declare it with "# separator: ${other === "\t" ? "tab" : other}" before the header)`,
    };
  }
  if (delimiter === "," && cells.length > columns && cells.every((c) => /^[-+]?\d*(?:[eE][-+]?\d+)?$/.test(c))) {
    return {
      message: "row has more cells than the header: numbers with a decimal comma in a comma-separated file cannot be told from separators",
      fix: 'export with semicolons (then "# separator: ;") or tabs between cells, or with decimal points',
    };
  }
  return undefined;
}
