/**
 * The Shubnikov–de Haas fit (oscillationFit.ts) through the whole per-point
 * path — both field signs with contact mixing → analyseFieldSweep
 * (symmetrisation, Hall density) → analysePointDepth (spectrum, fit, Hall–SdH
 * mismatch) — on sweeps from the independent generator in
 * test/helpers/lifshitzKosevich.ts (which imports nothing from src/).
 */
import { describe, expect, it } from "vitest";
import { analyseFieldSweep, type TransportPoint } from "../../../src/analyse/transport/fieldSweep.ts";
import { analysePointDepth, type PointDepth } from "../../../src/analyse/transport/deviceDepth.ts";
import { fitOscillations } from "../../../src/analyse/transport/oscillationFit.ts";
import { hallSdhMismatch } from "../../../src/analyse/transport/shubnikovDeHaas.ts";
import { DEFAULT_SETTINGS, type AnalysisSettings } from "../../../src/validate/settings.ts";
import type { Sweep } from "../../../src/validate/sweep.ts";
import { lkDingle, lkFrequency, lkSweep, lkThermal, rng, type LkParams } from "../../helpers/lifshitzKosevich.ts";

const POINTS = 3001;
const DEVICE = { geometry: "hall-bar" as const, length_um: 1, width_um: 1 };

interface Case {
  p: LkParams;
  window: [number, number];
  maxField: number;
  mixing: number;
  noise: number;
  seed: number;
}

/**
 * One random case: density 1–6e11 cm⁻², τ_q 0.3–2 ps (log-uniform), T 0.3–2 K,
 * noise 1e-4–5e-4 of ρ0, mixing 0–5 %, background slope of either sign, spin
 * factor (g = 2) and second harmonic. The top of the window is where the
 * fundamental's relative amplitude reaches 0.05–0.5 (the small-amplitude form
 * holds); the window holds 3.2–15 periods, all with an amplitude ≥ 3× the
 * noise and ≥ 10 samples per period (what a lab would choose).
 */
function drawCase(uniform: () => number, seed: number): Case | null {
  const U = (a: number, b: number) => a + (b - a) * uniform();
  const mass = 0.19;
  const p: LkParams = {
    density: U(1, 6) * 1e15,
    tauQ: Math.exp(U(Math.log(0.3), Math.log(2))) * 1e-12,
    temperature: U(0.3, 2),
    mass,
    rho0: U(200, 2000),
    slope: (uniform() < 0.5 ? -1 : 1) * U(0.002, 0.04),
    g: 2,
    harmonic: true,
  };
  const f = lkFrequency(p.density);
  const amp = (b: number) => 4 * lkThermal(p.temperature, b, mass) * lkDingle(p.tauQ, b, mass) * Math.cos((Math.PI * p.g * mass) / 2);
  const target = U(0.05, 0.5);
  let lo = 0.3;
  let hi = 12;
  for (let i = 0; i < 50; i++) {
    const m = (lo + hi) / 2;
    if (amp(m) < target) lo = m;
    else hi = m;
  }
  const maxField = hi;
  if (p.slope < 0 && 1 + p.slope * maxField < 0.6) p.slope = -0.4 / maxField;
  const noise = Math.exp(U(Math.log(1e-4), Math.log(5e-4)));
  let visible = maxField;
  for (let b = maxField; b > 0.05 && amp(b) >= 3 * noise; b *= 0.995) visible = b;
  const lowest = Math.max(visible, Math.sqrt((10 * f * 2 * maxField) / (POINTS - 1)));
  const most = Math.min(15, f * (1 / lowest - 1 / maxField));
  if (most < 3.3) return null;
  const periods = U(3.2, most);
  return { p, window: [1 / (1 / maxField + periods / f), maxField], maxField, mixing: U(0, 0.05), noise, seed };
}

function sweepOf(c: Case): Sweep {
  const s = lkSweep(c.p, c.maxField, POINTS, c.mixing, c.noise, c.seed);
  return {
    file: `case${c.seed}.csv`,
    kind: "field",
    geometry: "hall-bar",
    x: s.B,
    rxx: s.rxx,
    rxy: s.rxy,
    direction: "up",
    rows: POINTS,
    warnings: [],
    temperature_K: c.p.temperature,
    gate_V: 0,
  };
}

