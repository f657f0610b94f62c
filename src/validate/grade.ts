/**
 * A wafer's grade must be one that targets.yaml defines (docs/formats.md): the record's `grade:`,
 * or the targets' default grade when the record names none.
 */
import type { Problem } from "../model/problem.ts";
import type { Targets } from "./targets.ts";
import type { WaferRecord } from "./wafer.ts";

/** The located problem of a grade targets.yaml does not define, or undefined when it is defined. */
export function unknownGradeProblem(folder: string, record: WaferRecord, grade: string, targets: Targets): Problem | undefined {
  if (grade in targets.grades) return undefined;
  return {
    severity: "error",
    wafer: folder,
    file: record.file,
    field: "grade",
    message: "unknown grade",
    expected: Object.keys(targets.grades).join(", "),
    found: JSON.stringify(grade),
    fix: "use a grade defined in targets.yaml",
  };
}
