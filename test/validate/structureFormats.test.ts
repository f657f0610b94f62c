import { describe, expect, it } from "vitest";
import { readTable } from "../../src/read/table.ts";
import { validateXrd } from "../../src/validate/xrd.ts";
import { validateDepthProfile } from "../../src/validate/depthProfile.ts";
import { InputError, type Problem } from "../../src/model/problem.ts";

const DEG = Math.PI / 180;

function problem(fn: () => unknown): Problem {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e.problem;
    throw e;
  }
  throw new Error("expected an InputError");
}

function mapText(meta: string[], header = "omega [deg],two_theta [deg],counts", rows?: string[]): string {
  const r = rows ?? Array.from({ length: 36 }, (_, i) => `${(34.5 + 0.01 * (i % 6)).toFixed(2)},${(69 + 0.02 * Math.floor(i / 6)).toFixed(2)},${10 + i}`);
  return [...meta, header, ...r].join("\n") + "\n";
}
const xrd = (text: string, names: string[] = []) => validateXrd(readTable(text, "wafers/W/xrd/m.csv"), names);

describe("X-ray diffraction files", () => {
  it("reads a gridded map: reflection, default Cu Kα1 wavelength, angles in rad", () => {
    const f = xrd(mapText(["# reflection: 0 0 4"]));
    expect(f.kind).toBe("map");
    if (f.kind !== "map") return;
    expect(f.reflection).toEqual([0, 0, 4]);
    // Cu Kα1 = 1.54059292 Å (International Tables Vol. C; REFERENCES §2 [C])
    expect(f.wavelength).toBeCloseTo(1.54059292e-10, 18);
    expect(f.wavelengthGiven).toBe(false);
    expect(f.points).toHaveLength(36);
    expect(f.points[0].omega).toBeCloseTo(34.5 * DEG, 12);
    expect(f.grid).toBe(true);
  });
  it("accepts the compact reflection 224 and a wavelength in Å", () => {
    const f = xrd(mapText(["# reflection: 224", "# wavelength: 1.5406 Å"]));
    expect(f.reflection).toEqual([2, 2, 4]);
    expect(f.wavelength).toBeCloseTo(1.5406e-10, 18);
  });
  it("reads a peak table with stack layer names and errors", () => {
    const f = xrd(
      [
        "# reflection: 2 2 4",
        "layer,omega [deg],two_theta [deg],omega_err [deg]",
        "substrate,8.9,88.03,0.001",
        "lower barrier,8.5,86.4,0.002",
        "Well,9.1,88.6,0.004",
      ].join("\n"),
      ["lower barrier"],
    );
    expect(f.kind).toBe("peaks");
    if (f.kind !== "peaks") return;
    expect(f.rows.map((r) => r.layer)).toEqual(["substrate", "lower barrier", "well"]);
    expect(f.rows[1].omegaStdErr).toBeCloseTo(0.002 * DEG, 12);
    expect(f.rows[0].twoThetaStdErr).toBeUndefined();
  });
  it("requires the reflection", () => {
    const p = problem(() => xrd(mapText([])));
    expect(p.field).toBe("# reflection");
    expect(p.message).toMatch(/reflection is not given/);
    expect(p.file).toBe("wafers/W/xrd/m.csv");
  });
  it("rejects a bad reflection on its line", () => {
    const p = problem(() => xrd(mapText(["# wavelength: 0.154 nm", "# reflection: 2 2"])));
    expect(p.line).toBe(2);
    expect(p.found).toBe('"2 2"');
    expect(p.fix).toBeTruthy();
    expect(problem(() => xrd(mapText(["# reflection: 1 1 0"]))).message).toMatch(/l must be positive/);
  });
  it("rejects a wavelength without a unit", () => {
    const p = problem(() => xrd(mapText(["# reflection: 0 0 4", "# wavelength: 0.154"])));
    expect(p.field).toBe("# wavelength");
    expect(p.line).toBe(2);
  });
  it("names an unknown column with a did-you-mean hint", () => {
    const p = problem(() => xrd(mapText(["# reflection: 0 0 4"], "omega [deg],twotheta [deg],counts")));
    expect(p.message).toMatch(/unknown column/);
    expect(p.fix).toMatch(/two_theta/);
    expect(p.line).toBe(2);
  });
  it("rejects angles in radians and negative counts, on their lines", () => {
    expect(problem(() => xrd(mapText(["# reflection: 0 0 4"], "omega [rad],two_theta [deg],counts"))).expected).toMatch(/deg/);
    const rows = Array.from({ length: 30 }, (_, i) => `34.5,${69 + i * 0.01},${i === 4 ? -3 : 5}`);
    const p = problem(() => xrd(mapText(["# reflection: 0 0 4"], undefined, rows)));
    expect(p.message).toMatch(/negative counts/);
    expect(p.line).toBe(7);
  });
  it("rejects swapped omega and two_theta", () => {
    const rows = Array.from({ length: 30 }, (_, i) => `69,${34.5 + i * 0.01},5`);
    expect(problem(() => xrd(mapText(["# reflection: 0 0 4"], undefined, rows))).fix).toMatch(/swapped/);
  });
  it("rejects a non-numeric cell with row and column", () => {
    const rows = Array.from({ length: 30 }, (_, i) => `34.5,${69 + i * 0.01},${i === 2 ? "sat" : 5}`);
    const p = problem(() => xrd(mapText(["# reflection: 0 0 4"], undefined, rows)));
    expect(p.line).toBe(5);
    expect(p.field).toMatch(/counts/);
  });
  it("rejects an unknown layer in a peak table, suggesting the stack name", () => {
    const p = problem(() =>
      xrd(["# reflection: 2 2 4", "layer,omega [deg],two_theta [deg]", "substrate,8.9,88.03", "lower barier,8.5,86.4"].join("\n"), ["lower barrier"]),
    );
    expect(p.line).toBe(4);
    expect(p.fix).toMatch(/lower barrier/);
  });
  it("rejects a file that is neither map nor table", () => {
    expect(problem(() => xrd(["# reflection: 0 0 4", "omega [deg],two_theta [deg]", "34,69"].join("\n"))).message).toMatch(/neither a map nor a peak table/);
  });
});

