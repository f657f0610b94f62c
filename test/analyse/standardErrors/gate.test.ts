import { describe, expect, it } from "vitest";
import { densityCalibration } from "../../../src/analyse/transport/densityCalibration.ts";
import { gaussian } from "../../helpers/random.ts";
import { monteCarloSpread } from "./monteCarlo.ts";

describe("gate calibration standard errors against a Monte Carlo spread (400 draws)", () => {
  it("σ(V_on) and σ(C) within 25 % of the spread of fits to noisy densities", () => {
    // Parallel-plate gate n = C(Vg − V_on)/e (REFERENCES §6 context; e exact, SI 2019), 1 % noise on n.
    const e = 1.602176634e-19;
    const [c, vOn] = [5e-4, 0.3];
    const vg = [0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3, 1.4];
    const g = gaussian(17);
    const fits = Array.from({ length: 400 }, () => {
      const r = densityCalibration(
        vg,
        vg.map((v) => ((c * (v - vOn)) / e) * (1 + 0.01 * g())),
      );
      if (!r.ok || r.turnOnVoltageStdErr === null || r.capacitanceStdErr === null) throw new Error("no fit");
      return r;
    });
    // 400 draws: the sample SD is known to ±3.5 %; 25 % leaves room for the s.e.'s own scatter (7 points).
    const von = monteCarloSpread(400, (i) => ({ value: fits[i].turnOnVoltage, stdErr: fits[i].turnOnVoltageStdErr! }));
    const cap = monteCarloSpread(400, (i) => ({ value: fits[i].capacitance, stdErr: fits[i].capacitanceStdErr! }));
    for (const m of [von, cap]) {
      expect(m.ratio).toBeGreaterThan(0.75);
      expect(m.ratio).toBeLessThan(1.25);
    }
  });
});
