// Zero-field gate sweeps recorded without a Hall column (Vg and Rxx, or Vxx with a current) are read
// and used for percolation and hysteresis; only field sweeps need Rxy (the Hall effect). All values invented.
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { readTable } from "../../src/read/table.ts";
import { validateSweep } from "../../src/validate/sweep.ts";
import { analyseFolder } from "../../src/cli/analyseFolder.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { formatSweep, hallSweepRows } from "../../src/synth/hallSweep.ts";
import { InputError } from "../../src/model/problem.ts";

const message = (f: () => unknown) => {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e.message;
    throw e;
  }
  throw new Error("no InputError");
};

describe("validateSweep: which columns a sweep needs", () => {
  it("a Hall-bar gate sweep with only Vg and Rxx", () => {
    const s = validateSweep(readTable("# field: 0 T\nVg [V],Rxx [ohm]\n0.5,900\n0.6,700\n0.7,600\n", "g.csv"), "hall-bar");
    expect(s.kind).toBe("gate");
    expect(s.rxy).toBeUndefined();
    expect(Array.from(s.rxx!)).toEqual([900, 700, 600]);
  });
  it("Vxx with a current: R = V/I (Ohm's law)", () => {
    const s = validateSweep(readTable("# field: 0 T\n# current: 10 nA\nVg [V],Vxx [uV]\n0.7,6\n0.6,7\n0.5,9\n", "g.csv"), "hall-bar");
    // 6 µV / 10 nA = 600 Ω (by hand)
    expect(s.rxx![0]).toBeCloseTo(600, 9);
    expect(s.direction).toBe("down");
  });
  it("a van der Pauw gate sweep with Ra and Rb only", () => {
    const s = validateSweep(readTable("# field: 0 T\nVg [V],Ra [ohm],Rb [ohm]\n0.5,900,700\n0.6,700,500\n", "g.csv"), "van-der-pauw");
    expect(s.rxy).toBeUndefined();
  });
  it("a gate sweep still needs its longitudinal resistance", () => {
    expect(message(() => validateSweep(readTable("# field: 0 T\nVg [V],Rxy [ohm]\n0.5,1\n0.6,2\n", "g.csv"), "hall-bar"))).toBe(
      "g.csv:2: missing a column a hall-bar gate sweep needs (expected Rxx (or Vxx with a current), found Vg, Rxy) — add the missing column, or check the device geometry in wafer.md",
    );
    expect(message(() => validateSweep(readTable("# field: 0 T\nVg [V],Ra [ohm]\n0.5,1\n0.6,2\n", "g.csv"), "van-der-pauw"))).toMatch(/expected Ra and Rb,/);
  });
  it("a field sweep without Rxy is still refused: the Hall analysis needs it", () => {
    expect(message(() => validateSweep(readTable("# gate: 0.5 V\nB [T],Rxx [ohm]\n-1,2\n1,2\n", "f.csv"), "hall-bar"))).toMatch(
      /missing a column a hall-bar needs \(expected Rxx and Rxy/,
    );
  });
});

describe("a wafer whose gate sweeps have no Rxy column", () => {
  const tmps: string[] = [];
  afterAll(() => Promise.all(tmps.map((t) => fs.rm(t, { recursive: true, force: true }))));

  it("is analysed (no error), with the percolation density and the hysteresis it was built with", async () => {
    const data = await fs.mkdtemp(path.join(os.tmpdir(), "wb-zero-field-"));
    tmps.push(data);
    const dir = path.join(data, "wafers", "ZF-1");
    await fs.mkdir(path.join(dir, "t"), { recursive: true });
    await fs.writeFile(
      path.join(dir, "wafer.md"),
      '---\nwafer: ZF-1\nrun: R1\ngrown: 2025-01-15\ndevices:\n  - id: D1\n    geometry: hall-bar\n    length_um: 80\n    width_um: 20\n    files: "t/*.csv"\n---\n',
    );
    // Parallel-plate gate: n = (C/e)(Vg − V_on), dn/dVg = 5.6e15 m⁻²/V, V_on = 0.3 V (REFERENCES §9 model; values invented).
    const density = (vg: number) => 5.6e15 * (vg - 0.3);
    for (const [i, vg] of [0.6, 0.9, 1.2].entries()) {
      const rows = hallSweepRows({
        density: density(vg),
        mobility: 10,
        geometry: "hall-bar",
        length_um: 80,
        width_um: 20,
        maxField: 0.5,
        points: 101,
        noise: 1e-5,
        seed: 7 + i,
      });
      await fs.writeFile(path.join(dir, "t", `field${i}.csv`), formatSweep({ gate: `${vg} V` }, rows));
    }
    // Percolation law σ = A(n − n_p)^p, p = 1.31 (REFERENCES §8), n_p = 4.5e14 m⁻²; insulating (open circuit) below n_p.
    // Hall bar: R_xx = ρ·L/W = 4/σ. The down sweep is the up sweep moved by +0.03 V (hysteresis, down − up).
    const NP = 4.5e14;
    const A = 6.2e-3 / (3e15 - NP) ** 1.31;
    const rxx = (vg: number) => (density(vg) > NP ? 4 / (A * (density(vg) - NP) ** 1.31) : 1e12);
    const vgs = Array.from({ length: 96 }, (_, k) => Number((0.32 + 0.01 * k).toFixed(2)));
    await fs.writeFile(path.join(dir, "t", "gate_up.csv"), "# field: 0 T\nVg [V],Rxx [ohm]\n" + vgs.map((v) => `${v},${rxx(v)}`).join("\n") + "\n");
    // Recorded as a voltage with the current, 10 nA: V_xx[µV] = R_xx·1e-8·1e6.
    const down = [...vgs].reverse();
    await fs.writeFile(
      path.join(dir, "t", "gate_down.csv"),
      "# field: 0 T\n# current: 10 nA\nVg [V],Vxx [uV]\n" + down.map((v) => `${v},${rxx(v - 0.03) * 1e-2}`).join("\n") + "\n",
    );

    const r = await analyseFolder("ZF-1", { dataDir: data, today: "2026-01-01", siteSettings: DEFAULT_SETTINGS, cacheDir: null, code: "" });
    expect(r.entry.problems.filter((p) => p.severity === "error")).toEqual([]);
    const device = r.entry.analysis!.devices[0];
    expect(device.gateSweeps.length).toBe(2);
    // n_p = 4.5e14 m⁻² = 4.5e10 cm⁻² (built in above), noise-free data: within 3 %.
    expect(Math.abs(device.metrics.percolation_density / 4.5e10 - 1)).toBeLessThan(0.03);
    // The 0.03 V shift built in above, within 10 % (the insulating side is left out).
    expect(Math.abs(device.metrics.gate_hysteresis / 0.03 - 1)).toBeLessThan(0.1);
  });
});
