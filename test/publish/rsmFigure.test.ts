// Reciprocal-space map figure: the picture, its colour bar and ticks, on a synthetic symmetric map (no published values involved).
import { describe, expect, it } from "vitest";
import { PNG } from "pngjs";
import { linearTicks, rsmFigure } from "../../src/publish/rsmFigure.ts";
import type { XrdFileResult } from "../../src/analyse/structure/xrdAnalysis.ts";

describe("linearTicks (1-2-5 steps)", () => {
  it("picks the step from 1, 2, 5 × 10^k for about the asked number of ticks (values worked out by hand)", () => {
    // 2.2 / 6 = 0.37 → step 0.5.
    expect(linearTicks(31.6, 33.8, 6)).toEqual([32, 32.5, 33, 33.5]);
    // 1.15 / 6 = 0.19 → step 0.2.
    expect(linearTicks(45.55, 46.7, 6)).toEqual([45.6, 45.8, 46, 46.2, 46.4, 46.6]);
    // −0.8 … 0.8 / 5 = 0.32 → step 0.5.
    expect(linearTicks(-0.8, 0.8, 5)).toEqual([-0.5, 0, 0.5]);
    expect(linearTicks(1, 1)).toEqual([]);
  });
});

describe("rsmFigure", () => {
  // A 40 × 40 grid in (ω, 2θ) around Si 004 with Cu Kα1 (θ ≈ 34.56°), one Gaussian peak on a background of 5 counts.
  const deg = Math.PI / 180;
  const theta = 34.564 * deg;
  const points = [];
  for (let i = 0; i < 40; i++)
    for (let j = 0; j < 40; j++) {
      const dw = (i - 19.5) * 0.015 * deg;
      const dt = (j - 19.5) * 0.03 * deg;
      points.push({ omega: theta + dw, twoTheta: 2 * theta + dt, counts: 5 + 1e4 * Math.exp(-((dw / (0.05 * deg)) ** 2) - (dt / (0.1 * deg)) ** 2) });
    }
  const f = {
    file: "xrd/<map>.csv",
    kind: "map",
    peaks: {
      ok: true,
      reflection: [0, 0, 4],
      wavelength: 0.15406e-9,
      background: 5,
      noise: 2,
      offset: { omega: 0, twoTheta: 0 },
      offsetCorrected: true,
      notes: [],
      peaks: [
        {
          layer: "substrate",
          omega: theta,
          twoTheta: 2 * theta,
          omegaStdErr: 0,
          twoThetaStdErr: 0,
          qx: 0,
          qz: (4 * Math.PI * Math.sin(theta)) / 0.15406e-9,
          qxStdErr: 0,
          qzStdErr: 0,
        },
      ],
    },
    points,
  } as unknown as XrdFileResult;
  const fig = rsmFigure(f, undefined, "m", "structure/rsm-0.png")!;

  it("draws a picture finer than the old 44 blocks, opaque where the map was measured, brightest at the peak", () => {
    const png = PNG.sync.read(fig.png);
    expect(png.width).toBeGreaterThan(100);
    expect(png.height).toBeGreaterThan(100);
    let opaque = 0;
    let brightest = { sum: -1, x: 0, y: 0 };
    for (let y = 0; y < png.height; y++)
      for (let x = 0; x < png.width; x++) {
        const o = 4 * (y * png.width + x);
        if (png.data[o + 3] === 255) {
          opaque++;
          const s = png.data[o] + png.data[o + 1] + png.data[o + 2];
          if (s > brightest.sum) brightest = { sum: s, x, y };
        }
      }
    expect(opaque).toBeGreaterThan(0.2 * png.width * png.height);
    // The peak sits at the middle of the scanned range: within a tenth of the picture of its centre.
    expect(Math.abs(brightest.x / png.width - 0.5)).toBeLessThan(0.1);
    expect(Math.abs(brightest.y / png.height - 0.5)).toBeLessThan(0.1);
  });

  it("has a colour bar, axis titles in nm⁻¹, the picture's address and escaped text; no R lines on a symmetric map", () => {
    expect(fig.svg).toContain('<image href="structure/rsm-0.png"');
    expect(fig.svg).toContain("Qx (nm⁻¹)");
    expect(fig.svg).toContain("Qz (nm⁻¹)");
    expect(fig.svg).toContain("counts (log scale)");
    expect((fig.svg.match(/<stop /g) ?? []).length).toBe(17);
    expect(fig.svg).toContain("xrd/&lt;map&gt;.csv");
    expect(fig.svg).not.toContain("<map>");
    expect(fig.svg).not.toContain("R = 0");
  });
});
