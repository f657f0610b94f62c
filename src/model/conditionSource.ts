/**
 * Where a measurement condition of a file came from (docs/formats.md, "Files
 * as the instruments write them"): the file's own `# key: value` line, a
 * reading rule of wafer.md that found it in the file's name or in a preamble
 * line, a fixed value written in wafer.md, or a column of the file (a source
 * current measured row by row). Carried from validation to the page so an
 * engineer can see, per sweep, what was measured and what was assumed.
 */
export type ConditionOrigin = "file-line" | "rule-file-name" | "rule-line" | "record-value" | "file-column";

export interface ConditionSource {
  /** The condition: gate, field, temperature, current, or field_range (a field sweep's B column). */
  key: string;
  origin: ConditionOrigin;
  /** The value in SI units (V, T, K, A); for a current column, the mean over the rows. */
  value?: number;
  /** For a range read from a column (field_range): the smallest and largest value, SI units. */
  span?: [number, number];
  /** The file line the value was read from (file-line, rule-line). */
  line?: number;
  /** The rule as wafer.md writes it, such as `gate.file_name` (rule-file-name, rule-line, record-value). */
  rule?: string;
  /** Where the rule is written: "wafers/TQ-2507/wafer.md:25". */
  ruleAt?: string;
  /** The column it was read from (file-column). */
  column?: string;
}
