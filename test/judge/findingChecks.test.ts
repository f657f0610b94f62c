/**
 * Finding checks (src/judge/findings.ts) raised from an analysis (issue 15 §2).
 * The analysis objects are hand-built, holding only what each check reads; the
 * thresholds behind them (coherence ±0.25 %, Matthews–Blakeslee, SdH mismatch
 * tolerance, R² limit) are the analysis's own and tested in test/analyse.
 * Profile sampling: the criterion "fewer than 3 depth steps across the 10–90 %
 * width" is waferbook's (common practice for sampled edges), written out here
 * as width / step.
 */
import { describe, expect, it } from "vitest";
import type { WaferAnalysis } from "../../src/analyse/wafer.ts";
import { findingChecks, FINDING_KEYS } from "../../src/judge/findings.ts";
import { profileSampling } from "../../src/analyse/structure/profileSampling.ts";

const ok = <T extends object>(x: T) => ({ ok: true as const, ...x });
const skip = (reason: string) => ({ ok: false as const, reason });
const point = (file: string, extra: object = {}) => ({
  file,
  gate_V: 0.5,
  density: 3e15,
  mobility: 10,
  sheetResistance: 200,
  temperature_K: 1.6,
  symmetrised: true,
  hall: { r2: 0.9999, poor: false },
  ...extra,
});

function analysis(parts: { devices?: object[]; structure?: object; images?: object }): WaferAnalysis {
  return { devices: parts.devices ?? [], structure: parts.structure, images: parts.images } as unknown as WaferAnalysis;
}
const byKey = (a: WaferAnalysis) => Object.fromEntries(findingChecks(a).map((c) => [c.key, c]));

