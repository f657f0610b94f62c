/**
 * Demo only: rewrites a sweep from waferbook's own format into the export of
 * the (fictional) Tarnwick cryostat logger — a preamble of tab-separated
 * key/value lines, the column names on line 9, tab-separated cells, decimal
 * commas, fields in mT and resistances in kΩ, an extra temperature column,
 * the gate voltage only in the file name. wafer.md then describes how to read
 * it (`columns`, `layout`, `conditions`; docs/formats.md).
 *
 * Unit changes are made on the decimal text (moving the decimal point), so the
 * exported numbers are exactly the generated ones.
 */

/** Moves the decimal point of a decimal number written as text by `k` places (k > 0: × 10^k). */
export function shiftDecimal(text: string, k: number): string {
  const m = /^([-+]?)(\d*)(?:\.(\d*))?(?:[eE]([-+]?\d+))?$/.exec(text.trim());
  if (!m) throw new Error(`not a decimal number: ${text}`);
  const [, sign, int = "", frac = "", exp] = m;
  let digits = int + frac;
  let point = int.length + k + (exp ? Number(exp) : 0);
  if (point < 0) {
    digits = "0".repeat(-point) + digits;
    point = 0;
  }
  if (point > digits.length) digits += "0".repeat(point - digits.length);
  let a = digits.slice(0, point).replace(/^0+(?=\d)/, "") || "0";
  let b = digits.slice(point).replace(/0+$/, "");
  if (a === "") a = "0";
  const out = b ? `${a}.${b}` : a;
  b = "";
  return (sign === "-" && /[1-9]/.test(out) ? "-" : "") + out;
}

const comma = (s: string) => s.replace(".", ",");

interface Parsed {
  meta: Record<string, string>;
  names: string[];
  rows: string[][];
}

function parse(text: string): Parsed {
  const meta: Record<string, string> = {};
  const lines = text.split("\n").filter((l) => l.trim() !== "");
  let i = 0;
  for (; lines[i].startsWith("#"); i++) {
    const m = /^#\s*(\w+):\s*(.*)$/.exec(lines[i]);
    if (m) meta[m[1]] = m[2];
  }
  const names = lines[i].split(",").map((c) => c.replace(/\s*\[.*$/, ""));
  return { meta, names, rows: lines.slice(i + 1).map((l) => l.split(",")) };
}

/** The logger's column name and decimal shift for each of waferbook's columns. */
const COLUMN: Record<string, { header: string; shift: number }> = {
  B: { header: "Field (mT)", shift: 3 },
  Vg: { header: "Gate (V)", shift: 0 },
  Rxx: { header: "R_xx (kOhm)", shift: -3 },
  Rxy: { header: "R_xy (kOhm)", shift: -3 },
};

/** The logger's export of one waferbook-format sweep (see the module comment). */
export function loggerExport(text: string, sample: string, started: string): string {
  const p = parse(text);
  const kelvin = (p.meta.temperature ?? "1.6 K").replace(/\s*K$/, "");
  const preamble = [
    "Tarnwick VTI logger 2.3\tdata export",
    `Operator\tR. Vashti`,
    `Sample\t${sample}`,
    `Started\t${started}`,
    `Temperature (K)\t${comma(Number(kelvin).toFixed(3))}`,
    `Excitation\t${p.meta.current ?? "10 nA"}, 13,7 Hz lock-in`,
    "Time constant (ms)\t300",
    "",
  ];
  const header = [...p.names.map((n) => COLUMN[n].header), "Temp (K)"].join("\t");
  const rows = p.rows.map((r) => [...r.map((cell, k) => comma(shiftDecimal(cell, COLUMN[p.names[k]].shift))), comma(Number(kelvin).toFixed(3))].join("\t"));
  // Windows line ends, as the logger's PC writes them.
  return [...preamble, header, ...rows, ""].join("\r\n");
}

/** The file name the logger gives a sweep: the gate voltage (field sweeps) or the field (gate sweeps) with a decimal comma, and a counter. */
export function loggerFileName(device: string, text: string, counter: number): string {
  const p = parse(text);
  const n = String(counter).padStart(4, "0");
  if (p.meta.gate) return `${device}_Vg=${comma(p.meta.gate.replace(/\s*V$/, ""))}V_${n}.dat`;
  return `${device}_gate_B=${comma((p.meta.field ?? "0 T").replace(/\s*T$/, ""))}T_${p.rows.length && Number(p.rows[0][0]) < Number(p.rows[p.rows.length - 1][0]) ? "up" : "down"}_${n}.dat`;
}

/** The wafer.md reading instructions for these exports (one device). */
export function loggerReading(device: string): string {
  return [
    `    files: "transport/${device}/*.dat"`,
    "    columns:                       # the logger's column names → quantity [unit]",
    '      "Field (mT)": B [mT]',
    '      "Gate (V)": Vg [V]',
    '      "R_xx (kOhm)": Rxx [kohm]',
    '      "R_xy (kOhm)": Rxy [kohm]',
    "    layout: { separator: tab, decimal: comma, header_row: 9 }",
    "    conditions:",
    '      gate: { file_name: "Vg=(?<value>[-0-9,]+)V", unit: V }',
    '      field: { file_name: "B=(?<value>[-0-9,]+)T", unit: T }',
    '      temperature: { line: "^Temperature \\\\(K\\\\)\\\\t(?<value>[0-9,]+)", unit: K }',
    "      current: { value: 10 nA }",
  ].join("\n");
}
