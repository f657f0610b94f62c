import { describe, expect, it } from "vitest";
import { latticeSpacing, findBraggPeaks } from "../../../src/analyse/images/latticeSpacing.ts";
import { cropToPowerOfTwo, fft2dReal, ifft2d, padToPowerOfTwo } from "../../../src/analyse/images/fft2d.ts";
import { fftOfSize, nextPowerOfTwo } from "../../../src/analyse/numeric/fft.ts";
import { syntheticMicrograph } from "../../../src/synth/micrograph.ts";

const PX = 0.05e-9;

function lattice(inPlane_px: number, outOfPlane_px: number, tilt_deg = 0, size = 256) {
  return syntheticMicrograph({
    width: size,
    height: size,
    pixelSize_m: PX,
    inPlaneSpacing_m: inPlane_px * PX,
    barrierSpacing_m: outOfPlane_px * PX,
    wellSpacing_m: outOfPlane_px * PX,
    wellThickness_m: 0,
    interfaceTau_m: PX,
    wellBrightness: 1,
    noise: 0.05,
    tilt_deg,
    seed: 7,
  });
}

describe("fft2d", () => {
  it("round-trips forward and inverse on a 16×8 image", () => {
    const pix = Float32Array.from({ length: 128 }, (_, i) => Math.sin(i * 0.37) + (i % 5));
    const f = fft2dReal(pix, 16, 8, { subtractMean: false });
    const back = ifft2d(f);
    for (let i = 0; i < 128; i++) expect(back.re[i]).toBeCloseTo(pix[i], 5);
  });
  it("rejects non-power-of-two sizes", () => {
    expect(() => fft2dReal(new Float32Array(12 * 8), 12, 8)).toThrow(RangeError);
  });
  it("crops and pads to powers of two", () => {
    const pix = new Float32Array(300 * 200).map((_, i) => i);
    const c = cropToPowerOfTwo(pix, 300, 200);
    expect([c.width, c.height, c.x0, c.y0]).toEqual([256, 128, 22, 36]);
    expect(c.pixels[0]).toBe(36 * 300 + 22);
    const p = padToPowerOfTwo(pix, 300, 200);
    expect([p.width, p.height]).toEqual([512, 256]);
    expect(nextPowerOfTwo(257)).toBe(512);
    expect([nextPowerOfTwo(0), nextPowerOfTwo(1), nextPowerOfTwo(2), nextPowerOfTwo(3), nextPowerOfTwo(256)]).toEqual([2, 2, 2, 4, 256]);
    expect(nextPowerOfTwo(2 ** 40 + 1)).toBe(2 ** 41);
    expect(fftOfSize(64)).toBe(fftOfSize(64));
    expect(() => fftOfSize(12)).toThrow();
  });
});

describe("latticeSpacing", () => {
  // Acceptance criterion of issue 9: a known period recovered within 0.05 %.
  it.each([
    [6.37, 7.9, 0],
    [5.21, 8.3, 1.5],
  ])("recovers an in-plane period of %f px (tilt %f°) within 0.05 %", (a, c, tilt) => {
    const img = lattice(a, c, tilt);
    const r = latticeSpacing(img.pixels, img.width, img.height, {
      pixelSize_m: PX,
      direction: { x: 1, y: 0 },
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.period_px / a - 1)).toBeLessThan(5e-4);
    expect(Math.abs(r.period_m! / (a * PX) - 1)).toBeLessThan(5e-4);
    expect(Math.abs(r.angle_deg - tilt)).toBeLessThan(0.1);
  });
  it("recovers the out-of-plane period when asked for the growth direction", () => {
    const img = lattice(6.37, 7.9);
    const r = latticeSpacing(img.pixels, img.width, img.height, { direction: { x: 0, y: 1 } });
    expect(r.ok && Math.abs(r.period_px / 7.9 - 1)).toBeLessThan(5e-4);
  });
  it("finds non-collinear spots strongest first", () => {
    const img = lattice(6.37, 7.9);
    const peaks = findBraggPeaks(img.pixels, 256, 256);
    expect(peaks.length).toBeGreaterThan(1);
    expect(peaks[0].power).toBeGreaterThanOrEqual(peaks[1].power);
  });
  it("returns a reason for pure noise, NaN pixels and non-power-of-two sizes", () => {
    let s = 1;
    const noise = Float32Array.from({ length: 64 * 64 }, () => ((s = (s * 16807) % 2147483647) / 2147483647));
    expect(latticeSpacing(noise, 64, 64)).toMatchObject({ ok: false });
    const nan = new Float32Array(64 * 64).fill(Number.NaN);
    expect(latticeSpacing(nan, 64, 64)).toMatchObject({ ok: false, reason: expect.stringMatching(/non-finite/) });
    expect(latticeSpacing(new Float32Array(60 * 64), 60, 64)).toMatchObject({ ok: false });
  });
});
