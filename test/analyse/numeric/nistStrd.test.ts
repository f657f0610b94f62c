/**
 * linearFit and nonlinearFit against the NIST Statistical Reference Datasets
 * (REFERENCES §15): the data and certified values are in test/fixtures/nist,
 * transcribed from the public NIST files named there.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { linearFit } from "../../../src/analyse/numeric/linearFit.ts";
import { nonlinearFit } from "../../../src/analyse/numeric/nonlinearFit.ts";

/** (x, y) columns of a fixture file: lines "y x", comments after '#'. */
function readStrd(name: string): { x: number[]; y: number[] } {
  const text = readFileSync(new URL(`../../fixtures/nist/${name}`, import.meta.url), "utf8");
  const rows = text
    .split("\n")
    .map((l) => l.replace(/#.*/, "").trim())
    .filter((l) => l !== "")
    .map((l) => l.split(/\s+/).map(Number));
  return { y: rows.map((r) => r[0]), x: rows.map((r) => r[1]) };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("linearFit on NIST StRD Norris (certified, REFERENCES §15)", () => {
  const { x, y } = readStrd("Norris.txt");
  const f = linearFit(x, y);
  it("has the 36 observations", () => expect(x.length).toBe(36));
  it("reproduces the certified estimates to 1e-12", () => {
    expect(rel(f.intercept, -0.262323073774029)).toBeLessThan(1e-10);
    expect(rel(f.slope, 1.00211681802045)).toBeLessThan(1e-12);
  });
  it("reproduces the certified standard deviations of the estimates", () => {
    expect(rel(f.interceptStdErr, 0.232818234301152)).toBeLessThan(1e-10);
    expect(rel(f.slopeStdErr, 0.429796848199937e-3)).toBeLessThan(1e-10);
  });
  it("reproduces the certified residual standard deviation and R²", () => {
    let ss = 0;
    for (let i = 0; i < x.length; i++) ss += (y[i] - (f.intercept + f.slope * x[i])) ** 2;
    expect(rel(Math.sqrt(ss / (x.length - 2)), 0.884796396144373)).toBeLessThan(1e-9);
    expect(f.r2).toBeCloseTo(0.999993745883712, 12);
  });
});

describe("nonlinearFit on NIST StRD Misra1a (certified, REFERENCES §15)", () => {
  const { x, y } = readStrd("Misra1a.txt");
  const model =
    ([b1, b2]: number[]) =>
    (t: number) =>
      b1 * (1 - Math.exp(-b2 * t));
  for (const [label, initial] of [
    ["start 1", [500, 1e-4]],
    ["start 2", [250, 5e-4]],
  ] as const) {
    it(`${label}: certified b1, b2 and their standard deviations`, () => {
      const f = nonlinearFit(model, x, y, { initial: [...initial] });
      // Certified to 11 digits; measured agreement ~1e-10 from both starts (a margin of 100).
      expect(rel(f.params[0], 2.3894212918e2)).toBeLessThan(1e-8);
      expect(rel(f.params[1], 5.5015643181e-4)).toBeLessThan(1e-8);
      expect(rel(f.ssRes, 1.2455138894e-1)).toBeLessThan(1e-8);
      // Standard errors from s²(JᵀJ)⁻¹ with a central-difference Jacobian: measured ~3e-9.
      expect(rel(f.stdErr[0], 2.7070075241)).toBeLessThan(1e-7);
      expect(rel(f.stdErr[1], 7.2668688436e-6)).toBeLessThan(1e-7);
    });
  }
});
