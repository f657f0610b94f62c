// <metric>_cv: CV = 100·s/|mean| with the sample standard deviation (n − 1) (src/analyse/uniformity.ts definition;
// textbook coefficient of variation, from memory [M]). Expected values derived by hand below.
import { describe, expect, it } from "vitest";
import { uniformityMetrics } from "../../src/analyse/uniformityMetrics.ts";
import { UNIFORMITY_METRICS } from "../../src/model/metrics/uniformity.ts";
import { METRIC_BY_KEY } from "../../src/model/metrics.ts";
import { validateTargets } from "../../src/validate/targets.ts";

describe("uniformityMetrics", () => {
  it("CV of three devices' peak mobility", () => {
    // values 1e5, 1.1e5, 1.2e5: mean 1.1e5, s = 1e4 (sample), CV = 9.0909 % (derived).
    const out = uniformityMetrics([{ metrics: { peak_mobility: 1e5 } }, { metrics: { peak_mobility: 1.1e5 } }, { metrics: { peak_mobility: 1.2e5 } }]);
    expect(out.peak_mobility_cv).toBeCloseTo(100 / 11, 8);
    expect(out.turn_on_voltage_cv).toBeUndefined();
  });
  it("negative mean uses |mean|; one device or zero mean gives no value (never NaN)", () => {
    // −0.1, −0.3: mean −0.2, s = 0.141421, CV = 70.7107 % (derived).
    expect(uniformityMetrics([{ metrics: { turn_on_voltage: -0.1 } }, { metrics: { turn_on_voltage: -0.3 } }]).turn_on_voltage_cv).toBeCloseTo(70.7107, 3);
    expect(uniformityMetrics([{ metrics: { turn_on_voltage: 0.3 } }])).toEqual({});
    expect(uniformityMetrics([{ metrics: { turn_on_voltage: 0.1 } }, { metrics: { turn_on_voltage: -0.1 } }])).toEqual({});
    expect(uniformityMetrics([])).toEqual({});
  });
  it("the _cv keys are registered in % and usable in targets", () => {
    for (const m of UNIFORMITY_METRICS) expect(METRIC_BY_KEY.get(m.key)?.unit).toBe("%");
    const text = `grades:\n  qubit:\n    peak_mobility_cv: { max: "5 %" }\n`;
    const t = validateTargets({ grades: { qubit: { peak_mobility_cv: { max: "5 %" } } } }, "targets.yaml", text);
    expect(t.grades.qubit.peak_mobility_cv.max).toBeCloseTo(5, 12);
  });
});
