// Wafer map SVG: structure and accessibility checks (no published reference values involved).
import { describe, expect, it } from "vitest";
import { escapeXml, sequentialColour, waferMapSvg, type WaferMapDevice } from "../../src/publish/waferMapSvg.ts";

const devices: WaferMapDevice[] = [
  { id: "D1", atMm: [0, 0], value: 1.0e5 },
  { id: 'D2 <edge> & "side"', atMm: [30, 10], value: 2.0e5 },
  { id: "D3", atMm: [-25, -20], value: 1.5e5 },
  { id: "D4", atMm: [10, 35], value: null },
];

const count = (s: string, needle: string | RegExp): number => (s.match(new RegExp(needle, "g")) ?? []).length;

describe("waferMapSvg", () => {
  const svg = waferMapSvg(devices, { title: "Mobility <W-1> & co", unit: "cm²/(V·s)", idPrefix: "m1" });

  it("draws one marker per device", () => {
    expect(count(svg, '<g class="device"')).toBe(4);
    expect(count(svg, "<circle ")).toBe(4);
  });

  it("has an escaped title and a description, referenced by aria-labelledby", () => {
    expect(svg).toContain('<title id="m1-title">Mobility &lt;W-1&gt; &amp; co</title>');
    expect(svg).toContain('aria-labelledby="m1-title m1-desc"');
    expect(svg).toMatch(/<desc id="m1-desc">4 devices on a 100 mm wafer, values from 1\.00e\+5 to 2\.00e\+5 cm²\/\(V·s\)\./);
    expect(svg).toContain('role="img"');
  });

  it("escapes device ids and never leaks raw markup", () => {
    expect(svg).toContain("D2 &lt;edge&gt; &amp; &quot;side&quot;");
    expect(svg).not.toContain("<edge>");
  });

  it("labels each value and marks missing ones", () => {
    expect(svg).toContain(">1.50e+5</text>");
    expect(svg).toContain("D4: not measured");
    expect(svg).toContain('fill="#c8c8c8"');
  });

  it("flips y: a device at +y sits above the centre in SVG coordinates", () => {
    expect(svg).toMatch(/<circle cx="10" cy="-35"/);
  });

  it("colours by value: lowest gets the first stop, highest the last", () => {
    expect(svg).toContain(`<circle cx="0" cy="0" r="4" fill="${sequentialColour(0)}"`);
    expect(svg).toContain(`<circle cx="30" cy="-10" r="4" fill="${sequentialColour(1)}"`);
  });

  it("scales the outline with the diameter and leaves out devices without a position", () => {
    const s = waferMapSvg(
      [
        { id: "x", atMm: [Number.NaN, 0], value: 1 },
        { id: "y", atMm: [1, 1], value: 2 },
      ],
      {
        title: "t",
        diameterMm: 150,
      },
    );
    expect(count(s, "<circle ")).toBe(1);
    expect(s).toContain("on a 150 mm wafer");
    expect(s).toContain("1 device without a valid position not shown.");
    expect(() => waferMapSvg([], { title: "t", diameterMm: 0 })).toThrow(RangeError);
  });

  it("labels are at least 11 px at the rendered width, and the colour bar names range and unit", () => {
    const vbWidth = Number(/viewBox="[^ ]+ [^ ]+ ([^ ]+) /.exec(svg)![1]);
    const width = Number(/ width="([^"]+)"/.exec(svg)![1]);
    const sizes = [...svg.matchAll(/<text[^>]*font-size="([^"]+)"/g)].map((m) => (Number(m[1]) * width) / vbWidth);
    expect(sizes.length).toBeGreaterThan(4);
    for (const px of sizes) expect(px).toBeGreaterThanOrEqual(11);
    const legend = svg.slice(svg.indexOf('class="wafer-legend"'));
    expect(legend).toContain(">1.00e+5</text>");
    expect(legend).toContain(">2.00e+5</text>");
    expect(legend).toContain(">cm²/(V·s)</text>");
    expect(count(legend, "<stop ")).toBeGreaterThanOrEqual(9);
  });

  it("copes with no devices at all", () => {
    const s = waferMapSvg([], { title: "empty" });
    expect(s).toContain("0 devices");
    expect(s).toContain("no measured values");
  });
});

describe("helpers", () => {
  it("escapeXml handles all five special characters", () => {
    expect(escapeXml(`<a href="x">'&'</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;&#39;&amp;&#39;&lt;/a&gt;");
  });
  it("sequentialColour (viridis) is monotonically brighter and clamps", () => {
    const lum = (h: string) => [1, 3, 5].reduce((s, k) => s + parseInt(h.slice(k, k + 2), 16), 0);
    const ts = [0, 0.2, 0.4, 0.6, 0.8, 1];
    const ls = ts.map((t) => lum(sequentialColour(t)));
    for (let i = 1; i < ls.length; i++) expect(ls[i]).toBeGreaterThan(ls[i - 1]);
    expect(sequentialColour(-1)).toBe(sequentialColour(0));
    expect(sequentialColour(2)).toBe(sequentialColour(1));
    expect(sequentialColour(Number.NaN)).toMatch(/^#[0-9a-f]{6}$/);
  });
});
