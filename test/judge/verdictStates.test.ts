/**
 * The verdict states (src/judge/states.ts, issue 15 §1): "measured, no limit
 * for this grade" and "not measured" are separate states, and neither counts
 * toward the wafer's verdict; a wafer with nothing judged is `unjudged`.
 * Limits are invented test values.
 */
import { describe, expect, it } from "vitest";
import { readYaml } from "../../src/read/frontMatter.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { judgeWafer, worst } from "../../src/judge/verdict.ts";
import { VERDICT_STATES } from "../../src/judge/states.ts";

const text = `grades:
  qubit:
    peak_mobility: { min: "1e5 cm^2/(V s)" }
    turn_on_voltage: { max: "0.6 V" }
    gate_hysteresis: { max: "0.1 V", required: true }
  empty:
    quantum_lifetime: { min: "1 ps" }
`;
const targets = validateTargets(readYaml(text, "targets.yaml"), "targets.yaml", text);
const per = (v: number) => ({ perDevice: { HB1: v } });

describe("verdict states", () => {
  const j = judgeWafer({ peak_mobility: per(1.5e5), gate_hysteresis: per(0.05), mobility_exponent: per(0.9) }, "qubit", targets, [], false);
  const state = (k: string) => j.metrics.find((m) => m.key === k)!;

  it("measured without a limit for the grade → recorded; a limited metric with no value → unmeasured; required and missing → incomplete", () => {
    expect(state("mobility_exponent")).toMatchObject({ verdict: "recorded", reason: "no target for this grade" });
    expect(state("turn_on_voltage")).toMatchObject({ verdict: "unmeasured", reason: "Turn-on voltage was not measured" });
    const missing = judgeWafer({ peak_mobility: per(1.5e5) }, "qubit", targets, [], false);
    expect(missing.metrics.find((m) => m.key === "gate_hysteresis")!.verdict).toBe("incomplete");
    expect(missing.verdict).toBe("incomplete");
  });

  it("recorded and unmeasured metrics do not change the wafer verdict", () => {
    expect(j.verdict).toBe("pass");
    expect(j.reasons).toEqual([]);
  });

  it("a wafer with nothing its grade limits measured, and nothing required, is unjudged (not pass)", () => {
    const none = judgeWafer({ peak_mobility: per(1.5e5) }, "empty", targets, [], false);
    expect(none.metrics.map((m) => m.verdict).sort()).toEqual(["recorded", "unmeasured"]);
    expect(none.verdict).toBe("unjudged");
    expect(worst([])).toBe("unjudged");
  });

  it("every state has its own key, a word and a legend line; the not-judged states rank below pass", () => {
    const keys = VERDICT_STATES.map((s) => s.key);
    expect(new Set(keys).size).toBe(keys.length);
    for (const s of VERDICT_STATES) expect(s.word.length * s.meaning.length).toBeGreaterThan(0);
    const rank = Object.fromEntries(VERDICT_STATES.map((s) => [s.key, s.rank]));
    for (const k of ["recorded", "unmeasured", "unjudged", "noted"]) expect(rank[k]).toBeLessThan(rank.pass);
    expect(
      rank.error > rank.fail && rank.fail > rank.incomplete && rank.incomplete > rank.marginal && rank.marginal > rank.waived && rank.waived > rank.pass,
    ).toBe(true);
  });
});
