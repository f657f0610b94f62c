/**
 * targets.yaml → typed grades and limits, in each metric's own unit.
 *
 * Shape (docs/formats.md):
 *   default_grade: qubit
 *   grades:
 *     qubit:
 *       peak_mobility: { min: "1.0e5 cm^2/(V s)", guard: "5 %", required: true, aggregate: mean }
 *       turn_on_voltage: { between: ["0.1 V", "0.6 V"] }
 * Values are parsed and converted with mathjs; a dimension mismatch or an
 * unknown metric is an error naming the grade and metric.
 */
import { lineOfField } from "../read/frontMatter.ts";
import { METRIC_BY_KEY } from "../analyse/metrics.ts";
import { didYouMean, InputError, show } from "./problem.ts";
import { parseQuantity } from "./units.ts";
import { readTrendSettings, type TrendSettings } from "./trendSettings.ts";

export type Aggregate = "mean" | "min" | "max" | "every-device";

export interface Target {
  metric: string;
  /** Lower and upper limits in the metric's unit; either may be absent. */
  min?: number;
  max?: number;
  /** Guard band as an absolute amount in the metric's unit. */
  guard?: number;
  guardText?: string;
  required: boolean;
  aggregate: Aggregate;
  /** The limit as the team wrote it, for display. */
  text: string;
}

export interface Targets {
  defaultGrade: string;
  grades: Record<string, Record<string, Target>>;
  file: string;
  /** The optional `trends:` block (control-chart baseline and rule settings). */
  trends?: TrendSettings;
}

const TARGET_KEYS = ["min", "max", "between", "guard", "required", "aggregate", "note"];

export function validateTargets(raw: unknown, file: string, yamlText: string): Targets {
  const lineOf = (f: string) => lineOfField("\n" + yamlText, f, 1);
  if (!raw || typeof raw !== "object" || Array.isArray(raw)) {
    throw new InputError({ file, line: 1, message: "targets file must be a mapping", expected: "default_grade and grades", found: show(raw), fix: "see docs/formats.md, section Targets" });
  }
  const r = raw as Record<string, unknown>;
  for (const k of Object.keys(r)) {
    if (k !== "default_grade" && k !== "grades" && k !== "trends") {
      const hint = didYouMean(k, ["default_grade", "grades", "trends"]);
      throw new InputError({ file, line: lineOf(k), field: k, message: "unknown key", expected: "default_grade, grades or trends", found: JSON.stringify(k), fix: hint ? `did you mean "${hint}"?` : "remove it" });
    }
  }
  if (!r.grades || typeof r.grades !== "object" || Array.isArray(r.grades) || Object.keys(r.grades).length === 0) {
    // An absent key has no line of its own: point at the top of the file, where top-level keys go.
    throw new InputError({ file, line: lineOf("grades") ?? 1, field: "grades", message: "no grades", expected: "a mapping of grade name → metric limits", found: r.grades && typeof r.grades === "object" && !Array.isArray(r.grades) ? "an empty mapping" : show(r.grades), fix: "add at least one grade" });
  }
  const grades: Targets["grades"] = {};
  for (const [grade, limits] of Object.entries(r.grades as Record<string, unknown>)) {
    if (!limits || typeof limits !== "object" || Array.isArray(limits)) {
      throw new InputError({ file, line: lineOf(`grades.${grade}`), field: `grades.${grade}`, message: "grade must map metrics to limits", expected: "metric: { min: \"…\" }", found: show(limits), fix: `indent the grade's metrics under "${grade}:", one per line, such as peak_mobility: { min: "1e5 cm^2/(V s)" }` });
    }
    grades[grade] = {};
    for (const [metric, spec] of Object.entries(limits as Record<string, unknown>)) {
      grades[grade][metric] = readTarget(metric, spec, { file, field: `grades.${grade}.${metric}`, line: lineOf(`grades.${grade}.${metric}`) });
    }
  }
  const defaultGrade = r.default_grade ?? Object.keys(grades)[0];
  if (typeof defaultGrade !== "string" || !(defaultGrade in grades)) {
    throw new InputError({ file, line: lineOf("default_grade") ?? lineOf("grades") ?? 1, field: "default_grade", message: "default grade is not one of the grades", expected: Object.keys(grades).join(", "), found: show(defaultGrade), fix: "name one of the grades defined below" });
  }
  return { defaultGrade, grades, file, trends: readTrendSettings(r.trends, file, lineOf, Object.keys(grades)) };
}

