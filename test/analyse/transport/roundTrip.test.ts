import { describe, expect, it } from "vitest";
import { analyseFieldSweep } from "../../../src/analyse/transport/fieldSweep.ts";
import { readTable } from "../../../src/read/table.ts";
import { formatSweep, hallSweepRows } from "../../../src/synth/hallSweep.ts";
import { DEFAULT_SETTINGS } from "../../../src/validate/settings.ts";
import { validateSweep } from "../../../src/validate/sweep.ts";

const rel = (a: number, b: number) => Math.abs(a - b) / b;

/**
 * Round trip: synthetic Drude sweeps (known n and μ) with contact misalignment
 * and noise → file text → parser → analysis. Acceptance: within 0.5 % (issue).
 */
describe("transport round trip", () => {
  const cases = [
    { n: 1e15, mu: 10, geometry: "hall-bar" as const, mis: 0.03 },
    { n: 3.2e15, mu: 14.5, geometry: "hall-bar" as const, mis: -0.02 },
    { n: 0.6e15, mu: 3, geometry: "van-der-pauw" as const, mis: 0.02 },
    { n: 2.4e15, mu: 12, geometry: "van-der-pauw" as const, mis: 0.05 },
  ];
  for (const [i, c] of cases.entries()) {
    it(`recovers n = ${c.n * 1e-4} cm⁻², μ = ${c.mu * 1e4} cm²/Vs (${c.geometry}, misalignment ${c.mis}) within 0.5 %`, () => {
      const rows = hallSweepRows({
        density: c.n,
        mobility: c.mu,
        geometry: c.geometry,
        length_um: 100,
        width_um: 20,
        maxField: 1,
        points: 401,
        misalignment: c.mis,
        noise: 3e-4,
        seed: 11 + i,
        vdpRatio: 1.7,
      });
      const text = formatSweep({ gate: "0.8 V", temperature: "1.6 K", current: "10 nA" }, rows);
      const sweep = validateSweep(readTable(text, "t.csv"), c.geometry);
      const r = analyseFieldSweep(sweep, { geometry: c.geometry, length_um: 100, width_um: 20 }, DEFAULT_SETTINGS);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(rel(r.point.density, c.n)).toBeLessThan(0.005);
      expect(rel(r.point.mobility, c.mu)).toBeLessThan(0.005);
      expect(r.point.hall.r2).toBeGreaterThan(0.999);
      expect(r.point.symmetrised).toBe(true);
    });
  }

  it("symmetrisation removes the misalignment that biases the raw ρxx at finite field", () => {
    // 5 % of Rxy mixed into Rxx: at 1 T the raw reading is far from ρ·L/W, the symmetrised trace is not.
    const c = { n: 1e15, mu: 10 };
    const rows = hallSweepRows({
      density: c.n,
      mobility: c.mu,
      geometry: "hall-bar",
      length_um: 100,
      width_um: 20,
      maxField: 1,
      points: 401,
      misalignment: 0.05,
      noise: 0,
      seed: 1,
    });
    const sweep = validateSweep(readTable(formatSweep({ gate: "0.8 V" }, rows), "t.csv"), "hall-bar");
    const r = analyseFieldSweep(sweep, { geometry: "hall-bar", length_um: 100, width_um: 20 }, DEFAULT_SETTINGS);
    if (!r.ok) throw new Error(r.reason);
    const rhoTrue = 1 / (c.n * 1.602176634e-19 * c.mu); // Drude ρ = 1/(n e μ) (REFERENCES §6)
    const rawAt1T = (rows.rows[rows.rows.length - 1][1] * 20) / 100;
    const symAt1T = r.point.trace.rhoxx[r.point.trace.rhoxx.length - 1];
    expect(Math.abs(rawAt1T - rhoTrue) / rhoTrue).toBeGreaterThan(0.05);
    expect(Math.abs(symAt1T - rhoTrue) / rhoTrue).toBeLessThan(0.001);
  });
});
