/**
 * Page model of /targets/: the grades and limits in force (with guard band,
 * required, aggregate) and each finding's consequence, the trend settings, and every registered metric with
 * its unit and description.
 */
import { METRICS, METRIC_BY_KEY } from "../model/metrics.ts";
import type { Targets } from "../validate/targets.ts";
import { DEFAULT_TREND_SETTINGS } from "../validate/trendSettings.ts";
import { describeBaseline } from "../judge/trends.ts";
import { DEFAULT_MAX_PASSES } from "../judge/phaseOne.ts";
import { describeProduction } from "./trends.ts";
import { formatValue, microSign, prettyUnit } from "../model/format.ts";
import { FINDING_SPECS } from "../judge/findings.ts";

export function targetsPageModel(targets: Targets | undefined) {
  const grades = Object.entries(targets?.grades ?? {}).map(([name, limits]) => ({
    name,
    isDefault: name === targets?.defaultGrade,
    rows: Object.values(limits).map((t) => {
      const spec = METRIC_BY_KEY.get(t.metric)!;
      return {
        key: t.metric,
        label: spec.label,
        limit: t.text,
        lower: t.min === undefined ? "—" : formatValue(t.min, spec),
        upper: t.max === undefined ? "—" : formatValue(t.max, spec),
        guard: t.guard === undefined ? "—" : `${t.guardText} (${formatValue(t.guard, spec)})`,
        required: t.required ? "yes" : "no",
        aggregate: spec.section === "transport" || spec.section === "uniformity" ? t.aggregate : "wafer-level",
      };
    }),
    // Every finding's consequence for this grade: the grade's own (findings: block) or the default.
    findings: FINDING_SPECS.map((f) => {
      const set = targets?.findings?.[name]?.[f.key];
      return { key: f.key, label: f.label, consequence: set ?? f.defaultConsequence, from: set ? "this grade" : "default" };
    }),
  }));
  const trends = targets?.trends ?? DEFAULT_TREND_SETTINGS;
  return {
    present: targets !== undefined,
    file: targets?.file ?? "targets.yaml",
    defaultGrade: targets?.defaultGrade ?? "",
    grades,
    trends: {
      baseline: describeBaseline(trends),
      runLength: trends.runLength,
      production: describeProduction(targets),
      maxPasses: trends.maxPasses ?? DEFAULT_MAX_PASSES,
      limitsBy: trends.limitsBy ?? "none",
      exclusions: (trends.exclude ?? []).length,
    },
    metrics: METRICS.map((m) => ({
      key: m.key,
      label: m.label,
      unit: prettyUnit(m.unit) || "—",
      // The plain-text spelling (as typed in targets.yaml), with the micro sign as everywhere on the site.
      rawUnit: microSign(m.unit),
      section: m.section,
      description: m.description,
    })),
  };
}
