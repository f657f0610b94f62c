/**
 * targets.yaml → typed grades and limits, in each metric's own unit.
 *
 * Shape (docs/formats.md):
 *   default_grade: qubit
 *   grades:
 *     qubit:
 *       peak_mobility: { min: "1.0e5 cm^2/(V s)", guard: "5 %", required: true, aggregate: mean }
 *       turn_on_voltage: { between: ["0.1 V", "0.6 V"] }
 *       findings: { one_sign_field: note }   # consequence per finding (src/judge/findings.ts)
 * Every problem in the file is reported (up to MAX_PROBLEMS_PER_FILE). Values are parsed and converted with the closed unit table (units.ts); a dimension mismatch or an
 * unknown metric is an error naming the grade and metric.
 */
import { lineOfField } from "../read/frontMatter.ts";
import { METRIC_BY_KEY } from "../model/metrics.ts";
import { didYouMean, InputError, ProblemList, show } from "../model/problem.ts";
import { CONSEQUENCES, FINDING_KEYS, isFindingKey, type Consequence, type FindingKey } from "./findingKeys.ts";
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
  /** Per grade, the consequence of each finding the grade sets (`findings:` block); unset findings keep their default. */
  findings: Record<string, Partial<Record<FindingKey, Consequence>>>;
  file: string;
  /** The optional `trends:` block (control-chart baseline and rule settings). */
  trends?: TrendSettings;
}

/** The key inside a grade that holds finding consequences rather than a metric limit. */
export const FINDINGS_KEY = "findings";

const TARGET_KEYS = ["min", "max", "between", "guard", "required", "aggregate", "note"];

export function validateTargets(raw: unknown, file: string, yamlText: string): Targets {
  const lineOf = (f: string) => lineOfField("\n" + yamlText, f, 1);
  if (!raw || typeof raw !== "object" || Array.isArray(raw)) {
    throw new InputError({
      file,
      line: 1,
      message: "targets file must be a mapping",
      expected: "default_grade and grades",
      found: show(raw),
      fix: "see docs/formats.md, section Targets",
    });
  }
  // Every problem in the file is reported, not just the first (ProblemList).
  const list = new ProblemList(file);
  const r = raw as Record<string, unknown>;
  for (const k of Object.keys(r)) {
    if (k !== "default_grade" && k !== "grades" && k !== "trends") {
      const hint = didYouMean(k, ["default_grade", "grades", "trends"]);
      list.add({
        file,
        line: lineOf(k),
        field: k,
        message: "unknown key",
        expected: "default_grade, grades or trends",
        found: JSON.stringify(k),
        fix: hint ? `did you mean "${hint}"?` : "remove it",
      });
    }
  }
  if (!r.grades || typeof r.grades !== "object" || Array.isArray(r.grades) || Object.keys(r.grades).length === 0) {
    // An absent key has no line of its own: point at the top of the file, where top-level keys go.
    list.add({
      file,
      line: lineOf("grades") ?? 1,
      field: "grades",
      message: "no grades",
      expected: "a mapping of grade name → metric limits",
      found: r.grades && typeof r.grades === "object" && !Array.isArray(r.grades) ? "an empty mapping" : show(r.grades),
      fix: "add at least one grade",
    });
    list.done();
  }
  const grades: Targets["grades"] = {};
  const findings: Targets["findings"] = {};
  for (const [grade, limits] of Object.entries(r.grades as Record<string, unknown>)) {
    grades[grade] = {};
    findings[grade] = {};
    if (!limits || typeof limits !== "object" || Array.isArray(limits)) {
      list.add({
        file,
        line: lineOf(`grades.${grade}`),
        field: `grades.${grade}`,
        message: "grade must map metrics to limits",
        expected: 'metric: { min: "…" }',
        found: show(limits),
        fix: `indent the grade's metrics under "${grade}:", one per line, such as peak_mobility: { min: "1e5 cm^2/(V s)" }`,
      });
      continue;
    }
    for (const [metric, spec] of Object.entries(limits as Record<string, unknown>)) {
      const field = `grades.${grade}.${metric}`;
      if (metric === FINDINGS_KEY) {
        findings[grade] = readConsequences(spec, { file, field, line: lineOf(field) }, (k) => lineOf(`${field}.${k}`), list);
        continue;
      }
      const t = list.attempt(() => readTarget(metric, spec, { file, field, line: lineOf(field) }));
      if (t) grades[grade][metric] = t;
    }
  }
  const defaultGrade = r.default_grade ?? Object.keys(grades)[0];
  if (typeof defaultGrade !== "string" || !(defaultGrade in grades)) {
    list.add({
      file,
      line: lineOf("default_grade") ?? lineOf("grades") ?? 1,
      field: "default_grade",
      message: "default grade is not one of the grades",
      expected: Object.keys(grades).join(", "),
      found: show(defaultGrade),
      fix: "name one of the grades defined below",
    });
  }
  const trends = list.attempt(() => readTrendSettings(r.trends, file, lineOf, Object.keys(grades)));
  list.done();
  return { defaultGrade: defaultGrade as string, grades, findings, file, trends };
}

