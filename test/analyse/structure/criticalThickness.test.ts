import { describe, expect, it } from "vitest";
import { compareWithCritical, matthewsBlakeslee, peopleBean } from "../../../src/analyse/structure/criticalThickness.ts";
import { A_SI, latticeDismukes, poissonRatio, strainedSiOnRelaxedSiGe } from "../../../src/physics/sige.ts";

// Convention pinned by these checks (REFERENCES §5, [D]): misfit ε = (a_SiGe − a_Si)/a_Si with Dismukes a(x),
// b = a_layer/√2, ν = C12/(C11+C12) of the layer (MB); People–Bean with ν = 0.28, b = 4 Å, a = a_layer.
const thick = (r: ReturnType<typeof matthewsBlakeslee>) => (r.ok ? r.thickness * 1e9 : Number.NaN);
const misfit = (x: number) => (latticeDismukes(x) - A_SI) / A_SI;

describe("Matthews–Blakeslee, 8π single-layer form, 60° dislocations (REFERENCES §5, [D])", () => {
  it("Si on relaxed Si0.7Ge0.3 (ε = 1.146 %): 7.8 nm", () => {
    const eps = strainedSiOnRelaxedSiGe(0.3).epsParallel;
    expect(thick(matthewsBlakeslee(eps, A_SI, poissonRatio(0)))).toBeCloseTo(7.8, 1);
  });
  it("Si0.8Ge0.2 on Si: 13.6 nm", () => {
    expect(thick(matthewsBlakeslee(misfit(0.2), latticeDismukes(0.2), poissonRatio(0.2)))).toBeCloseTo(13.6, 1);
  });
  it("Ge on Si: 1.15 nm", () => {
    expect(thick(matthewsBlakeslee(misfit(1), latticeDismukes(1), poissonRatio(1)))).toBeCloseTo(1.15, 2);
  });
  it("the 8π form is well below the 2π multilayer form's 44.7 nm for Si on Si0.7Ge0.3 (guards the factor of 4)", () => {
    const h = thick(matthewsBlakeslee(strainedSiOnRelaxedSiGe(0.3).epsParallel, A_SI, poissonRatio(0)));
    expect(h).toBeLessThan(10);
  });
  it("the result satisfies its own implicit equation", () => {
    const eps = 0.01,
      a = A_SI,
      nu = poissonRatio(0);
    const r = matthewsBlakeslee(eps, a, nu);
    if (!r.ok) throw new Error(r.reason);
    const b = a / Math.SQRT2;
    const rhs = ((b * (1 - nu / 4)) / (8 * Math.PI * eps * (1 + nu) * 0.5)) * (Math.log(r.thickness / b) + 1);
    expect(Math.abs(rhs - r.thickness) / r.thickness).toBeLessThan(1e-10);
  });
  it("no misfit, NaN input and huge strain give reasons, not numbers", () => {
    expect(matthewsBlakeslee(0, A_SI, 0.28)).toMatchObject({ ok: false, reason: expect.stringMatching(/no misfit/) });
    expect(matthewsBlakeslee(Number.NaN, A_SI, 0.28).ok).toBe(false);
    expect(matthewsBlakeslee(0.5, A_SI, 0.28)).toMatchObject({ ok: false, reason: expect.stringMatching(/Burgers/) });
  });
});

describe("People–Bean (REFERENCES §5, [D] with ν = 0.28, b = 4 Å)", () => {
  it("Si0.7Ge0.3 on Si: 96 nm", () => {
    expect(thick(peopleBean(misfit(0.3), latticeDismukes(0.3), 0.28))).toBeCloseTo(96, 0);
  });
  it("Si on Si0.7Ge0.3: 98 nm", () => {
    expect(thick(peopleBean(strainedSiOnRelaxedSiGe(0.3).epsParallel, A_SI, 0.28))).toBeCloseTo(98, 0);
  });
  it("rejects a zero strain", () => {
    expect(peopleBean(0, A_SI, 0.28).ok).toBe(false);
  });
});

describe("comparison with the well thickness", () => {
  it("a 12 nm Si well on Si0.7Ge0.3 is beyond its 7.8 nm critical thickness; 5 nm is not", () => {
    const r = matthewsBlakeslee(strainedSiOnRelaxedSiGe(0.3).epsParallel, A_SI, poissonRatio(0));
    if (!r.ok) throw new Error(r.reason);
    const thick12 = compareWithCritical(12e-9, r.thickness);
    expect(thick12.beyond).toBe(true);
    expect(thick12.margin * 1e9).toBeCloseTo(7.785 - 12, 2);
    expect(compareWithCritical(5e-9, r.thickness).beyond).toBe(false);
    expect(() => compareWithCritical(0, r.thickness)).toThrow(RangeError);
  });
});