function analyse(c: Case, over: Partial<AnalysisSettings> = {}): { point: TransportPoint; depth: PointDepth } {
  const settings = { ...DEFAULT_SETTINGS, sdh_min_field: c.window[0], sdh_max_field: c.window[1], ...over };
  const r = analyseFieldSweep(sweepOf(c), DEVICE, settings);
  if (!r.ok) throw new Error(r.reason);
  return { point: r.point, depth: analysePointDepth(r.point, settings) };
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("oscillation fit on 200 random noisy sweeps (independent Lifshitz–Kosevich generator)", () => {
  const { uniform } = rng(20261202);
  const cases: Case[] = [];
  for (let seed = 1; cases.length < 200; seed++) {
    const c = drawCase(uniform, seed);
    if (c) cases.push(c);
  }
  const results = cases.map((c) => ({ c, ...analyse(c) }));

  it("τ_q within 10 % and n_SdH within 0.5 % on at least 95 % of the cases; every other case says 'not determined' (REFERENCES §7, §14)", () => {
    let right = 0;
    const wrong: string[] = [];
    for (const { c, depth } of results) {
      const o = depth.oscillation;
      const tq = o.ok && o.quantumLifetime.ok ? o.quantumLifetime.value : undefined;
      // n = g·e·f/h (REFERENCES §7) with the generator's own f = h·n/(4e).
      if (o.ok && rel(o.density.value, c.p.density) > 0.005)
        wrong.push(`case ${c.seed}: n_SdH off by ${(100 * rel(o.density.value, c.p.density)).toFixed(2)} %`);
      if (tq !== undefined && rel(tq, c.p.tauQ) > 0.3) wrong.push(`case ${c.seed}: τ_q off by ${(100 * rel(tq, c.p.tauQ)).toFixed(0)} %`);
      if (o.ok && tq !== undefined && rel(tq, c.p.tauQ) <= 0.1 && rel(o.density.value, c.p.density) <= 0.005) right++;
    }
    expect(wrong).toEqual([]);
    expect(right).toBeGreaterThanOrEqual(190);
  });

  it("reports each figure with a standard error that covers the truth, R², periods and residual noise", () => {
    let covered = 0;
    let fits = 0;
    for (const { c, depth } of results) {
      const o = depth.oscillation;
      if (!o.ok || !o.quantumLifetime.ok) continue;
      fits++;
      // Within 3 standard errors, or within 1 % where the unmodelled higher harmonics dominate the error.
      if (Math.abs(o.quantumLifetime.value - c.p.tauQ) <= Math.max(3 * o.quantumLifetime.stdErr, 0.01 * c.p.tauQ)) covered++;
      expect(o.r2).toBeGreaterThanOrEqual(0.9);
      expect(o.periods).toBeGreaterThanOrEqual(3);
      // Residual noise: the generator's noise is c.noise·ρ0 (more where harmonics s ≥ 3 are left out).
      expect(o.residualNoise).toBeGreaterThan(0.5 * c.noise * c.p.rho0);
    }
    expect(covered).toBeGreaterThanOrEqual(0.9 * fits);
  });

  it("flags no parallel conduction on any one-carrier case (Hall and SdH densities agree within their errors)", () => {
    const flagged = results
      .filter((r) => r.depth.mismatch?.parallelConduction)
      .map((r) => `case ${r.c.seed}: ${r.depth.mismatch!.mismatchPercent.toFixed(2)} ± ${r.depth.mismatch!.stdErrPercent.toFixed(2)} %`);
    expect(flagged).toEqual([]);
  });
});

describe("oscillation fit: rejections, spin splitting, settings", () => {
  const base: Case = {
    p: { density: 3e15, tauQ: 1e-12, temperature: 1, mass: 0.19, rho0: 800, slope: 0.02, g: 2, harmonic: true },
    window: [0.5, 2.5],
    maxField: 2.5,
    mixing: 0.03,
    noise: 2e-4,
    seed: 7,
  };
  it("recovers τ_q and n of a plain case, and its spectrum seed differs from the fitted f", () => {
    const { depth } = analyse(base);
    const o = depth.oscillation;
    expect(o.ok && o.quantumLifetime.ok).toBe(true);
    if (!o.ok || !o.quantumLifetime.ok) return;
    expect(rel(o.quantumLifetime.value, 1e-12)).toBeLessThan(0.03);
    expect(rel(o.density.value, 3e15)).toBeLessThan(0.002);
    // Spin factor cos(π g m*/2) = cos(0.19π) = 0.8271 for g = 2, m* = 0.19 [D from REFERENCES §14]: the free amplitude factor finds it.
    expect(o.amplitudeFactor.value).toBeCloseTo(0.8271, 1);
    // The generator's phase −π (REFERENCES §7): φ = ±π.
    expect(Math.abs(Math.abs(o.phase.value) - Math.PI)).toBeLessThan(0.1);
  });
  it("ends the window below resolved spin splitting and says so (g·m*/m_e ≈ 0.86: the fundamental's spin factor nearly vanishes)", () => {
    const c: Case = { ...base, p: { ...base.p, g: 4.5, tauQ: 2e-12, temperature: 0.3 }, window: [0.3, 3], maxField: 3 };
    const { depth } = analyse(c);
    const o = depth.oscillation;
    expect(o.ok).toBe(true);
    if (!o.ok) return;
    expect(o.spinSplitting?.note).toMatch(/spin-split/);
    expect(o.fieldRange[1]).toBeLessThan(3);
    expect(rel(o.density.value, c.p.density)).toBeLessThan(0.005);
    if (o.quantumLifetime.ok) expect(rel(o.quantumLifetime.value, 2e-12)).toBeLessThan(0.1);
  });
  it("rejects fewer than 3 periods, naming the reason", () => {
    const c: Case = { ...base, window: [1.6, 2.5] };
    const { depth } = analyse(c);
    expect(depth.oscillation.ok).toBe(false);
    if (!depth.oscillation.ok) expect(depth.oscillation.reason).toMatch(/period/);
  });
  it("rejects an R² below the setting and a τ_q whose relative standard error is above the setting", () => {
    const strict = analyse(base, { sdh_min_r2: 0.999999999 }).depth.oscillation;
    expect(strict.ok).toBe(false);
    if (!strict.ok) expect(strict.reason).toMatch(/R²/);
    const tight = analyse(base, { sdh_max_lifetime_error: 0.0001 }).depth.oscillation;
    expect(tight.ok).toBe(true);
    if (tight.ok) {
      expect(tight.quantumLifetime.ok).toBe(false);
      if (!tight.quantumLifetime.ok) expect(tight.quantumLifetime.reason).toMatch(/standard error/);
    }
  });
  it("without a temperature: density from the fit, τ_q not determined", () => {
    const r = analyseFieldSweep({ ...sweepOf(base), temperature_K: undefined }, DEVICE, { ...DEFAULT_SETTINGS, sdh_min_field: 0.5, sdh_max_field: 2.5 });
    if (!r.ok) throw new Error(r.reason);
    const o = analysePointDepth(r.point, { ...DEFAULT_SETTINGS, sdh_min_field: 0.5, sdh_max_field: 2.5 }).oscillation;
    expect(o.ok).toBe(true);
    if (!o.ok) return;
    expect(rel(o.density.value, 3e15)).toBeLessThan(0.005);
    expect(o.quantumLifetime.ok).toBe(false);
  });
  it("a fixed amplitude factor (the ideal form, A = 1) fits a generator without spin factor exactly", () => {
    const c: Case = { ...base, p: { ...base.p, g: 0, harmonic: false } };
    const o = analyse(c, { sdh_amplitude_factor: 1 }).depth.oscillation;
    expect(o.ok && o.quantumLifetime.ok).toBe(true);
    if (!o.ok || !o.quantumLifetime.ok) return;
    expect(o.amplitudeFactor).toMatchObject({ value: 1, fixed: true });
    expect(rel(o.quantumLifetime.value, 1e-12)).toBeLessThan(0.01);
  });
  it("noise only: not determined, never a figure", () => {
    const c: Case = { ...base, p: { ...base.p, tauQ: 1e-14 } };
    const r = analyseFieldSweep(sweepOf(c), DEVICE, DEFAULT_SETTINGS);
    if (!r.ok) throw new Error(r.reason);
    const o = fitOscillations(r.point.trace.b, r.point.trace.rhoxx, 1, 2.9, { minField: 0.5, maxField: 2.5 });
    expect(o.ok).toBe(false);
    expect(() => fitOscillations([1, 2], [1], 1, 1)).toThrow(RangeError);
  });
});

describe("Hall–SdH mismatch with its uncertainty", () => {
  it("flags only beyond the tolerance and three combined standard errors (first-order propagation, common practice)", () => {
    // m = 10 %; σ = 100·1.1·√((0.02/1.1)² + 0.02²) = 2.973 % [D]: 10 > 3σ = 8.92 → flagged
    const a = hallSdhMismatch(1.1e15, 1e15, 5, 0.02e15, 0.02e15);
    expect(a.stdErrPercent).toBeCloseTo(2.973, 3);
    expect(a.parallelConduction).toBe(true);
    // σ doubled: 3σ = 17.8 % > 10 % → not flagged
    expect(hallSdhMismatch(1.1e15, 1e15, 5, 0.04e15, 0.04e15).parallelConduction).toBe(false);
    // within the tolerance: never flagged, however small σ
    expect(hallSdhMismatch(1.04e15, 1e15, 5, 1, 1).parallelConduction).toBe(false);
  });
});
