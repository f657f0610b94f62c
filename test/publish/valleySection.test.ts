// The "valley splitting (predicted)" part of the structure section: what the page model carries.
import { describe, expect, it } from "vitest";
import type { StructureAnalysis } from "../../src/analyse/structure/index.ts";
import type { InterfaceFit } from "../../src/analyse/structure/depthProfile.ts";
import { predictValleySplitting } from "../../src/analyse/structure/valleySplitting.ts";
import { valleySection } from "../../src/publish/valleySection.ts";

const E = 1.602176634e-19;
const edge = (centre: number, tau: number): InterfaceFit => ({
  centre,
  centreStdErr: 0,
  tau,
  width10to90: 4.39 * tau,
  width10to90StdErr: 0,
  width4tau: 4 * tau,
  barrierGe: 0.3,
  r2: 1,
  points: 50,
  curve: { depth: [], ge: [] },
  marks: [],
});
const L = (u: number) => 1 / (1 + Math.exp(-u));

function section(spike: boolean) {
  const depth = Array.from({ length: 800 }, (_, i) => i * 0.1);
  const ge = depth.map((d) => 0.3 - 0.3 * L((d - 40) / 0.08) + 0.3 * L((d - 50) / 0.3) + (spike ? 0.05 * Math.exp(-(((d - 45) / 0.3) ** 2)) : 0));
  const result = predictValleySplitting(
    { depth, ge, top: edge(40, 0.08), bottom: edge(50, 0.3) },
    { field: null, orbitalEnergy: 2e-3 * E, bandOffset: 0.5 * E, threshold: 100e-6 * E },
  );
  const s = { valley: { file: "profiles/apt.csv", result } } as unknown as StructureAnalysis;
  return valleySection(s, { depth, ge })!;
}

describe("valleySection page model", () => {
  it("has the two charts (layers with |ψ|², E_v density with the threshold marked), the five figures in µeV and % plus the disorder-only mean, the settings and the caution", () => {
    const v = section(false);
    expect(v.charts.map((c) => c.id)).toEqual(["valley-layers", "valley-distribution"]);
    expect(v.charts[1].limits).toEqual([{ axis: "x", min: 100, label: "threshold 100 µeV" }]);
    expect(v.charts[0].series.map((s) => s.label).join(" | ")).toMatch(/measured.*model.*\|ψ\|²/);
    expect(v.figures).toHaveLength(6);
    expect(v.figures.filter((f) => !f.label.startsWith("Yield")).every((f) => f.value.endsWith(" µeV"))).toBe(true);
    expect(v.figures.find((f) => f.label.startsWith("Yield"))!.value).toMatch(/ %$/);
    // Disorder alone: the Rayleigh mean √(2π)·σ (the Rayleigh distribution's mean, any statistics text), worked from the σ row.
    const sigma = Number(v.figures.find((f) => f.label.startsWith("Disorder σ"))!.value.replace(" µeV", ""));
    const alone = Number(v.figures.find((f) => f.label.startsWith("Disorder alone"))!.value.replace(" µeV", ""));
    expect(alone / sigma).toBeCloseTo(2.5066, 2);
    expect(v.caution).toMatch(/depth zero/);
    expect(v.settings.find((r) => r.label.startsWith("Vertical field"))!.value).toContain("5.00 MV/m (default");
    expect(v.caution).toMatch(/not a measurement/);
    expect(v.caution).toMatch(/magnetospectroscopy/);
    expect(v.departure).toBeUndefined();
    // Page weight: the plotted envelope stays at the layers (< 200 points here).
    expect(v.charts[0].series.every((s) => s.points.length <= 400)).toBe(true);
  });
  it("names a spike that is not in the prediction", () => {
    expect(section(true).departure).toMatch(/departs from the two-interface model.*not in the prediction/);
  });
});
