import { describe, expect, it } from "vitest";
import * as yaml from "js-yaml";
import { judgeWafer } from "../../src/judge/verdict.ts";
import { validateTargets } from "../../src/validate/targets.ts";

const text = `default_grade: qubit
grades:
  qubit:
    valley_splitting_p10: { min: "20 µeV", required: true }
    valley_splitting_mean: { min: "40 µeV" }
`;
const targets = validateTargets(yaml.load(text), "targets.yaml", text);
const UEV = 1; // metric values are in the metric's unit (µeV)

describe("a metric whose analysis premises fail is shown, not judged", () => {
  it("a p10 below its minimum with a failed premise is recorded with the reason, and the wafer is not failed by it", () => {
    const why = "the measured Ge profile departs from the two-interface model the prediction is made from (at 47.4–48.6 nm)";
    const j = judgeWafer(
      { valley_splitting_p10: { perDevice: {}, wafer: 5 * UEV, notJudged: why }, valley_splitting_mean: { perDevice: {}, wafer: 50 * UEV } },
      "qubit",
      targets,
      [],
      false,
    );
    const p10 = j.metrics.find((m) => m.key === "valley_splitting_p10")!;
    expect(p10.verdict).toBe("recorded");
    expect(p10.value).toBe(5);
    expect(p10.reason).toBe(`not judged: ${why}`);
    expect(j.verdict).toBe("pass"); // only the mean was judged
    expect(j.reasons.join(" ")).not.toMatch(/10th percentile/);
  });

  it("without the flag the same value fails", () => {
    const j = judgeWafer({ valley_splitting_p10: { perDevice: {}, wafer: 5 } }, "qubit", targets, [], false);
    expect(j.metrics.find((m) => m.key === "valley_splitting_p10")!.verdict).toBe("fail");
  });
});