describe("finding checks", () => {
  it("lists every finding in a fixed order, unchecked when the wafer was not analysed", () => {
    const c = findingChecks(undefined);
    expect(c.map((x) => x.key)).toEqual([...FINDING_KEYS]);
    expect(c.every((x) => !x.checked)).toBe(true);
  });

  it("incoherent well: raised from the coherence result, with the analysis's own words; not checked without strain maps", () => {
    const image = (coherent: boolean) => ({
      input: { file: "wafers/W/images/a.png", kind: "haadf" },
      profile: ok({}),
      gpa: ok({}),
      coherence: ok({ coherent, findings: coherent ? [] : ["in-plane mismatch -1.134 % exceeds ±0.25 %: the well is not coherent with the reference"] }),
    });
    const raised = byKey(analysis({ images: { images: [image(false)] } })).incoherent_well;
    expect(raised.checked).toBe(true);
    expect(raised.raised).toEqual(["images/a.png: in-plane mismatch -1.134 % exceeds ±0.25 %: the well is not coherent with the reference"]);
    expect(byKey(analysis({ images: { images: [image(true)] } })).incoherent_well.raised).toEqual([]);
    expect(byKey(analysis({})).incoherent_well.checked).toBe(false);
  });

  it("beyond critical thickness: raised with the check's statement", () => {
    const crit = (beyond: boolean) => ({ critical: ok({ beyond, statement: "well 20 nm exceeds its critical thickness 11.6 nm" }), profiles: [] });
    expect(byKey(analysis({ structure: crit(true) })).beyond_critical_thickness.raised).toEqual(["well 20 nm exceeds its critical thickness 11.6 nm"]);
    expect(byKey(analysis({ structure: crit(false) })).beyond_critical_thickness).toEqual({ key: "beyond_critical_thickness", checked: true, raised: [] });
    expect(byKey(analysis({ structure: { critical: skip("no well layer"), profiles: [] } })).beyond_critical_thickness).toMatchObject({
      checked: false,
      why: "no well layer",
    });
  });

  it("parallel conduction: raised per device from the flagged sweeps; checked only when some sweep had an SdH density", () => {
    const dev = (flagged: string[], withMismatch = true) => ({
      id: "HB1",
      points: [point("wafers/W/transport/HB1/a.csv")],
      skipped: [],
      depth: {
        calibration: ok({}),
        powerLaw: ok({}),
        percolation: skip("no gate sweeps"),
        gateSweeps: [],
        quantumLifetime: skip("no oscillations"),
        points: [
          {
            file: "wafers/W/transport/HB1/a.csv",
            sdh: skip("no oscillations"),
            dingle: skip("-"),
            mismatch: withMismatch ? { parallelConduction: flagged.length > 0 } : undefined,
          },
        ],
        parallelConduction: flagged,
      },
    });
    expect(byKey(analysis({ devices: [dev(["wafers/W/transport/HB1/a.csv"])] })).parallel_conduction.raised).toEqual([
      "device HB1: Hall and SdH densities differ beyond tolerance at HB1/a.csv",
    ]);
    expect(byKey(analysis({ devices: [dev([])] })).parallel_conduction).toMatchObject({ checked: true, raised: [] });
    expect(byKey(analysis({ devices: [dev([], false)] })).parallel_conduction.checked).toBe(false);
  });

  it("one-sign field sweep: raised per device, naming the sweeps", () => {
    const d = { id: "HB2", points: [point("wafers/W/transport/HB2/a.csv", { symmetrised: false }), point("wafers/W/transport/HB2/b.csv")], skipped: [] };
    expect(byKey(analysis({ devices: [d] })).one_sign_field.raised).toEqual([
      "device HB2: 1 field sweep with one field sign (HB2/a.csv), not (anti)symmetrised",
    ]);
  });

  it("undetermined fit: a poor Hall fit, a skipped sweep, a rejected percolation fit, an undetermined quantum lifetime and a failed profile fit are raised; missing data is not", () => {
    const d = {
      id: "HB1",
      points: [
        point("wafers/W/transport/HB1/a.csv", { hall: { r2: 0.95, poor: true } }),
        point("wafers/W/transport/HB1/b.csv"),
        point("wafers/W/transport/HB1/c.csv"),
      ],
      skipped: [{ file: "wafers/W/transport/HB1/d.csv", reason: "zero-field sheet resistance is not positive" }],
      depth: {
        calibration: ok({}),
        powerLaw: ok({}),
        gateSweeps: [{ field_T: 0 }],
        percolation: skip("the sweep never approaches the insulating side"),
        points: [{ file: "wafers/W/transport/HB1/b.csv", sdh: ok({}), dingle: skip("only 2 clear oscillation extrema") }],
        quantumLifetime: skip("no point gave a Dingle fit"),
        parallelConduction: [],
      },
    };
    const raised = byKey(
      analysis({
        devices: [d],
        structure: { critical: skip("no well"), profiles: [{ data: { file: "wafers/W/profiles/sims.csv" }, result: skip("the Ge profile has no contrast") }] },
      }),
    ).fit_undetermined.raised;
    expect(raised).toEqual([
      "device HB1: HB1/d.csv not analysed: zero-field sheet resistance is not positive",
      "device HB1: Hall fit below the R² limit at HB1/a.csv (R² 0.9500)",
      "device HB1: percolation fit rejected: the sweep never approaches the insulating side",
      "device HB1: quantum lifetime not determined: no point gave a Dingle fit",
      "profiles/sims.csv: depth profile not fitted: the Ge profile has no contrast",
    ]);
    // No gate sweeps and no oscillations: missing data, nothing raised.
    const bare = {
      ...d,
      points: d.points.slice(1),
      skipped: [],
      depth: {
        ...d.depth,
        gateSweeps: [],
        percolation: skip("no gate sweeps for this device"),
        points: [{ file: "b.csv", sdh: skip("no oscillations"), dingle: skip("-") }],
      },
    };
    expect(byKey(analysis({ devices: [bare] })).fit_undetermined.raised).toEqual([]);
  });

  it("coarse profile: fewer than 3 depth steps across the narrower 10–90 % width", () => {
    // width / step written out: 1.2 nm / 0.5 nm = 2.4 < 3 → coarse; 1.2 / 0.2 = 6 → fine.
    expect(profileSampling(0.5, [1.2, 1.5])).toEqual({ step: 0.5, pointsAcross: 1.2 / 0.5, coarse: true });
    expect(profileSampling(0.2, [1.2, 1.5]).coarse).toBe(false);
    expect(profileSampling(0.4, [1.2, 1.5]).coarse).toBe(false); // exactly 3 steps: resolved
    const prof = (step: number) => ({
      critical: skip("-"),
      profiles: [{ data: { file: "wafers/W/profiles/sims.csv" }, result: ok({ depthStep: step, top: { width10to90: 1.2 }, bottom: { width10to90: 1.5 } }) }],
    });
    expect(byKey(analysis({ structure: prof(0.5) })).coarse_profile.raised).toEqual([
      "profiles/sims.csv: 2.4 depth steps of 0.50 nm across the narrower interface; at least 3 are needed, so the widths are upper bounds",
    ]);
    expect(byKey(analysis({ structure: prof(0.2) })).coarse_profile).toMatchObject({ checked: true, raised: [] });
  });
});