/**
 * A grade's `findings:` block: finding key → fail | marginal | note. Every
 * problem is recorded in `list`; the keys that read well are kept.
 */
function readConsequences(
  spec: unknown,
  where: { file: string; field: string; line?: number },
  lineOf: (k: string) => number | undefined,
  list: ProblemList,
): Partial<Record<FindingKey, Consequence>> {
  const out: Partial<Record<FindingKey, Consequence>> = {};
  if (!spec || typeof spec !== "object" || Array.isArray(spec)) {
    list.add({
      ...where,
      message: "findings must map finding names to consequences",
      expected: `finding: ${CONSEQUENCES.join(" | ")}`,
      found: show(spec),
      fix: "write one finding per line under findings:, such as incoherent_well: note",
    });
    return out;
  }
  for (const [key, value] of Object.entries(spec as Record<string, unknown>)) {
    const at = { file: where.file, field: `${where.field}.${key}`, line: lineOf(key) ?? where.line };
    if (!isFindingKey(key)) {
      const hint = didYouMean(key, FINDING_KEYS);
      list.add({
        ...at,
        message: "unknown finding",
        expected: FINDING_KEYS.join(", "),
        found: JSON.stringify(key),
        fix: hint ? `did you mean "${hint}"?` : "check the spelling against docs/formats.md",
      });
      continue;
    }
    if (!CONSEQUENCES.includes(value as Consequence)) {
      list.add({
        ...at,
        message: "unknown consequence",
        expected: CONSEQUENCES.join(" | "),
        found: show(value),
        fix: `write ${key}: fail, ${key}: marginal or ${key}: note`,
      });
      continue;
    }
    out[key as FindingKey] = value as Consequence;
  }
  return out;
}

