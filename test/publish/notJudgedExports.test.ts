// The site-wide results.csv / results.json carry the reason a measured metric is shown but not judged
// (MetricValues.notJudged: a premise of the analysis fails), with or without a target for it.
import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { allResultsJson, resultsCsv } from "../../src/publish/exports.ts";
import { resultsJson } from "../../src/publish/resultsJson.ts";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";

const targets = targetsFrom(`default_grade: qubit
grades:
  qubit:
    peak_mobility: { min: "1.0e5 cm^2/(V s)" }
    valley_splitting_p10: { min: "20 µeV" }
`);

const why = "the measured Ge profile departs from the two-interface model the prediction is made from (at 47.4–48.6 nm)";
// W1: p10 (targeted) and the mean (no target) are measured but their premise fails.
const w1 = makeOutcome(
  {
    id: "W1",
    devices: { HB1: { peak_mobility: 1.2e5 } },
    wafer: { valley_splitting_p10: 5, valley_splitting_mean: 50 },
    notJudged: { valley_splitting_p10: why, valley_splitting_mean: why },
  },
  targets,
);
// W2: the same figures, judged.
const w2 = makeOutcome({ id: "W2", devices: { HB1: { peak_mobility: 1.5e5 } }, wafer: { valley_splitting_p10: 30, valley_splitting_mean: 60 } }, targets);

describe("not-judged reasons in the site-wide exports", () => {
  it('results.csv has one not_judged column, right after the finding columns, holding "key: reason" per metric not judged', () => {
    const rows: string[][] = parse(resultsCsv([w1, w2]));
    const [header, r1, r2] = rows;
    const col = (row: string[], name: string) => {
      expect(header).toContain(name);
      return row[header.indexOf(name)];
    };
    expect(header[header.indexOf("finding_coarse_profile") + 1]).toBe("not_judged");
    // In the order of the metric columns (the mean before p10, the table of docs/formats.md §6), separated by "; ".
    expect(col(r1, "not_judged")).toBe(`valley_splitting_mean: ${why}; valley_splitting_p10: ${why}`);
    expect(col(r1, "valley_splitting_p10_verdict")).toBe("recorded");
    expect(col(r2, "valley_splitting_p10_verdict")).toBe("pass");
    expect(col(r2, "not_judged")).toBe("");
    // No per-metric not-judged column.
    expect(header.some((h) => h.endsWith("_not_judged"))).toBe(false);
    // One cell in the file itself (quoted only when it holds a comma, quote or line break: RFC 4180; this reason has none).
    expect(resultsCsv([w1, w2])).toContain(`,valley_splitting_mean: ${why}; valley_splitting_p10: ${why},`);
  });

  it("the columns are the same whether or not a wafer leaves a metric unjudged (a tool reading by position reads the same column)", () => {
    const judged: string[] = parse(resultsCsv([w2, w2]))[0];
    const oneNotJudged: string[] = parse(resultsCsv([w1, w2]))[0];
    expect(oneNotJudged).toEqual(judged);
    expect(judged).toContain("not_judged");
  });

  it("results.json has a not_judged map, null where judged", () => {
    const j = allResultsJson([w1, w2], { version: "t", builtAt: "" });
    const [a, b] = j.wafers as unknown as { not_judged: Record<string, string | null> }[];
    expect(a.not_judged.valley_splitting_p10).toBe(why);
    expect(a.not_judged.valley_splitting_mean).toBe(why);
    expect(a.not_judged.peak_mobility).toBeNull();
    expect(b.not_judged.valley_splitting_p10).toBeNull();
  });

  it("a wafer's own results.json gives not_judged beside each metric", () => {
    const r = resultsJson(w1) as { metrics: Record<string, { not_judged: string | null; reason: string | null }> };
    expect(r.metrics.valley_splitting_mean.not_judged).toBe(why);
    expect(r.metrics.valley_splitting_p10.reason).toBe(`not judged: ${why}`);
    expect(r.metrics.peak_mobility.not_judged).toBeNull();
  });
});