function profText(header = "depth [nm],Ge [at.%],O [cm^-3]", rows?: string[]): string {
  const r = rows ?? Array.from({ length: 30 }, (_, i) => `${(i * 0.5).toFixed(1)},${i < 10 || i > 20 ? 30 : 1},${1e17}`);
  return ["# method: SIMS", header, ...r].join("\n") + "\n";
}
const prof = (text: string) => validateDepthProfile(readTable(text, "wafers/W/profiles/p.csv"));

describe("depth profiles", () => {
  it("reads depth, Ge in at.% as a fraction, contaminants and the method", () => {
    const p = prof(profText());
    expect(p.method).toBe("SIMS");
    expect(p.ge[0]).toBeCloseTo(0.3, 12);
    expect(p.depth[2]).toBeCloseTo(1, 12);
    expect(p.contaminants.O[0]).toBe(1e17);
  });
  it("reads Ge as a fraction [1] and depth in Å", () => {
    const p = prof(
      profText(
        "depth [Å],Ge [1]",
        Array.from({ length: 25 }, (_, i) => `${i * 5},0.3`),
      ),
    );
    expect(p.depth[1]).toBeCloseTo(0.5, 12);
    expect(p.ge[0]).toBeCloseTo(0.3, 12);
  });
  it("rejects Ge given in percent under unit [1]", () => {
    const p = problem(() => prof(profText("depth [nm],Ge [1],O [cm^-3]")));
    expect(p.message).toMatch(/out of range/);
    expect(p.line).toBe(3);
  });
  it("rejects a contaminant without a concentration unit", () => {
    const p = problem(() => prof(profText("depth [nm],Ge [at.%],O [ppm]")));
    expect(p.field).toBe("column O");
    expect(p.fix).toMatch(/O \[cm\^-3\]/);
  });
  it("rejects a misspelt column with a hint", () => {
    expect(problem(() => prof(profText("dept [nm],Ge [at.%],O [cm^-3]"))).fix).toMatch(/depth/);
  });
  it("rejects a depth that goes backwards, naming the line", () => {
    const rows = Array.from({ length: 25 }, (_, i) => `${i === 7 ? 1 : i},30,1e17`);
    const p = problem(() => prof(profText(undefined, rows)));
    expect(p.message).toMatch(/not increasing/);
    expect(p.line).toBe(10);
  });
  it("rejects a profile without Ge, and one too short", () => {
    expect(
      problem(() =>
        prof(
          profText(
            "depth [nm],O [cm^-3]",
            Array.from({ length: 25 }, (_, i) => `${i},1e17`),
          ),
        ),
      ).message,
    ).toMatch(/missing the Ge column/);
    expect(problem(() => prof(profText(undefined, ["0,30,1e17", "1,30,1e17"]))).message).toMatch(/too few rows/);
  });
});
