// Phase I control limits (src/judge/phaseOne.ts, src/judge/trends.ts). Method: Montgomery, Introduction to
// Statistical Quality Control, Phase I trial limits revised after removing out-of-control points
// (REFERENCES §13 [C]); individuals chart σ̂ = MR̄/1.128 (REFERENCES §13, d₂ from memory [M]). Every
// expected number is worked out here from those formulas, with nothing imported from src/ to compute it.
import { describe, expect, it } from "vitest";
import { phaseOneLimits } from "../../src/judge/phaseOne.ts";
import { trendChart, trendGroups, type TrendInput } from "../../src/judge/trends.ts";
import { readTrendSettings, type TrendSettings } from "../../src/validate/trendSettings.ts";
import { InputError } from "../../src/model/problem.ts";

const day = (i: number) => `2025-${String(1 + Math.floor(i / 28)).padStart(2, "0")}-${String(1 + (i % 28)).padStart(2, "0")}`;

/** Individuals-chart limits written out from REFERENCES §13: mean, MR̄ of consecutive points, σ̂ = MR̄/1.128. */
function handLimits(xs: number[]) {
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  let mr = 0;
  for (let i = 1; i < xs.length; i++) mr += Math.abs(xs[i] - xs[i - 1]);
  const sigma = mr / (xs.length - 1) / 1.128;
  return { mean, sigma, ucl: mean + 3 * sigma, lcl: mean - 3 * sigma };
}

// 15 in-control interface widths (nm) around 1.40 with alternating-sign deviations (no run of 8 on one side).
const DEV = [0.3, -0.5, 0.8, -0.2, 0.1, -0.7, 0.4, -0.1, 0.6, -0.4, 0.2, -0.6, 0.5, -0.3, 0.05];
const NORMAL = DEV.map((d) => 1.4 + 0.1 * d);
const ALL: TrendSettings = { baseline: { kind: "all" }, runLength: 8 };

function withOutlier(at: number, value: number): TrendInput[] {
  const vals = [...NORMAL.slice(0, at), value, ...NORMAL.slice(at)];
  return vals.map((v, i) => ({ id: `W${String(i).padStart(2, "0")}`, date: day(i), value: v, grade: "qubit", reactor: "Heron" }));
}

describe("hold-out: 15 in-control wafers plus one outlier", () => {
  const inputs = withOutlier(2, 5.71);

  it("flags only the outlier, and the limits are those of the 15 in-control wafers", () => {
    const t = trendChart(inputs, ALL);
    expect(t.ok).toBe(true);
    if (!t.ok) return;
    expect(t.points.filter((p) => p.rules.length).map((p) => p.id)).toEqual(["W02"]);
    expect(t.points.find((p) => p.id === "W02")!.rules).toEqual([1]);
    const hand = handLimits(NORMAL);
    expect(t.limits.centreLine).toBeCloseTo(hand.mean, 10);
    expect(t.limits.sigma).toBeCloseTo(hand.sigma, 10);
    expect(t.dropped.map((d) => [d.id, d.pass, d.side])).toEqual([["W02", 1, "above"]]);
    expect(t.passes).toBe(1);
    expect(t.points.find((p) => p.id === "W02")!.role).toBe("dropped");
  });

  it("without Phase I revision (max_passes 0) the outlier inflates the limits — the false-alarm case this fixes", () => {
    const t = trendChart(inputs, { ...ALL, maxPasses: 0 });
    expect(t.ok).toBe(true);
    if (!t.ok) return;
    // Trial limits from all 16 points (hand formula): the centre line moves up by (5.71 − 1.40)/16 ≈ 0.27 nm.
    const hand = handLimits(inputs.map((p) => p.value));
    expect(t.limits.centreLine).toBeCloseTo(hand.mean, 10);
    expect(hand.mean).toBeGreaterThan(Math.max(...NORMAL));
    // Every in-control wafer now sits below the centre line: rule 4 flags all of them.
    expect(t.points.filter((p) => p.rules.includes(4)).length).toBeGreaterThanOrEqual(8);
  });
});

