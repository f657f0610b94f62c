import { describe, expect, it } from "vitest";
import * as yaml from "js-yaml";
import { judgeWafer, worst } from "../../src/judge/verdict.ts";
import { validateTargets } from "../../src/validate/targets.ts";
import { formatProblem, InputError } from "../../src/model/problem.ts";

const text = `default_grade: qubit
grades:
  qubit:
    peak_mobility: { min: "1.0e5 cm^2/(V s)", guard: "5 %", required: true }
    turn_on_voltage: { between: ["100 mV", "0.6 V"], aggregate: max }
    density_at_peak_mobility: { max: "4e11 cm^-2", aggregate: every-device }
`;
const targets = validateTargets(yaml.load(text), "targets.yaml", text);

describe("targets", () => {
  it("converts limits into the metric's unit", () => {
    const t = targets.grades.qubit;
    expect(t.peak_mobility.min).toBe(1e5);
    expect(t.peak_mobility.guard).toBeCloseTo(5e3, 9);
    expect(t.turn_on_voltage.min).toBeCloseTo(0.1, 12);
  });
  function message(src: string): string {
    try {
      validateTargets(yaml.load(src), "targets.yaml", src);
    } catch (e) {
      if (e instanceof InputError) return formatProblem(e.problem);
      throw e;
    }
    throw new Error("expected an error");
  }
  it("rejects incompatible and unparseable units, and unknown metrics, naming the field", () => {
    expect(message('grades:\n  q:\n    peak_mobility: { min: "1e5 V" }\n')).toBe(
      'targets.yaml:3: grades.q.peak_mobility.min: cannot read the limit for Peak Hall mobility (expected a value with a unit convertible to cm^2/(V s), such as "1 cm^2/(V s)", found "1e5 V", which has a different dimension (a voltage, not a mobility; a mobility is written in cm²/(V s), m²/(V s))) — write the value with a unit convertible to cm^2/(V s)',
    );
    expect(message('grades:\n  q:\n    turn_on_voltage: { max: "lots" }\n')).toMatch(/which is not a known quantity/);
    expect(message('grades:\n  q:\n    peak_mobilty: { min: "1e5 cm^2/(V s)" }\n')).toMatch(/unknown metric .* did you mean "peak_mobility"\?/);
  });
});

describe("verdicts", () => {
  const judge = (values: Record<string, Record<string, number>>, waivers = []) =>
    judgeWafer(Object.fromEntries(Object.entries(values).map(([k, per]) => [k, { perDevice: per }])), "qubit", targets, waivers, false);

  it("orders error > fail > incomplete > marginal > waived > pass (issue #5)", () => {
    expect(worst(["pass", "waived", "marginal"])).toBe("marginal");
    expect(worst(["pass", "incomplete", "marginal"])).toBe("incomplete");
    expect(worst(["fail", "error"])).toBe("error");
    expect(worst(["recorded", "unmeasured"])).toBe("unjudged");
  });
  it("passes, marks values inside the guard band marginal, and fails outside", () => {
    expect(judge({ peak_mobility: { a: 1.2e5 } }).metrics[0].verdict).toBe("pass");
    const m = judge({ peak_mobility: { a: 1.03e5 } });
    expect(m.metrics[0].verdict).toBe("marginal");
    expect(m.reasons[0]).toMatch(/guard band/);
    expect(judge({ peak_mobility: { a: 0.9e5 } }).verdict).toBe("fail");
  });
  it("aggregates devices by mean, max, or judges every device", () => {
    const j = judge({ peak_mobility: { a: 1.2e5, b: 1.3e5 }, turn_on_voltage: { a: 0.3, b: 0.65 }, density_at_peak_mobility: { a: 3e11, b: 4.2e11 } });
    const byKey = Object.fromEntries(j.metrics.map((m) => [m.key, m]));
    expect(byKey.peak_mobility.value).toBeCloseTo(1.25e5, 6);
    expect(byKey.turn_on_voltage.verdict).toBe("fail");
    expect(byKey.density_at_peak_mobility.verdict).toBe("fail");
    expect(byKey.density_at_peak_mobility.reason).toMatch(/^device b:/);
  });
  it("a missing required metric makes the wafer incomplete", () => {
    const j = judge({ turn_on_voltage: { a: 0.3 } });
    expect(j.verdict).toBe("incomplete");
    expect(j.reasons[0]).toMatch(/required but was not measured/);
  });
  it("a waiver turns a failing metric into waived, with its reason", () => {
    const j = judge({ peak_mobility: { a: 1.2e5 }, turn_on_voltage: { a: 0.7 } }, [
      { metric: "turn_on_voltage", reason: "accepted by device team", approved_by: "Q. Lead", date: "2025-01-01" },
    ] as never);
    expect(j.verdict).toBe("waived");
    expect(j.reasons[0]).toMatch(/waived by Q. Lead on 2025-01-01: accepted by device team/);
  });
});
