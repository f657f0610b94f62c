// The wafer page's packed chart data (src/publish/charts.ts chartDataJson) as the page's chart script
// (templates/assets/charts.js) unpacks it. Expected encodings are written out by hand from the rules in the
// doc comments (zigzag, base-32 groups, little-endian, URL-safe base64 alphabet; steps 1, 2, 5 × 10ⁿ).
import { beforeAll, describe, expect, it } from "vitest";
import { chartDataJson, niceStep, packInts, PACK_LEVELS, type ChartSpec } from "../../src/publish/charts.ts";

type Spec = { series: { points: [number, number][]; label: string; links?: string[] }[]; views?: { series: { points: [number, number][] }[] }[] } & Record<
  string,
  unknown
>;
let unpackSpecs: (specs: unknown[]) => Spec[];

beforeAll(async () => {
  await import(/* @vite-ignore */ new URL("../../templates/assets/charts.js", import.meta.url).href);
  unpackSpecs = (globalThis as unknown as { waferbookAxes: { unpackSpecs: typeof unpackSpecs } }).waferbookAxes.unpackSpecs;
});

const roundTrip = (charts: ChartSpec[]) => unpackSpecs(JSON.parse(chartDataJson(charts)) as unknown[]);

function spec(over: Partial<ChartSpec>): ChartSpec {
  return { id: "c", title: "A title", x: { label: "x (T)" }, y: { label: "y (Ω)" }, series: [], summary: "A summary", ...over };
}

describe("packInts", () => {
  it("zigzag then base-32 groups, low group first, continuation in the alphabet's second half", () => {
    // 0 → 0 "A"; −1 → 1 "B"; 1 → 2 "C"; 15 → 30 "e"; −16 → 31 "f"; 16 → 32 = 0 + 1·32 → "g" (0, more) "B" (1).
    expect(packInts([0, -1, 1, 15, -16, 16])).toBe("ABCefgB");
    // 1000 → 2000 = 16 + 30·32 + 1·1024 → "w" (16, more) "-" (30, more) "B" (1).
    expect(packInts([1000])).toBe("w-B");
    expect(packInts([])).toBe("");
  });
});

describe("niceStep", () => {
  it("largest 1, 2 or 5 × 10ⁿ not above", () => {
    expect(niceStep(0.0047)).toBe(0.002);
    expect(niceStep(4.7)).toBe(2);
    expect(niceStep(1)).toBe(1);
    expect(niceStep(0.5)).toBe(0.5);
    expect(niceStep(730)).toBe(500);
    expect(niceStep(0.00099)).toBe(0.0005);
  });
});

describe("chartDataJson read back by charts.js", () => {
  it("keeps every point within a quarter pixel's worth of levels of the drawn span", () => {
    const x = Array.from({ length: 300 }, (_, i) => 0.0123 + i * 0.0337 + (i % 7) * 0.0011);
    const y = x.map((b) => 1234.5 + 300 * Math.cos(2 * Math.PI * 3.3 * b) * Math.exp(-1 / (b + 0.1)) - 17 * b);
    const rxy = x.map((b) => 2.5813 * b + 0.001);
    const pts = (ys: number[]) => x.map((v, i) => [v, ys[i]] as [number, number]);
    const back = roundTrip([
      spec({
        y2: { label: "r (kΩ)" },
        series: [
          { label: "rho", points: pts(y), line: true },
          { label: "rxy", points: pts(rxy), line: true, axis: "y2" },
        ],
      }),
    ]);
    const spanX = x[299] - x[0];
    const spanY = Math.max(...y) - Math.min(...y);
    const spanR = rxy[299] - rxy[0];
    const got = back[0].series;
    expect(got[0].points).toHaveLength(300);
    expect(got[1].points).toHaveLength(300);
    for (let i = 0; i < 300; i++) {
      expect(Math.abs(got[0].points[i][0] - x[i])).toBeLessThanOrEqual(spanX / PACK_LEVELS.x / 2 + 1e-12);
      expect(Math.abs(got[0].points[i][1] - y[i])).toBeLessThanOrEqual(spanY / PACK_LEVELS.y / 2 + 1e-9);
      expect(Math.abs(got[1].points[i][1] - rxy[i])).toBeLessThanOrEqual(spanR / PACK_LEVELS.y / 2 + 1e-12);
    }
  });

  it("prints clean decimals (multiples of the step, no binary noise)", () => {
    const back = roundTrip([
      spec({
        series: [
          {
            label: "s",
            points: [
              [0.1234, 5],
              [0.3, 6.0004],
              [1.7, 7],
            ],
            line: true,
          },
        ],
      }),
    ]);
    // x span 1.5766 / 2200 → step 0.0005; y span 2 / 840 → step 0.002.
    expect(back[0].series[0].points).toEqual([
      [0.1235, 5],
      [0.3, 6],
      [1.7, 7],
    ]);
  });

  it("log axes keep the same relative precision over decades", () => {
    const pts: [number, number][] = [
      [3e10, 1.5e4],
      [1.23e11, 2.71e5],
      [8e11, 9.99e5],
    ];
    const back = roundTrip([spec({ x: { label: "n", log: true }, y: { label: "mu", log: true }, series: [{ label: "s", points: pts, line: false }] })]);
    back[0].series[0].points.forEach(([a, b], i) => {
      expect(Math.abs(Math.log10(a / pts[i][0]))).toBeLessThanOrEqual(Math.log10(8e11 / 3e10) / PACK_LEVELS.x / 2 + 1e-12);
      expect(Math.abs(Math.log10(b / pts[i][1]))).toBeLessThanOrEqual(Math.log10(9.99e5 / 1.5e4) / PACK_LEVELS.y / 2 + 1e-12);
    });
  });

  it("a lone marker beside a line takes the line's step; views, empty series, links and escaping survive", () => {
    const charts = [
      spec({
        id: "v",
        series: [],
        views: [
          {
            label: "Vg = 1 V",
            caption: "first </script>",
            series: [
              {
                label: "line",
                points: [
                  [0, 0],
                  [10, 100],
                ],
                line: true,
              },
              { label: "one", points: [[54.9234, 20.1165]], line: false, links: ["../a/"] },
              { label: "none", points: [], line: false },
            ],
          },
        ],
        view: 0,
        viewLabel: "Gate",
      }),
    ];
    const json = chartDataJson(charts);
    expect(json).not.toMatch(/<|A title|A summary|Vg = 1 V|Gate/);
    const back = unpackSpecs(JSON.parse(json) as unknown[]);
    const s = back[0].views![0].series as Spec["series"];
    // x: span 54.9234 / 2200 → step 0.02; y: span 100 / 840 → step 0.1.
    expect(s[1].points).toEqual([[54.92, 20.1]]);
    expect(s[1].links).toEqual(["../a/"]);
    expect(s[2].points).toEqual([]);
    expect((back[0].views![0] as { caption?: string }).caption).toBe("first </script>");
  });
});
