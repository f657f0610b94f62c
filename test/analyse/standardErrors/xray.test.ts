import { describe, expect, it } from "vitest";
import { bufferRelaxation } from "../../../src/analyse/structure/bufferRelaxation.ts";
import { rsmPeaks } from "../../../src/analyse/structure/rsmPeaks.ts";
import { synthReciprocalSpaceMap } from "../../../src/synth/reciprocalSpaceMap.ts";
import { gaussian } from "../../helpers/random.ts";
import { monteCarloSpread } from "./monteCarlo.ts";

// Buffer Si0.7Ge0.3, R = 0.8 on Si, written out from the published forms (REFERENCES §2–§4):
// Dismukes a_r(x) = 0.5431 + 0.01992x + 0.002733x² nm; a∥ = a_Si + R(a_r − a_Si);
// a⊥ = a_r[1 − D(a∥/a_r − 1)], D = 2C12/C11 with C11 = 165.8 − 37.3x, C12 = 63.9 − 15.6x GPa;
// peak hkl at Qx = 2π√(h²+k²)/a∥, Qz = 2πl/a⊥ (m⁻¹, 2π included).
const x = 0.3;
const aR = (0.5431 + 0.01992 * x + 0.002733 * x * x) * 1e-9;
const aPar = 0.5431e-9 + 0.8 * (aR - 0.5431e-9);
const aPerp = aR * (1 - ((2 * (63.9 - 15.6 * x)) / (165.8 - 37.3 * x)) * (aPar / aR - 1));
const peak = (hkl: [number, number, number]) => ({ hkl, qx: (2 * Math.PI * Math.hypot(hkl[0], hkl[1])) / aPar, qz: (2 * Math.PI * hkl[2]) / aPerp });

describe("X-ray standard errors against a Monte Carlo spread", () => {
  it("bufferRelaxation: σ(x) and σ(R) propagated from σ(Q) match the spread of 400 perturbed peak pairs within 25 %", () => {
    const se = 2e6; // m⁻¹ on each Q component (about 3e-5 of |Q|)
    const g = gaussian(21);
    const fits = Array.from({ length: 400 }, () => {
      const a = peak([2, 2, 4]);
      const s = peak([0, 0, 4]);
      const r = bufferRelaxation({
        asymmetric: { ...a, qx: a.qx + se * g(), qz: a.qz + se * g(), qxStdErr: se, qzStdErr: se },
        symmetric: { ...s, qx: s.qx + se * g(), qz: s.qz + se * g(), qxStdErr: se, qzStdErr: se },
      });
      if (!r.ok) throw new Error(r.reason);
      return r;
    });
    const ge = monteCarloSpread(400, (i) => ({ value: fits[i].geFraction, stdErr: fits[i].geFractionStdErr }));
    const rel = monteCarloSpread(400, (i) => ({ value: fits[i].relaxation, stdErr: fits[i].relaxationStdErr }));
    for (const m of [ge, rel]) {
      expect(m.ratio).toBeGreaterThan(0.75);
      expect(m.ratio).toBeLessThan(1.25);
    }
    expect(ge.mean).toBeCloseTo(0.3, 3);
    expect(rel.mean).toBeCloseTo(0.8, 2);
  });

  it("rsmPeaks: the buffer peak's σ(Qx), σ(Qz) match the spread over 30 Poisson maps within 35 %", () => {
    const DEG = Math.PI / 180;
    const peaks = Array.from({ length: 30 }, (_, i) => {
      const m = synthReciprocalSpaceMap({
        reflection: [2, 2, 4],
        geFraction: 0.3,
        relaxation: 0.8,
        well: false,
        background: 8,
        step: 0.02 * DEG,
        sigmaRocking: 0.024 * DEG,
        sigmaRadial: 0.02 * DEG,
        margin: 0.2 * DEG,
        seed: 500 + i,
      });
      const r = rsmPeaks(m.points, { reflection: [2, 2, 4] });
      if (!r.ok) throw new Error(r.reason);
      const b = r.peaks.find((p) => p.layer === "buffer");
      if (!b) throw new Error("no buffer peak");
      return b;
    });
    // 30 draws: the sample SD scatters by ±13 %, so 35 % is a ~2.7σ margin (fixed seeds).
    // Peaks twice as wide on a twice-coarser grid than the demo (same points per σ, 4× fewer points).
    // Measured: 0.91 (Qx) and 0.84 (Qz); with the pooled s²(JᵀJ)⁻¹ errors the Gaussian fit
    // reported before, about 0.5 — the bug this test found (rsmPeakFind.ts now uses the
    // Poisson sandwich covariance).
    const qx = monteCarloSpread(30, (i) => ({ value: peaks[i].qx, stdErr: peaks[i].qxStdErr }));
    const qz = monteCarloSpread(30, (i) => ({ value: peaks[i].qz, stdErr: peaks[i].qzStdErr }));
    for (const m of [qx, qz]) {
      expect(m.ratio).toBeGreaterThan(0.65);
      expect(m.ratio).toBeLessThan(1.35);
    }
  });
});