function readTarget(metric: string, spec: unknown, where: { file: string; field: string; line?: number }): Target {
  const known = [...METRIC_BY_KEY.keys()];
  const m = METRIC_BY_KEY.get(metric);
  if (!m) {
    const hint = didYouMean(metric, known);
    throw new InputError({
      ...where,
      message: "unknown metric",
      expected: "a metric key listed in docs/formats.md",
      found: JSON.stringify(metric),
      fix: hint ? `did you mean "${hint}"?` : "check the spelling against docs/formats.md",
    });
  }
  if (!spec || typeof spec !== "object" || Array.isArray(spec)) {
    throw new InputError({
      ...where,
      message: "limit must be a mapping",
      expected: `{ min: "…" }, { max: "…" } or { between: ["…", "…"] }`,
      found: show(spec),
      fix: `write the limit in braces with its unit, such as ${metric}: { min: "…" }`,
    });
  }
  const s = spec as Record<string, unknown>;
  // Each key of the limit is checked on its own, so one bad key does not hide another.
  const list = new ProblemList(where.file);
  for (const k of Object.keys(s)) {
    if (!TARGET_KEYS.includes(k)) {
      const hint = didYouMean(k, TARGET_KEYS);
      list.add({
        ...where,
        field: `${where.field}.${k}`,
        message: "unknown key in a limit",
        expected: TARGET_KEYS.join(", "),
        found: JSON.stringify(k),
        fix: hint ? `did you mean "${hint}"?` : "remove it",
      });
    }
  }
  const q = (v: unknown, field: string): number => {
    const r = parseQuantity(v, m.unit);
    if (!r.ok)
      throw new InputError({
        ...where,
        field: `${where.field}.${field}`,
        message: `cannot read the limit for ${m.label}`,
        expected: r.expected,
        found: r.found,
        fix: `write the value with a unit convertible to ${m.unit}`,
      });
    return r.value;
  };
  const t: Target = { metric, required: false, aggregate: "mean", text: "" };
  const count = ["min", "max", "between"].filter((k) => k in s).length;
  if (count !== 1) {
    list.add({
      ...where,
      message: "a limit needs exactly one of min, max or between",
      expected: "one of min, max, between",
      found: count === 0 ? "none" : "several",
      fix: "use between: [low, high] for two-sided limits",
    });
  }
  // The guard band is read relative to the limit, so only once the limit has been read.
  const limitRead =
    count === 1 &&
    list.attempt(() => {
      readLimit(s, t, q, where);
      return true;
    });
  if ("guard" in s && limitRead) list.attempt(() => readGuard(s, t, q, where));
  if ("required" in s) {
    if (typeof s.required !== "boolean")
      list.add({
        ...where,
        field: `${where.field}.required`,
        message: "required must be true or false",
        expected: "true or false",
        found: show(s.required),
        fix: "write required: true or required: false, without quotes",
      });
    else t.required = s.required;
  }
  if ("aggregate" in s) {
    const options: Aggregate[] = ["mean", "min", "max", "every-device"];
    if (!options.includes(s.aggregate as Aggregate))
      list.add({
        ...where,
        field: `${where.field}.aggregate`,
        message: "unknown aggregate",
        expected: options.join(" | "),
        found: show(s.aggregate),
        fix: `use one of ${options.join(", ")}`,
      });
    else t.aggregate = s.aggregate as Aggregate;
  }
  list.done();
  return t;
}

type Where = { file: string; field: string; line?: number };

/** min, max or between (whichever one is present). */
function readLimit(s: Record<string, unknown>, t: Target, q: (v: unknown, field: string) => number, where: Where): void {
  if ("min" in s) {
    t.min = q(s.min, "min");
    t.text = `≥ ${s.min}`;
  } else if ("max" in s) {
    t.max = q(s.max, "max");
    t.text = `≤ ${s.max}`;
  } else {
    if (!Array.isArray(s.between) || s.between.length !== 2) {
      throw new InputError({
        ...where,
        field: `${where.field}.between`,
        message: "between needs two values",
        expected: "[low, high]",
        found: show(s.between),
        fix: 'give the low and the high limit with units in brackets, such as between: ["0.1 V", "0.6 V"]',
      });
    }
    t.min = q(s.between[0], "between[0]");
    t.max = q(s.between[1], "between[1]");
    if (!(t.min < t.max))
      throw new InputError({
        ...where,
        field: `${where.field}.between`,
        message: "between limits are reversed or equal",
        expected: "low first, then high",
        found: `${s.between[0]}, ${s.between[1]}`,
        fix: "swap them",
      });
    t.text = `${s.between[0]} … ${s.between[1]}`;
  }
}

/** The guard band, as a percentage of the limit (or of the width of a between) or an amount. */
function readGuard(s: Record<string, unknown>, t: Target, q: (v: unknown, field: string) => number, where: Where): void {
  const g = s.guard;
  {
    const text = typeof g === "string" ? g.trim() : g;
    if (typeof text === "string" && text.endsWith("%")) {
      const pct = parseQuantity(text, "%");
      if (!pct.ok || pct.value < 0 || pct.value >= 100)
        throw new InputError({
          ...where,
          field: `${where.field}.guard`,
          message: "cannot read the guard band",
          expected: 'a percentage between 0 and 100, such as "5 %", or an amount with the metric\'s unit',
          found: show(g),
          fix: 'write a percentage from 0 up to (not including) 100, such as guard: "5 %"',
        });
      const ref = t.min !== undefined && t.max !== undefined ? t.max - t.min : Math.abs((t.min ?? t.max)!);
      t.guard = (pct.value / 100) * ref;
    } else {
      t.guard = Math.abs(q(g, "guard"));
    }
    t.guardText = String(g);
  }
}
