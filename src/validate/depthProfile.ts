/**
 * Turns a raw table into a typed composition depth profile (SIMS, EDX, atom
 * probe): `depth [nm]` (also Å, µm), `Ge [1]` or `Ge [at.%]`, optional
 * contaminant columns named by element symbol (`O`, `C`, `N`, …) in `[cm^-3]`,
 * and `# method: <technique>` metadata. Depth in nm, Ge as a fraction,
 * contaminants in cm⁻³. See docs/formats.md.
 */
import { numericColumn, type RawTable } from "../read/table.ts";
import { didYouMean, InputError, ProblemList } from "../model/problem.ts";
import { acceptedUnits, unitFactor } from "./units.ts";
import type { DepthProfileFile } from "../model/structureInputs.ts";

const ELEMENT = /^[A-Z][a-z]?$/;

function unitError(t: RawTable, name: string, unit: string, accepted: string, example: string): InputError {
  return new InputError({
    file: t.file,
    line: t.headerLine,
    field: `column ${name}`,
    message: `unit of ${name} is not accepted`,
    expected: accepted,
    found: unit === "" ? "no unit" : JSON.stringify(unit),
    fix: `write the header as "${example}"`,
  });
}

/** Validates one depth profile; throws a located InputError for any bad input. */
export function validateDepthProfile(t: RawTable): DepthProfileFile {
  const method = t.meta.get("method")?.value.trim() || "unspecified";
  const known = ["depth", "Ge"];
  let depth: Float64Array | undefined;
  let ge: Float64Array | undefined;
  const contaminants: Record<string, number[]> = {};
  // Each column is checked on its own: a bad column does not hide the next (ProblemList).
  const list = new ProblemList(t.file);
  for (const c of t.columns)
    list.attempt(() => {
      if (c.name === "depth") {
        const f = unitFactor("length", c.unit);
        if (f === undefined) throw unitError(t, "depth", c.unit, acceptedUnits("length"), "depth [nm]");
        depth = numericColumn(t, c, f);
      } else if (c.name === "Ge") {
        const f = unitFactor("fraction", c.unit);
        if (f === undefined) throw unitError(t, "Ge", c.unit, acceptedUnits("fraction"), "Ge [at.%]");
        ge = numericColumn(t, c, f);
        const i = ge.findIndex((g) => g < -0.05 || g > 1.05);
        if (i >= 0) {
          throw new InputError({
            file: t.file,
            line: t.rowLines[i],
            field: `column ${c.index + 1} (Ge)`,
            message: "Ge content out of range",
            expected: c.unit === "1" ? "a fraction between 0 and 1 (use Ge [at.%] for percentages)" : "0 to 100 at.%",
            found: t.rows[i][c.index],
            fix: "check the unit in the header",
          });
        }
      } else if (ELEMENT.test(c.name) && c.name !== "Si") {
        if (unitFactor("concentration", c.unit) === undefined) throw unitError(t, c.name, c.unit, acceptedUnits("concentration"), `${c.name} [cm^-3]`);
        const v = numericColumn(t, c, unitFactor("concentration", c.unit));
        const i = v.findIndex((x) => x < 0);
        if (i >= 0) {
          throw new InputError({
            file: t.file,
            line: t.rowLines[i],
            field: `column ${c.index + 1} (${c.name})`,
            message: "negative concentration",
            expected: "a concentration ≥ 0 cm^-3",
            found: t.rows[i][c.index],
            fix: "export concentrations without background subtraction, or clip at the detection limit",
          });
        }
        contaminants[c.name] = Array.from(v);
      } else {
        const hint = didYouMean(c.name, known);
        throw new InputError({
          file: t.file,
          line: t.headerLine,
          field: `column ${c.index + 1}`,
          message: "unknown column in a depth profile",
          expected: "depth [nm], Ge [1] or Ge [at.%], and contaminants named by element symbol such as O [cm^-3]",
          found: JSON.stringify(c.name),
          fix: hint ? `did you mean "${hint}"?` : c.name === "Si" ? "remove the Si column: the Si fraction is 1 − Ge" : "rename or remove the column",
        });
      }
    });
  const hasDepth = t.columns.some((c) => c.name === "depth");
  // A misspelt column is already reported as unknown (with its likely name): not again as missing.
  const unknownNames = t.columns.some((c) => c.name !== "depth" && c.name !== "Ge" && !(ELEMENT.test(c.name) && c.name !== "Si"));
  if ((!hasDepth || !t.columns.some((c) => c.name === "Ge")) && !unknownNames) {
    list.add({
      file: t.file,
      line: t.headerLine,
      message: `missing the ${hasDepth ? "Ge" : "depth"} column`,
      expected: "depth [nm] and Ge [1] (or Ge [at.%])",
      found: t.columns.map((c) => c.name).join(", "),
      fix: `add the ${hasDepth ? "Ge" : "depth"} column`,
    });
  }
  list.done();
  if (!depth || !ge) throw new Error("validateDepthProfile: unreachable (columns checked above)");
  for (let i = 1; i < depth.length; i++) {
    if (!(depth[i] > depth[i - 1])) {
      throw new InputError({
        file: t.file,
        line: t.rowLines[i],
        field: "column depth",
        message: depth[i] === depth[i - 1] ? "depth repeats" : "depth is not increasing",
        expected: "depth increasing from row to row",
        found: `${t.rows[i - 1][t.columns.find((c) => c.name === "depth")!.index]} then ${t.rows[i][t.columns.find((c) => c.name === "depth")!.index]}`,
        fix: "sort the rows by depth and merge repeated depths",
      });
    }
  }
  if (depth.length < 20) {
    throw new InputError({
      file: t.file,
      line: t.headerLine,
      message: "too few rows for a depth profile",
      expected: "at least 20 depths across the well",
      found: `${depth.length}`,
      fix: "export the full profile",
    });
  }
  return { file: t.file, method, depth: Array.from(depth), ge: Array.from(ge), contaminants };
}
