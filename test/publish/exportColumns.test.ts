// results.csv / results.json columns (issue 15 §5): per metric value, standard error, limits and
// verdict, named <key> [unit], <key>_stderr [unit], <key>_min [unit], <key>_max [unit], <key>_verdict
// (docs/formats.md §7). Expected numbers are worked out by hand in the comments.
import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { allResultsJson, resultsCsv } from "../../src/publish/exports.ts";
import { makeOutcome, targetsFrom } from "../helpers/outcome.ts";

const targets = targetsFrom(`default_grade: qubit
grades:
  qubit:
    peak_mobility: { min: "1.0e5 cm^2/(V s)" }
    turn_on_voltage: { between: ["0.1 V", "0.6 V"], aggregate: max }
    gate_density_slope: { min: "1e10 cm^-2/V" }
`);

// Two devices. turn_on_voltage judged as the max → 0.4 V from HB2, whose SE is 0.02 V.
// gate_density_slope judged as the mean → SE = √(SE₁² + SE₂²)/2 (independent devices, GUM §5.1 [M]):
// SE₁ = 1e14 m⁻²/V = 1e10 cm⁻²/V, SE₂ = 2e14 m⁻²/V = 2e10 cm⁻²/V → √5e20/2 = 1.118034e10 cm⁻²/V.
const a = makeOutcome(
  {
    id: "W1",
    devices: {
      HB1: { peak_mobility: 1.2e5, turn_on_voltage: 0.3, gate_density_slope: 5e11 },
      HB2: { peak_mobility: 0.8e5, turn_on_voltage: 0.4, gate_density_slope: 6e11 },
    },
    gateFitErr: { HB1: { slope: 1e14, turnOn: 0.01 }, HB2: { slope: 2e14, turnOn: 0.02 } },
  },
  targets,
);
const b = makeOutcome({ id: "W2", devices: { HB1: { peak_mobility: 1.5e5, turn_on_voltage: 0.2 } } }, targets);

describe("results.csv columns", () => {
  const rows: string[][] = parse(resultsCsv([a, b]));
  const header = rows[0];
  const col = (row: string[], name: string) => row[header.indexOf(name)];

  it("names five columns per metric, consistently, after the wafer, decision, finding and not_judged columns", () => {
    expect(header.slice(0, 11)).toEqual([
      "wafer",
      "run",
      "grown",
      "reactor",
      "grade",
      "verdict",
      "decision",
      "decision_by",
      "decision_date",
      "decision_reason",
      "decision_conflict",
    ]);
    // One column per finding (issue 15 §2), named finding_<key>, holding the finding's verdict.
    const findings = header.filter((h) => h.startsWith("finding_"));
    expect(findings).toEqual([
      "finding_incoherent_well",
      "finding_beyond_critical_thickness",
      "finding_parallel_conduction",
      "finding_one_sign_field",
      "finding_fit_undetermined",
      "finding_coarse_profile",
    ]);
    // Then one not_judged column, always there (docs/formats.md §7), before the metrics.
    expect(header[11 + findings.length]).toBe("not_judged");
    const rest = header.filter((h) => !h.startsWith("finding_") && h !== "not_judged");
    const i = rest.indexOf("peak_mobility [cm^2/(V s)]");
    expect(rest.slice(i, i + 5)).toEqual([
      "peak_mobility [cm^2/(V s)]",
      "peak_mobility_stderr [cm^2/(V s)]",
      "peak_mobility_min [cm^2/(V s)]",
      "peak_mobility_max [cm^2/(V s)]",
      "peak_mobility_verdict",
    ]);
    for (const h of rest.slice(11)) expect(h).toMatch(/^[a-z0-9_]+(_stderr|_min|_max)? \[[^\]]*\]$|^[a-z0-9_]+_verdict$/);
    expect(rest.length).toBe(11 + 5 * 3);
  });

  it("gives each metric's value, limits, verdict and standard error", () => {
    const w1 = rows[1];
    // mean of 1.2e5 and 0.8e5 = 1.0e5: exactly on the minimum → pass (a limit is inclusive).
    expect(Number(col(w1, "peak_mobility [cm^2/(V s)]"))).toBe(1e5);
    expect(col(w1, "peak_mobility_min [cm^2/(V s)]")).toBe("100000");
    expect(col(w1, "peak_mobility_max [cm^2/(V s)]")).toBe("");
    expect(col(w1, "peak_mobility_stderr [cm^2/(V s)]")).toBe(""); // a peak value has no fit error
    expect(col(w1, "peak_mobility_verdict")).toBe("pass");
    expect(Number(col(w1, "turn_on_voltage [V]"))).toBe(0.4);
    expect(Number(col(w1, "turn_on_voltage_stderr [V]"))).toBeCloseTo(0.02, 12);
    expect(Number(col(w1, "turn_on_voltage_min [V]"))).toBeCloseTo(0.1, 12);
    expect(Number(col(w1, "turn_on_voltage_max [V]"))).toBeCloseTo(0.6, 12);
    expect(Number(col(w1, "gate_density_slope_stderr [cm^-2/V]")) / 1.118034e10).toBeCloseTo(1, 5);
    // W2 has no slope value: the limit is still given, the verdict says it was not measured.
    const w2 = rows[2];
    expect(col(w2, "gate_density_slope [cm^-2/V]")).toBe("");
    expect(Number(col(w2, "gate_density_slope_min [cm^-2/V]"))).toBe(1e10);
    expect(col(w2, "gate_density_slope_verdict")).not.toBe("");
    expect(col(w2, "gate_density_slope_stderr [cm^-2/V]")).toBe("");
  });

  it("results.json carries the same figures, keyed by metric", () => {
    const j = allResultsJson([a, b], { version: "t", builtAt: "x" });
    const w1 = j.wafers[0];
    expect(w1.metrics.turn_on_voltage).toBe(0.4);
    expect(w1.stderr.turn_on_voltage).toBeCloseTo(0.02, 12);
    expect(w1.limits.turn_on_voltage).toEqual({ min: 0.1, max: 0.6 });
    expect(w1.verdicts.peak_mobility).toBe("pass");
    expect(w1.stderr.peak_mobility).toBeNull();
    expect(w1.decision).toBeNull();
    expect(Object.keys(j.units)).toEqual(["peak_mobility", "gate_density_slope", "turn_on_voltage"]);
  });
});
