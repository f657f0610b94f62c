/**
 * Turns a raw table into a typed X-ray diffraction file: a reciprocal-space map
 * (columns `omega [deg]`, `two_theta [deg]`, `counts`, on a grid or scattered)
 * or a peak table (columns `layer`, `omega [deg]`, `two_theta [deg]`, optional
 * `omega_err [deg]`, `two_theta_err [deg]`). Both need `# reflection: h k l`;
 * `# wavelength: <value> nm` defaults to Cu Kα1 (0.154059292 nm).
 * Angles are returned in rad, the wavelength in m. See docs/formats.md.
 */
import { numericColumn, type ColumnHeader, type RawTable } from "../read/table.ts";
import { CU_KALPHA1 } from "../physics/constants.ts";
import type { Miller, TableRow, XrdCommon, XrdFile } from "../model/structureInputs.ts";
import { didYouMean, InputError, ProblemList } from "../model/problem.ts";
import { acceptedUnits, splitValueUnit, unitFactor, type Dimension } from "./units.ts";

const DEG = Math.PI / 180;
export const MAP_COLUMNS: Record<string, Dimension> = { omega: "angle", two_theta: "angle", counts: "counts" };
export const PEAK_COLUMNS: Record<string, Dimension | "text"> = {
  layer: "text",
  omega: "angle",
  two_theta: "angle",
  omega_err: "angle",
  two_theta_err: "angle",
};
/** Layer words a peak table understands besides the stack's layer names. */
export const PEAK_LAYERS = ["substrate", "buffer", "well"];

/** Parses `# reflection: h k l` ("0 0 4", "2 2 4", "-2 -2 4" or the compact "004"). */
export function parseReflection(t: RawTable): Miller {
  const entry = t.meta.get("reflection");
  if (!entry) {
    throw new InputError({
      file: t.file,
      line: t.headerLine,
      field: "# reflection",
      message: "the reflection is not given",
      expected: 'a line "# reflection: h k l" before the header, such as "# reflection: 0 0 4"',
      found: "none",
      fix: "add the Miller indices of the measured reflection",
    });
  }
  const v = entry.value.trim();
  const parts = /^\d{3}$/.test(v) ? v.split("") : v.split(/[\s,]+/);
  const nums = parts.map(Number);
  const bad = (why: string) =>
    new InputError({
      file: t.file,
      line: entry.line,
      field: "# reflection",
      message: `cannot use the reflection: ${why}`,
      expected: 'three integers h k l with l > 0 for a (001) surface, such as "0 0 4" or "2 2 4"',
      found: JSON.stringify(v),
      fix: "write the Miller indices separated by spaces",
    });
  if (nums.length !== 3 || !nums.every(Number.isInteger)) throw bad("it is not three integers");
  if (!(nums[2] > 0)) throw bad("l must be positive");
  return [nums[0], nums[1], nums[2]] as const;
}

/** Parses `# wavelength: <value> <unit>` into m; Cu Kα1 when absent. */
export function parseWavelength(t: RawTable): { wavelength: number; given: boolean } {
  const entry = t.meta.get("wavelength");
  if (!entry) return { wavelength: CU_KALPHA1, given: false };
  const vu = splitValueUnit(entry.value);
  const f = vu ? unitFactor("length", vu.unit) : undefined;
  if (!vu || f === undefined || !(vu.value * f > 0.005 && vu.value * f < 1)) {
    throw new InputError({
      file: t.file,
      line: entry.line,
      field: "# wavelength",
      message: "cannot read the X-ray wavelength",
      expected: `a positive length between 0.005 and 1 nm with one of ${acceptedUnits("length")}, such as "0.154059292 nm"`,
      found: JSON.stringify(entry.value),
      fix: "give the wavelength with its unit, or remove the line for Cu Kα1",
    });
  }
  return { wavelength: vu.value * f * 1e-9, given: true };
}

function checkColumns(t: RawTable, known: Record<string, Dimension | "text">, kind: string): void {
  // Every column is checked, so all unknown names and units are reported together.
  const list = new ProblemList(t.file);
  for (const c of t.columns) {
    const dim = known[c.name];
    if (dim === undefined) {
      const hint = didYouMean(c.name, Object.keys(known));
      list.add({
        file: t.file,
        line: t.headerLine,
        field: `column ${c.index + 1}`,
        message: `unknown column in a ${kind}`,
        expected: Object.keys(known).join(", "),
        found: JSON.stringify(c.name),
        fix: hint ? `did you mean "${hint}"?` : "rename or remove the column",
      });
      continue;
    }
    if (dim !== "text" && unitFactor(dim, c.unit) === undefined) {
      list.add({
        file: t.file,
        line: t.headerLine,
        field: `column ${c.name}`,
        message: `unit of ${c.name} is not accepted`,
        expected: acceptedUnits(dim) || "no unit",
        found: c.unit === "" ? "no unit" : JSON.stringify(c.unit),
        fix: dim === "angle" ? `write the header as "${c.name} [deg]"` : `write the header as "${c.name}"`,
      });
    }
  }
  list.done();
}

function need(t: RawTable, name: string, kind: string): ColumnHeader {
  const c = t.columns.find((x) => x.name === name);
  if (!c) {
    throw new InputError({
      file: t.file,
      line: t.headerLine,
      message: `missing column ${name} in a ${kind}`,
      expected: kind === "map" ? "omega [deg], two_theta [deg], counts" : "layer, omega [deg], two_theta [deg]",
      found: t.columns.map((x) => x.name).join(", "),
      fix: `add the ${name} column`,
    });
  }
  return c;
}

