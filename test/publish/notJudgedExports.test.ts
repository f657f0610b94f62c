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
  it("results.csv has a <key>_not_judged column after <key>_verdict holding the reason", () => {
    const rows: string[][] = parse(resultsCsv([w1, w2]));
    const [header, r1, r2] = rows;
    const col = (row: string[], name: string) => {
      expect(header).toContain(name);
      return row[header.indexOf(name)];
    };
    const i = header.indexOf("valley_splitting_p10_verdict");
    expect(header[i + 1]).toBe("valley_splitting_p10_not_judged");
    expect(col(r1, "valley_splitting_p10_verdict")).toBe("recorded");
    expect(col(r1, "valley_splitting_p10_not_judged")).toBe(why);
    // No target for the mean: still recorded, and the reason is still carried.
    expect(col(r1, "valley_splitting_mean_not_judged")).toBe(why);
    expect(col(r2, "valley_splitting_p10_verdict")).toBe("pass");
    expect(col(r2, "valley_splitting_p10_not_judged")).toBe("");
    // A metric no wafer leaves unjudged gets no such column.
    expect(header).not.toContain("peak_mobility_not_judged");
  });

  it("without any not-judged metric the columns are unchanged", () => {
    const header: string[] = parse(resultsCsv([w2]))[0];
    expect(header.some((h) => h.endsWith("_not_judged"))).toBe(false);
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
