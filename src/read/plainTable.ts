/**
 * Fast path of the table reader for the common case, a body of plain numeric
 * rows: one pass over the text, each cell's number read in place (no cell
 * strings) straight into one Float64Array per column, with the line of each
 * row.
 *
 * Accepted: rows of exactly `columns` plain decimal numbers
 * `[+-]? (d+ (. d*)? | . d+) ([eE] [+-]? d+)?` separated by the delimiter
 * (comma, tab or semicolon), the point being the table's decimal mark (a
 * point, or a comma in a table declared or detected so: src/read/tableDialect.ts),
 * empty lines, and one kind of line end throughout (LF or CRLF, set by the
 * first). Anything else — spaces, quotes, comments, empty cells, text such as
 * NaN or OVLD, a lone CR, mixed line ends, a wrong cell count, a number beyond
 * the double range — makes the scanner give up, and src/read/table.ts splits
 * the body with csv-parse as before, so every unusual file and every error
 * message goes through the library unchanged.
 *
 * Numbers are bit-identical to `Number(cell)`. Clinger's fast path (W. D.
 * Clinger, "How to read floating point numbers accurately", Proc. ACM SIGPLAN
 * PLDI 1990, pp. 92–101): when the decimal significand m (all digits, point
 * removed) is below 2^53 it is an exact double — checked after the fact, since
 * m grows monotonically and stays exact while below 2^53 — and 10^j is exact
 * for 0 ≤ j ≤ 22 (5^22 < 2^53); one IEEE-754 multiplication m·10^k or division
 * m/10^−k of exact operands is correctly rounded, i.e. equals the correctly
 * rounded decimal value that `Number()` returns. Any other number (17+
 * digits, |k| > 22) is handed to `Number()` on its own text.
 */

export interface PlainBody {
  /** Cell values as written (unitless), column-major; each array has one entry per row. */
  numeric: Float64Array[];
  /** Line of each row counted from the start of the body (1-based), as csv-parse's `info.lines`. */
  bodyLines: number[];
}

/** 10^0 … 10^22, every one an exact double. */
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];
const TWO_53 = 9007199254740992;
const LF = 10;
const CR = 13;

/**
 * Scans the body of plain numeric rows with `columns` cells each that starts
 * at index `start` of `text` (the whole file is passed rather than a slice of
 * it: reading characters of a flat string is faster than through a slice);
 * undefined as soon as anything else is met (the caller then uses csv-parse).
 * Throws nothing.
 */
export function scanPlainBody(text: string, start: number, delimiter: "," | "\t" | ";", columns: number, decimal: "." | "," = "."): PlainBody | undefined {
  if (columns < 1) return undefined;
  let capacity = 1;
  for (let i = text.indexOf("\n", start); i >= 0; i = text.indexOf("\n", i + 1)) capacity++;
  const cols: Float64Array[] = [];
  for (let j = 0; j < columns; j++) cols.push(new Float64Array(capacity));
  const bodyLines: number[] = [];
  const sep = delimiter.charCodeAt(0);
  const point = decimal.charCodeAt(0);
  const n = text.length;
  let crlf = -1; // -1: no line end seen yet, 0: LF, 1: CRLF
  let p = start;
  let line = 0;
  let rows = 0;
  while (p < n) {
    line++;
    let c = text.charCodeAt(p);
    if (c !== LF && c !== CR) {
      for (let j = 0; ; ) {
        // One number: sign, digits, point, digits, exponent (c is its first character).
        const start = p;
        const negative = c === 45;
        if (negative || c === 43) c = text.charCodeAt(++p);
        let m = 0;
        const intStart = p;
        while (c >= 48 && c <= 57) {
          m = m * 10 + (c - 48);
          c = text.charCodeAt(++p);
        }
        let digits = p - intStart;
        let fraction = 0;
        if (c === point) {
          c = text.charCodeAt(++p);
          const fracStart = p;
          while (c >= 48 && c <= 57) {
            m = m * 10 + (c - 48);
            c = text.charCodeAt(++p);
          }
          fraction = p - fracStart;
          digits += fraction;
        }
        if (digits === 0) return undefined;
        let exponent = 0;
        if (c === 101 || c === 69) {
          c = text.charCodeAt(++p);
          const negativeExponent = c === 45;
          if (negativeExponent || c === 43) c = text.charCodeAt(++p);
          const expStart = p;
          while (c >= 48 && c <= 57) {
            exponent = exponent * 10 + (c - 48); // Infinity for absurd lengths: Number() decides below
            c = text.charCodeAt(++p);
          }
          if (p === expStart) return undefined;
          if (negativeExponent) exponent = -exponent;
        }
        const k = exponent - fraction;
        let v: number;
        if (m < TWO_53 && k <= 22 && k >= -22) {
          v = k >= 0 ? m * POW10[k] : m / POW10[-k];
          if (negative) v = -v;
        } else {
          v = Number(point === 46 ? text.slice(start, p) : text.slice(start, p).replace(",", "."));
          if (v - v !== 0) return undefined; // beyond the double range: csv-parse path reports it
        }
        cols[j][rows] = v;
        if (++j === columns) break;
        if (c !== sep) return undefined;
        c = text.charCodeAt(++p);
      }
      bodyLines.push(line);
      rows++;
    }
    if (c === LF) {
      if (crlf === 1) return undefined;
      crlf = 0;
      p++;
    } else if (c === CR) {
      if (crlf === 0 || text.charCodeAt(p + 1) !== LF) return undefined;
      crlf = 1;
      p += 2;
    } else if (p < n) return undefined;
  }
  return { numeric: cols.map((col) => col.subarray(0, rows)), bodyLines };
}

/**
 * One plain decimal number (the cell syntax above) read exactly as the
 * scanner reads a cell: bit-identical to `Number(text)`, or undefined when the
 * scanner would not accept `text` as a one-cell row (empty, spaces, "NaN",
 * hex, beyond the double range …). Unitless.
 */
export function parsePlainNumber(text: string): number | undefined {
  if (text.includes("\n") || text.includes("\r")) return undefined;
  const scanned = scanPlainBody(text, 0, ",", 1);
  return scanned && scanned.bodyLines.length === 1 ? scanned.numeric[0][0] : undefined;
}

/** Cell text of a body scanPlainBody accepted, row-major: the rows csv-parse would give. */
export function splitPlainBody(body: string, delimiter: "," | "\t" | ";"): string[][] {
  const rows: string[][] = [];
  for (const raw of body.split("\n")) {
    const line = raw.charCodeAt(raw.length - 1) === CR ? raw.slice(0, -1) : raw;
    if (line !== "") rows.push(line.split(delimiter));
  }
  return rows;
}