describe("who forms the baseline", () => {
  it("error wafers, non-production grades and the lab's exclusions stay out, are plotted and not judged", () => {
    const inputs = withOutlier(15, 1.4).map((p, i) => (i === 3 ? { ...p, error: true, value: 9 } : i === 5 ? { ...p, grade: "test", value: 0.2 } : p));
    const settings: TrendSettings = {
      ...ALL,
      exclude: [
        { wafer: "W07", metric: "interface_width_top", reason: "SIMS crater off-centre" },
        { wafer: "W08", metric: "peak_O", reason: "other metric only" },
      ],
    };
    const t = trendChart(inputs, settings, { metric: "interface_width_top", productionGrades: new Set(["qubit"]) });
    expect(t.ok).toBe(true);
    if (!t.ok) return;
    const byId = new Map(t.points.map((p) => [p.id, p]));
    expect(byId.get("W03")!.role).toBe("left-out");
    expect(byId.get("W03")!.note).toContain("input errors");
    expect(byId.get("W05")!.note).toContain("grade test is not a production grade");
    expect(byId.get("W07")!.note).toBe("excluded by the lab: SIMS crater off-centre");
    expect(byId.get("W08")!.role).toBe("baseline"); // its exclusion names another metric
    for (const id of ["W03", "W05", "W07"]) expect(byId.get(id)!.rules).toEqual([]);
    // Limits from the 13 remaining points, in time order (hand formula).
    const kept = inputs.filter((p) => !["W03", "W05", "W07"].includes(p.id)).map((p) => p.value);
    expect(t.limits.centreLine).toBeCloseTo(handLimits(kept).mean, 10);
    expect(t.limits.sigma).toBeCloseTo(handLimits(kept).sigma, 10);
    expect(t.flagged).toBe(0);
  });

  it("the first N counts eligible wafers only", () => {
    const inputs = withOutlier(15, 1.4).map((p, i) => (i === 0 ? { ...p, grade: "test" } : p));
    const t = trendChart(inputs, { ...ALL, baseline: { kind: "first", count: 4 } }, { productionGrades: new Set(["qubit"]) });
    expect(t.ok && t.points.filter((p) => p.inBaseline).map((p) => p.id)).toEqual(["W01", "W02", "W03", "W04"]);
  });
});

describe("revisions and bounds", () => {
  it("stops after max_passes and says points were still beyond", () => {
    // 20 points alternating 9.9/10.1, with 40 after the 5th and 11.2 after the 12th. With 40 in, 11.2 lies
    // inside the trial limits; with 40 dropped, it lies beyond the revised ones (hand checks below).
    const alt = Array.from({ length: 20 }, (_, i) => (i % 2 ? 10.1 : 9.9));
    const vals = [...alt.slice(0, 5), 40, ...alt.slice(5, 12), 11.2, ...alt.slice(12)];
    const series = vals.map((v, i) => ({ id: `P${i}`, value: v }));
    expect(11.2).toBeLessThan(handLimits(vals).ucl);
    expect(11.2).toBeGreaterThan(handLimits(vals.filter((v) => v !== 40)).ucl);
    const one = phaseOneLimits(series, 1);
    expect(one.ok && one.dropped.map((d) => d.id)).toEqual(["P5"]);
    expect(one.ok && one.stoppedAtLimit).toBe(true);
    const two = phaseOneLimits(series, 3);
    expect(two.ok && two.dropped.map((d) => [d.id, d.pass])).toEqual([
      ["P5", 1],
      ["P13", 2],
    ]);
    expect(two.ok && two.stoppedAtLimit).toBe(false);
    expect(two.ok && two.limits.centreLine).toBeCloseTo(handLimits(alt).mean, 12);
  });

  it("clips a negative lower limit at zero for a quantity that cannot be negative, keeping the formula's value", () => {
    // 0.2, 1.8, 0.2, 1.8: mean 1.0, MR̄ 1.6, σ̂ = 1.6/1.128 = 1.41844; LCL = 1 − 4.25532 = −3.25532 (hand).
    const r = phaseOneLimits(
      [0.2, 1.8, 0.2, 1.8].map((v, i) => ({ id: `Q${i}`, value: v })),
      3,
      { min: 0 },
    );
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.limits.lcl).toBe(0);
    expect(r.clipped?.lcl).toBeCloseTo(1 - (3 * 1.6) / 1.128, 10);
    expect(r.limits.ucl).toBeCloseTo(1 + (3 * 1.6) / 1.128, 10);
    expect(r.clipped?.ucl).toBeUndefined();
    const fraction = phaseOneLimits(
      [0.5, 0.9, 0.5, 0.9].map((v, i) => ({ id: `F${i}`, value: v })),
      3,
      { min: 0, max: 1 },
    );
    expect(fraction.ok && fraction.limits.ucl).toBe(1);
  });
});

