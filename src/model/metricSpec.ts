/** What a metric is: key, label, unit, conversion from SI, where it is shown. */
export interface MetricSpec {
  key: string;
  label: string;
  /** Unit string as written in results.json and accepted (after conversion) in targets.yaml. */
  unit: string;
  /** Multiply an SI value by this to get the value in `unit`. */
  fromSI: number;
  /** Which section of a wafer page shows it. */
  section: "transport" | "structure" | "images" | "uniformity";
  description: string;
  /** Number of significant digits shown on pages. */
  digits: number;
  /**
   * Natural bounds of the quantity in `unit` (e.g. min 0 for a width or a density, [0, 1] for a
   * fraction); absent when the quantity may take any sign. Set from src/model/metricBounds.ts.
   */
  bounds?: { min?: number; max?: number };
  /**
   * "log" when wafers are best compared on a logarithmic axis (the relation page): strictly
   * positive quantities that span decades across wafers and are related by power laws. Set from
   * src/model/metricScale.ts; absent means linear.
   */
  axis?: "log";
}

export const metric = (
  key: string,
  label: string,
  unit: string,
  fromSI: number,
  section: MetricSpec["section"],
  description: string,
  digits = 3,
): MetricSpec => ({ key, label, unit, fromSI, section, description, digits });