function readTarget(metric: string, spec: unknown, where: { file: string; field: string; line?: number }): Target {
  const known = [...METRIC_BY_KEY.keys()];
  const m = METRIC_BY_KEY.get(metric);
  if (!m) {
    const hint = didYouMean(metric, known);
    throw new InputError({ ...where, message: "unknown metric", expected: "a metric key listed in docs/formats.md", found: JSON.stringify(metric), fix: hint ? `did you mean "${hint}"?` : "check the spelling against docs/formats.md" });
  }
  if (!spec || typeof spec !== "object" || Array.isArray(spec)) {
    throw new InputError({ ...where, message: "limit must be a mapping", expected: `{ min: "…" }, { max: "…" } or { between: ["…", "…"] }`, found: show(spec), fix: `write the limit in braces with its unit, such as ${metric}: { min: "…" }` });
  }
  const s = spec as Record<string, unknown>;
  for (const k of Object.keys(s)) {
    if (!TARGET_KEYS.includes(k)) {
      const hint = didYouMean(k, TARGET_KEYS);
      throw new InputError({ ...where, field: `${where.field}.${k}`, message: "unknown key in a limit", expected: TARGET_KEYS.join(", "), found: JSON.stringify(k), fix: hint ? `did you mean "${hint}"?` : "remove it" });
    }
  }
  const q = (v: unknown, field: string): number => {
    const r = parseQuantity(v, m.unit);
    if (!r.ok) throw new InputError({ ...where, field: `${where.field}.${field}`, message: `cannot read the limit for ${m.label}`, expected: r.expected, found: r.found, fix: `write the value with a unit convertible to ${m.unit}` });
    return r.value;
  };
  const t: Target = { metric, required: false, aggregate: "mean", text: "" };
  const count = ["min", "max", "between"].filter((k) => k in s).length;
  if (count !== 1) {
    throw new InputError({ ...where, message: "a limit needs exactly one of min, max or between", expected: "one of min, max, between", found: count === 0 ? "none" : "several", fix: "use between: [low, high] for two-sided limits" });
  }
  if ("min" in s) {
    t.min = q(s.min, "min");
    t.text = `≥ ${s.min}`;
  } else if ("max" in s) {
    t.max = q(s.max, "max");
    t.text = `≤ ${s.max}`;
  } else {
    if (!Array.isArray(s.between) || s.between.length !== 2) {
      throw new InputError({ ...where, field: `${where.field}.between`, message: "between needs two values", expected: "[low, high]", found: show(s.between), fix: "give the low and the high limit with units in brackets, such as between: [\"0.1 V\", \"0.6 V\"]" });
    }
    t.min = q(s.between[0], "between[0]");
    t.max = q(s.between[1], "between[1]");
    if (!(t.min < t.max)) throw new InputError({ ...where, field: `${where.field}.between`, message: "between limits are reversed or equal", expected: "low first, then high", found: `${s.between[0]}, ${s.between[1]}`, fix: "swap them" });
    t.text = `${s.between[0]} … ${s.between[1]}`;
  }
  if ("guard" in s) {
    const g = s.guard;
    const text = typeof g === "string" ? g.trim() : g;
    if (typeof text === "string" && text.endsWith("%")) {
      const pct = parseQuantity(text, "%");
      if (!pct.ok || pct.value < 0 || pct.value >= 100) throw new InputError({ ...where, field: `${where.field}.guard`, message: "cannot read the guard band", expected: "a percentage between 0 and 100, such as \"5 %\", or an amount with the metric's unit", found: show(g), fix: "write a percentage from 0 up to (not including) 100, such as guard: \"5 %\"" });
      const ref = t.min !== undefined && t.max !== undefined ? t.max - t.min : Math.abs((t.min ?? t.max)!);
      t.guard = (pct.value / 100) * ref;
    } else {
      t.guard = Math.abs(q(g, "guard"));
    }
    t.guardText = String(g);
  }
  if ("required" in s) {
    if (typeof s.required !== "boolean") throw new InputError({ ...where, field: `${where.field}.required`, message: "required must be true or false", expected: "true or false", found: show(s.required), fix: "write required: true or required: false, without quotes" });
    t.required = s.required;
  }
  if ("aggregate" in s) {
    const options: Aggregate[] = ["mean", "min", "max", "every-device"];
    if (!options.includes(s.aggregate as Aggregate)) throw new InputError({ ...where, field: `${where.field}.aggregate`, message: "unknown aggregate", expected: options.join(" | "), found: show(s.aggregate), fix: `use one of ${options.join(", ")}` });
    t.aggregate = s.aggregate as Aggregate;
  }
  return t;
}
