// Western Electric rules, REFERENCES §13: Western Electric Co., Statistical Quality Control Handbook (1956),
// as quoted in Montgomery & Runger [C]; 9-point variant of rule 4 [C]. d₂ = 1.128 from memory [M].
// Every sequence starts with the baseline +0.564, −0.564, +0.564, −0.564 (indices 0–3):
// CL = 0 and each moving range is 1.128, so σ̂ = 1.128/1.128 = 1 exactly and the zone edges are ±1, ±2, ±3.
// The baseline alternates sides and stays within 1σ, so it triggers nothing by itself.
import { describe, expect, it } from "vitest";
import { controlChart } from "../../src/judge/controlChart.ts";
import { describeRule, westernElectric, type WesternElectricOptions } from "../../src/judge/westernElectric.ts";

const BASE = [0.564, -0.564, 0.564, -0.564];

function flags(tail: number[], options?: WesternElectricOptions): Record<number, number[]> {
  const c = controlChart(
    [...BASE, ...tail].map((value, i) => ({ id: `W${i}`, value })),
    { first: 4 },
  );
  if (!c.ok) throw new Error(c.reason);
  expect(c.limits.sigma).toBe(1);
  const r = westernElectric(c, options);
  expect(r.points).toHaveLength(BASE.length + tail.length);
  return Object.fromEntries(r.flagged.map((p) => [p.index, p.rules]));
}

describe("Western Electric rule 1: one point beyond 3σ", () => {
  it("flags 3.01 (beyond UCL = 3) and −3.2 (beyond LCL = −3)", () => {
    expect(flags([3.01, 0.2, -3.2, 0.1])).toEqual({ 4: [1], 6: [1] });
  });
  it("near miss: exactly 3.0 is on the limit, not beyond; alone it breaks no rule", () => {
    expect(flags([3.0, 0.2, -0.3])).toEqual({});
  });
});

describe("Western Electric rule 2: 2 of 3 consecutive beyond 2σ, same side", () => {
  it("flags the two beyond-2σ points of the window, not the middle one", () => {
    // Window indices 4–6 = 2.5, 0.1, 2.2: two points > 2 above → flag 4 and 6 only.
    expect(flags([2.5, 0.1, 2.2, -0.2])).toEqual({ 4: [2], 6: [2] });
  });
  it("works below the centre line too", () => {
    expect(flags([-2.1, -2.9, 0.4])).toEqual({ 4: [2], 5: [2] });
  });
  it("near miss: the two points are 4 apart, never in one window of 3", () => {
    expect(flags([2.5, 0.1, -0.1, 2.2, -0.2])).toEqual({});
  });
  it("near miss: opposite sides do not combine", () => {
    expect(flags([2.5, -2.5, 0.1])).toEqual({});
  });
  it("a point beyond 3σ also counts as beyond 2σ", () => {
    expect(flags([3.5, 2.5, -0.1])).toEqual({ 4: [1, 2], 5: [2] });
  });
});

describe("Western Electric rule 3: 4 of 5 consecutive beyond 1σ, same side", () => {
  it("flags the four beyond-1σ points of the window, not the fifth", () => {
    // Window 4–8 = 1.5, 1.2, 0.3, 1.8, 1.1: four > 1 above → flag 4, 5, 7, 8; index 6 (0.3) not flagged.
    expect(flags([1.5, 1.2, 0.3, 1.8, 1.1, -0.4])).toEqual({ 4: [3], 5: [3], 7: [3], 8: [3] });
  });
  it("works below", () => {
    expect(flags([-1.5, -1.2, -1.3, -1.8, 0.4])).toEqual({ 4: [3], 5: [3], 6: [3], 7: [3] });
  });
  it("near miss: only 3 of every 5 beyond 1σ", () => {
    // Windows 4–8 = 1.5,1.2,0.3,1.8,0.9 (3 hits) and 5–9 = 1.2,0.3,1.8,0.9,1.1 (3 hits).
    expect(flags([1.5, 1.2, 0.3, 1.8, 0.9, 1.1, -0.2])).toEqual({});
  });
  it("near miss: values exactly on +1σ are not beyond it", () => {
    expect(flags([1.5, 1.0, 1.2, 1.8, 1.0, -0.2])).toEqual({});
  });
});

describe("Western Electric rule 4: a run on one side of the centre line", () => {
  const eightAbove = [0.5, 0.2, 0.7, 0.1, 0.4, 0.3, 0.6, 0.2];
  it("flags every point of a run of 8 (default run length)", () => {
    // The baseline ends below (−0.564), so the run is exactly indices 4–11.
    const f = flags([...eightAbove, -0.3]);
    expect(Object.keys(f).map(Number)).toEqual([4, 5, 6, 7, 8, 9, 10, 11]);
    expect(Object.values(f).every((r) => r.length === 1 && r[0] === 4)).toBe(true);
  });
  it("near miss: 7 on one side then a crossing", () => {
    expect(flags([...eightAbove.slice(0, 7), -0.3, 0.2])).toEqual({});
  });
  it("a point exactly on the centre line breaks the run", () => {
    expect(flags([0.5, 0.2, 0.7, 0.1, 0, 0.4, 0.3, 0.6, 0.2])).toEqual({});
  });
  it("with the 9-point variant, 8 in a row is not enough but 9 is", () => {
    expect(flags([...eightAbove, -0.3], { runLength: 9 })).toEqual({});
    expect(Object.keys(flags([...eightAbove, 0.1, -0.3], { runLength: 9 }))).toHaveLength(9);
  });
  it("rejects a nonsensical run length as a programming error", () => {
    const c = controlChart([1, 2, 3].map((value, i) => ({ id: `${i}`, value })));
    if (!c.ok) throw new Error(c.reason);
    expect(() => westernElectric(c, { runLength: 1 })).toThrow(RangeError);
  });
});

describe("describeRule", () => {
  it("names the run length", () => {
    expect(describeRule(4, 9)).toContain("9");
    expect(describeRule(1)).toContain("3σ");
  });
});
