/**
 * Which quantities the relation page draws and fits on log axes: the metric
 * registry's `axis` (src/model/metricScale.ts), passed to the page's data
 * (src/publish/relationData.ts). The list is the module's stated choice
 * (quantities spanning decades and related by power laws, common practice);
 * the checks are that it reaches the registry, that a log axis is only ever
 * given to a quantity that cannot be zero or negative by nature
 * (src/model/metricBounds.ts), and that growth conditions stay linear.
 */
import { describe, expect, it } from "vitest";
import { METRICS } from "../../src/model/metrics.ts";
import { relationModel } from "../../src/publish/relationData.ts";
import type { WaferOutcome } from "../../src/judge/outcome.ts";

describe("relation page axes", () => {
  it("marks mobility, densities, τ_q and contaminant peaks log-like, and only non-negative quantities", () => {
    const log = METRICS.filter((m) => m.axis === "log").map((m) => m.key);
    expect(log).toEqual(["peak_mobility", "density_at_peak_mobility", "percolation_density", "quantum_lifetime", "peak_O", "peak_C"]);
    for (const m of METRICS.filter((s) => s.axis === "log")) expect(m.bounds?.min, m.key).toBe(0);
  });

  it("gives each variable of the page its scale: metrics from the registry, growth conditions linear", () => {
    const o = {
      folder: "W-1",
      record: { run: "R", grown: "2025-01-01", growth: { layers: [{ layer: "well", temperature_C: 625, flows_sccm: [] }], anneals: [] } },
      judgement: {
        grade: "qubit",
        verdict: "pass",
        metrics: [
          { key: "peak_mobility", value: 2e5 },
          { key: "well_thickness", value: 9 },
        ],
      },
    } as unknown as WaferOutcome;
    const vars = relationModel([o], () => "").variables.map((v) => [v.key, v.log]);
    expect(vars).toEqual([
      ["peak_mobility", true],
      ["well_thickness", false],
      ["growth_well_temperature", false],
    ]);
  });
});
