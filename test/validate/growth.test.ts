/**
 * The growth: block of wafer.md (src/validate/growth.ts): quantities with
 * units converted once, and every problem located at its file and line.
 * Conversions checked against the definitions (common practice): T(°C) =
 * T(K) − 273.15; 1 slm = 1000 sccm; 1 min = 60 s; 1 nm/s = 60 nm/min.
 */
import { describe, expect, it } from "vitest";
import { readFrontMatter } from "../../src/read/frontMatter.ts";
import { InputError } from "../../src/model/problem.ts";
import { DEFAULT_SETTINGS } from "../../src/validate/settings.ts";
import { validateWafer } from "../../src/validate/wafer.ts";
import { growthVariables, slug } from "../../src/validate/growth.ts";

const ctx = { folder: "W-1", file: "wafers/W-1/wafer.md", today: "2026-12-01", siteSettings: DEFAULT_SETTINGS };
const load = (text: string) => validateWafer(readFrontMatter(text, ctx.file), ctx);

// Line numbers: "---" is line 1, so the growth layers start on line 9.
const record = (layers: string, anneals = '    - { name: post, temperature: "1073.15 K", time: "2 min" }') =>
  `---\nwafer: W-1\nrun: R-1\ngrown: 2025-03-14\nstack:\n  - { name: well, role: well }\n  - { name: upper barrier, role: barrier }\ngrowth:\n  recipe: "QW-625"\n  layers:\n${layers}\n  anneals:\n${anneals}\n---\n`;

function problems(text: string): string[] {
  try {
    load(text);
  } catch (e) {
    if (e instanceof InputError) return e.problems.map((p) => `${p.file}:${p.line}: ${p.field}: ${p.message}`);
    throw e;
  }
  return [];
}