function angles(t: RawTable, c: ColumnHeader): Float64Array {
  const v = numericColumn(t, c, unitFactor("angle", c.unit)! * DEG);
  const i = v.findIndex((a) => !(a > 0 && a < Math.PI));
  if (i >= 0) {
    throw new InputError({
      file: t.file,
      line: t.rowLines[i],
      field: `column ${c.index + 1} (${c.name})`,
      message: "angle out of range",
      expected: "an angle between 0 and 180 deg",
      found: `${t.rows[i][c.index]}`,
      fix: "check the column holds degrees",
    });
  }
  return v;
}

function readMap(t: RawTable, common: XrdCommon): XrdFile {
  checkColumns(t, MAP_COLUMNS, "map");
  const w = angles(t, need(t, "omega", "map"));
  const tt = angles(t, need(t, "two_theta", "map"));
  const cc = need(t, "counts", "map");
  const counts = numericColumn(t, cc);
  const neg = counts.findIndex((c) => c < 0);
  if (neg >= 0) {
    throw new InputError({
      file: t.file,
      line: t.rowLines[neg],
      field: `column ${cc.index + 1} (counts)`,
      message: "negative counts",
      expected: "counts ≥ 0",
      found: t.rows[neg][cc.index],
      fix: "export raw counts without background subtraction",
    });
  }
  const back = w.findIndex((o, i) => !(o < tt[i]));
  if (back >= 0) {
    throw new InputError({
      file: t.file,
      line: t.rowLines[back],
      message: "ω is not below 2θ",
      expected: "an incidence angle ω smaller than the scattering angle 2θ (reflection geometry)",
      found: `ω = ${t.rows[back][need(t, "omega", "map").index]}°, 2θ = ${t.rows[back][need(t, "two_theta", "map").index]}°`,
      fix: "check that the omega and two_theta columns are not swapped",
    });
  }
  if (t.rowLines.length < 25) {
    throw new InputError({
      file: t.file,
      line: t.headerLine,
      message: "too few points for a reciprocal-space map",
      expected: "at least 25 points",
      found: `${t.rowLines.length}`,
      fix: "export the whole map, or give a peak table (columns layer, omega, two_theta) instead",
    });
  }
  const points = Array.from(w, (o, i) => ({ omega: o, twoTheta: tt[i], counts: counts[i] }));
  const distinct = (a: Float64Array) => new Set(Array.from(a, (x) => Math.round((x / DEG) * 1e6))).size;
  const grid = distinct(w) * distinct(tt) <= 1.05 * w.length;
  return { ...common, kind: "map", points, grid };
}

function readPeaks(t: RawTable, common: XrdCommon, stackNames: readonly string[]): XrdFile {
  checkColumns(t, PEAK_COLUMNS, "peak table");
  const lc = need(t, "layer", "peak table");
  const w = angles(t, need(t, "omega", "peak table"));
  const tt = angles(t, need(t, "two_theta", "peak table"));
  const err = (name: string) => {
    const c = t.columns.find((x) => x.name === name);
    return c ? numericColumn(t, c, DEG) : undefined;
  };
  const we = err("omega_err");
  const te = err("two_theta_err");
  const allowed = [...PEAK_LAYERS, ...stackNames];
  const seen = new Map<string, number>();
  const rows: TableRow[] = t.rows.map((r, i) => {
    const layer = r[lc.index].trim();
    const known = allowed.find((a) => a.toLowerCase() === layer.toLowerCase());
    if (!known) {
      const hint = didYouMean(layer, allowed);
      throw new InputError({
        file: t.file,
        line: t.rowLines[i],
        field: `column ${lc.index + 1} (layer)`,
        message: "unknown layer",
        expected: `substrate, buffer, well or a layer name of the stack (${stackNames.join(", ") || "none given"})`,
        found: JSON.stringify(layer),
        fix: hint ? `did you mean "${hint}"?` : "name the layer the peak belongs to",
      });
    }
    if (seen.has(known.toLowerCase())) {
      throw new InputError({
        file: t.file,
        line: t.rowLines[i],
        field: `column ${lc.index + 1} (layer)`,
        message: `layer "${known}" appears twice`,
        expected: "one peak per layer",
        found: `a second row (first on line ${seen.get(known.toLowerCase())})`,
        fix: "keep one row per layer",
      });
    }
    seen.set(known.toLowerCase(), t.rowLines[i]);
    return { layer: known, omega: w[i], twoTheta: tt[i], omegaStdErr: we?.[i], twoThetaStdErr: te?.[i] };
  });
  return { ...common, kind: "peaks", rows };
}

/** Validates one XRD file; throws a located InputError for any bad input. `stackNames` are the wafer's layer names (for peak tables). */
export function validateXrd(t: RawTable, stackNames: readonly string[] = []): XrdFile {
  const reflection = parseReflection(t);
  const { wavelength, given } = parseWavelength(t);
  const common: XrdCommon = { file: t.file, reflection, wavelength, wavelengthGiven: given };
  const names = t.columns.map((c) => c.name);
  if (names.includes("counts")) return readMap(t, common);
  if (names.includes("layer")) return readPeaks(t, common, stackNames);
  throw new InputError({
    file: t.file,
    line: t.headerLine,
    message: "neither a map nor a peak table",
    expected: "a counts column (map: omega [deg], two_theta [deg], counts) or a layer column (peak table: layer, omega [deg], two_theta [deg])",
    found: names.join(", "),
    fix: "add the counts or layer column",
  });
}