describe("limits per reactor", () => {
  it("two reactors at different levels: one set of limits flags runs, separate limits do not", () => {
    const heron = NORMAL.slice(0, 9).map((v, i) => ({ id: `H${i}`, date: day(2 * i), value: v, reactor: "Heron" }));
    const kite = NORMAL.slice(0, 9).map((v, i) => ({ id: `K${i}`, date: day(2 * i + 1 + 40), value: v + 1, reactor: "Kite" }));
    const inputs = [...heron, ...kite];
    // Pooled trial limits (no revision): Heron all below the pooled centre line, Kite all above → rule 4.
    const pooled = trendGroups(inputs, { ...ALL, maxPasses: 0 });
    expect(pooled.length).toBe(1);
    expect(pooled[0].ok ? pooled[0].flagged : -1).toBeGreaterThanOrEqual(16);
    const split = trendGroups(inputs, { ...ALL, limitsBy: "reactor" });
    expect(split.map((g) => g.group)).toEqual(["Heron", "Kite"]);
    expect(split.map((g) => (g.ok ? g.flagged : -1))).toEqual([0, 0]);
    expect(split[1].ok && split[1].limits.centreLine).toBeCloseTo(handLimits(NORMAL.slice(0, 9)).mean + 1, 10);
  });
});

describe("trend settings: the Phase I keys", () => {
  const read = (raw: unknown) => readTrendSettings(raw, "targets.yaml", () => 7, ["qubit", "test"]);
  it("reads production grades, passes, grouping and exclusions", () => {
    expect(
      read({
        production_grades: ["qubit"],
        max_passes: 2,
        limits_by: "reactor",
        exclude: [{ wafer: "TQ-2403", metric: "interface_width_top", reason: "crater" }],
      }),
    ).toMatchObject({
      productionGrades: { kind: "list", grades: ["qubit"] },
      maxPasses: 2,
      limitsBy: "reactor",
      exclude: [{ wafer: "TQ-2403", metric: "interface_width_top", reason: "crater" }],
    });
    expect(read({ production_grades: "all" }).productionGrades).toEqual({ kind: "all" });
  });
  it("refuses bad values with a located problem", () => {
    const problem = (raw: unknown) => {
      try {
        read(raw);
      } catch (e) {
        if (e instanceof InputError) return e.problem;
      }
      return undefined;
    };
    expect(problem({ production_grades: ["qbit"] })).toMatchObject({ field: "trends.production_grades", line: 7, fix: 'did you mean "qubit"?' });
    expect(problem({ max_passes: -1 })).toMatchObject({ field: "trends.max_passes" });
    expect(problem({ limits_by: "reactr" })).toMatchObject({ field: "trends.limits_by", fix: 'did you mean "reactor"?' });
    expect(problem({ exclude: [{ wafer: "TQ-1" }] })).toMatchObject({ field: "trends.exclude[0].reason" });
    expect(problem({ exclude: [{ wafer: "TQ-1", reason: "x", metric: "nope_metric" }] })).toMatchObject({ field: "trends.exclude[0].metric" });
  });
});