describe("growth conditions", () => {
  it("reads the quantities in °C, nm/min, Torr, sccm and s", () => {
    const r = load(record('    - { layer: well, temperature: "625 °C", rate: "0.03 nm/s", pressure: "20 Torr", flows: { SiH4: "20 sccm", H2: "20 slm" } }'));
    const g = r.growth!;
    expect(g.recipe).toBe("QW-625");
    expect(g.layers[0].temperature_C).toBe(625);
    expect(g.layers[0].rate_nm_per_min).toBeCloseTo(1.8, 10); // 0.03 nm/s × 60
    expect(g.layers[0].pressure_Torr).toBeCloseTo(20, 10);
    expect(g.layers[0].flows_sccm).toEqual([
      ["SiH4", 20],
      ["H2", 20000],
    ]); // 20 slm = 20 000 sccm
    expect(g.anneals[0].temperature_C).toBeCloseTo(800, 9); // 1073.15 K − 273.15
    expect(g.anneals[0].time_s).toBe(120);
    expect(growthVariables(g).map((v) => v.key)).toEqual([
      "growth_well_temperature",
      "growth_well_rate",
      "growth_well_pressure",
      "growth_well_flow_sih4",
      "growth_well_flow_h2",
      "anneal_post_temperature",
      "anneal_post_time",
    ]);
  });

  it("locates every bad quantity, unknown layer and unknown key at its line", () => {
    const text = record(
      [
        '    - { layer: well, temperature: "625", rate: "2 V" }',
        '    - { layer: uper barrier, temperature: "650 °C", flows: { GeH4: "-3 sccm" } }',
        '    - { layer: well, temprature: "600 °C" }',
      ].join("\n"),
      '    - { name: post, temperature: "800 °C" }',
    );
    expect(problems(text)).toEqual([
      "wafers/W-1/wafer.md:11: growth.layers[0].temperature: cannot read the substrate temperature",
      "wafers/W-1/wafer.md:11: growth.layers[0].rate: cannot read the growth rate",
      "wafers/W-1/wafer.md:12: growth.layers[1].layer: growth layer names no layer of the stack",
      "wafers/W-1/wafer.md:12: growth.layers[1].flows.GeH4: gas flow is out of range",
      "wafers/W-1/wafer.md:13: growth.layers[2].temprature: unknown key",
      "wafers/W-1/wafer.md:13: growth.layers[2].layer: layer has two growth entries",
      "wafers/W-1/wafer.md:15: growth.anneals[0].time: anneal time is missing",
    ]);
  });

  it("suggests the stack layer meant and says a bare number lacks its unit", () => {
    try {
      load(record("    - { layer: uper barrier, temperature: 650 }"));
      expect.unreachable();
    } catch (e) {
      const [layer, temp] = (e as InputError).problems;
      expect(layer.fix).toBe('did you mean "upper barrier"?');
      expect(temp.found).toBe("the bare number 650 (no unit)");
    }
  });

  it("refuses two names that become one column key, naming both and where each is", () => {
    // slug rule of docs/formats.md, section Growth conditions: lower case, other characters as "_".
    const text = record(
      ['    - { layer: upper barrier, temperature: "650 °C", flows: { GeH4: "8 sccm", geh4: "9 sccm" } }', '    - { layer: well, temperature: "625 °C" }'].join(
        "\n",
      ),
      ['    - { name: post growth, temperature: "800 °C", time: "60 s" }', '    - { name: Post-Growth, temperature: "820 °C", time: "60 s" }'].join("\n"),
    );
    const stack = text.replace(
      "  - { name: upper barrier, role: barrier }",
      "  - { name: upper barrier, role: barrier }\n  - { name: Upper-Barrier, role: barrier }",
    );
    const withCaseTwin = stack.replace('    - { layer: well, temperature: "625 °C" }', '    - { layer: Upper-Barrier, temperature: "655 °C" }');
    expect(problems(withCaseTwin)).toEqual([
      'wafers/W-1/wafer.md:12: growth.layers[0].flows.geh4: gas "geh4" of layer "upper barrier" and gas "GeH4" of layer "upper barrier" (growth.layers[0].flows.GeH4) give the same column key',
      'wafers/W-1/wafer.md:13: growth.layers[1].layer: layer "Upper-Barrier" and layer "upper barrier" (growth.layers[0].layer) give the same column key',
      'wafers/W-1/wafer.md:16: growth.anneals[1].name: anneal "Post-Growth" and anneal "post growth" (growth.anneals[0].name) give the same column key',
    ]);
    try {
      load(withCaseTwin);
    } catch (e) {
      const p = (e as InputError).problems[1];
      expect(p.found).toBe("both become growth_upper_barrier_temperature");
      expect(p.fix).toMatch(/^rename one of them/);
    }
  });

  it("refuses a layer name that collides with another layer's gas column, and an anneal named twice", () => {
    const text = record(
      ['    - { layer: well, flows: { "SiH4 temperature": "5 sccm" } }'].join("\n"),
      ['    - { name: post, temperature: "800 °C", time: "60 s" }', '    - { name: post, temperature: "820 °C", time: "60 s" }'].join("\n"),
    ).replace("  - { name: well, role: well }", "  - { name: well, role: well }\n  - { name: well flow sih4, role: cap }");
    const both = text.replace("    - { layer: well, flows", '    - { layer: well flow sih4, temperature: "600 °C" }\n    - { layer: well, flows');
    expect(problems(both)).toEqual([
      'wafers/W-1/wafer.md:13: growth.layers[1].flows.SiH4 temperature: gas "SiH4 temperature" of layer "well" and layer "well flow sih4" (growth.layers[0].layer) give the same column key',
      "wafers/W-1/wafer.md:16: growth.anneals[1].name: anneal has two entries",
    ]);
  });

  it("lets names that differ only in case stand when they make no common column", () => {
    // Only colliding columns are refused: a layer with a temperature and its case twin with a rate share no key.
    const text = record(['    - { layer: well, temperature: "625 °C" }', '    - { layer: upper barrier, rate: "2 nm/min" }'].join("\n"));
    expect(problems(text)).toEqual([]);
  });

  it("refuses a growth block that is not a mapping, located at its line", () => {
    const text = "---\nwafer: W-1\nrun: R-1\ngrown: 2025-03-14\ngrowth: 625 C\n---\n";
    expect(problems(text)).toEqual(["wafers/W-1/wafer.md:5: growth: wrong type"]);
  });
});

describe("column key names (slug)", () => {
  // Expected keys written by hand: accents dropped after canonical decomposition (Unicode NFD), other
  // non-ASCII letters and digits as their lower-case code point in hex (U+03C9 ω, U+5C42 层: Unicode charts).
  it("keeps non-ASCII names readable and apart from a layer named x", () => {
    expect(slug("é")).toBe("e");
    expect(slug("Über-Schicht")).toBe("uber_schicht");
    expect(slug("Ω layer")).toBe("u3c9_layer");
    expect(slug("层1")).toBe("u5c42_1");
    expect(slug("层")).not.toBe(slug("x"));
    expect(slug("upper barrier")).toBe("upper_barrier");
    expect(slug("---")).toBe("x");
  });
});
