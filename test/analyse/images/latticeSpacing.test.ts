import { describe, expect, it } from "vitest";
import v8 from "node:v8";
import { runInNewContext } from "node:vm";
import { latticeSpacing, findBraggPeaks, peakSearchMemoHeld, withPeakSearchMemo } from "../../../src/analyse/images/latticeSpacing.ts";
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
  // Known transforms of the forward DFT F(u,v) = Σ f(x,y)·exp(−2πi(ux/W + vy/H)) (definition; common practice).
  it("transforms a single cosine into two spots of height A·W·H/2 at ±k, nothing else", () => {
    const [W, H, u0, v0, A, phi] = [16, 8, 3, 2, 1.7, 0.4];
    const pix = new Float64Array(W * H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) pix[y * W + x] = A * Math.cos(2 * Math.PI * ((u0 * x) / W + (v0 * y) / H) + phi);
    const f = fft2dReal(pix, W, H, { subtractMean: false });
    // cos θ = (e^{iθ} + e^{−iθ})/2 → F(u0,v0) = (A·W·H/2)·e^{iφ}, F(−u0,−v0) its conjugate.
    const at = (u: number, v: number) => ((v + H) % H) * W + ((u + W) % W);
    expect(f.re[at(u0, v0)]).toBeCloseTo(((A * W * H) / 2) * Math.cos(phi), 9);
    expect(f.im[at(u0, v0)]).toBeCloseTo(((A * W * H) / 2) * Math.sin(phi), 9);
    expect(f.re[at(-u0, -v0)]).toBeCloseTo(((A * W * H) / 2) * Math.cos(phi), 9);
    expect(f.im[at(-u0, -v0)]).toBeCloseTo(-((A * W * H) / 2) * Math.sin(phi), 9);
    for (let i = 0; i < W * H; i++) if (i !== at(u0, v0) && i !== at(-u0, -v0)) expect(Math.hypot(f.re[i], f.im[i])).toBeLessThan(1e-9);
  });
  it("transforms a separable product r^x·δ(y − y0) into G(u)·exp(−2πi v·y0/H)", () => {
    const [W, H, r, y0] = [16, 8, 0.8, 3];
    const pix = new Float64Array(W * H);
    for (let x = 0; x < W; x++) pix[y0 * W + x] = r ** x;
    const f = fft2dReal(pix, W, H, { subtractMean: false });
    for (let v = 0; v < H; v++) {
      for (let u = 0; u < W; u++) {
        // Geometric series: G(u) = (1 − r^W)/(1 − r·e^{−2πiu/W}); times the shift factor e^{−2πi v y0/H}.
        const a = (-2 * Math.PI * u) / W;
        const [dr, di] = [1 - r * Math.cos(a), -r * Math.sin(a)];
        const d2 = dr * dr + di * di;
        const [gr, gi] = [((1 - r ** W) * dr) / d2, (-(1 - r ** W) * di) / d2];
        const b = (-2 * Math.PI * v * y0) / H;
        expect(f.re[v * W + u]).toBeCloseTo(gr * Math.cos(b) - gi * Math.sin(b), 9);
        expect(f.im[v * W + u]).toBeCloseTo(gr * Math.sin(b) + gi * Math.cos(b), 9);
      }
    }
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
  it("finds the two non-collinear lattice spots, strongest first", () => {
    const img = lattice(6.37, 7.9);
    const peaks = findBraggPeaks(img.pixels, 256, 256);
    expect(peaks.length).toBeGreaterThan(1);
    for (let i = 1; i < peaks.length; i++) expect(peaks[i - 1].power).toBeGreaterThanOrEqual(peaks[i].power);
    // The two strongest spots are the two lattice directions' fundamentals: not collinear
    // (|g0 × g1| / (|g0||g1|) = |sin angle| > sin 45°), at 1/6.37 px⁻¹ along x and 1/7.9 px⁻¹ along y
    // to one bin (1/256 px⁻¹), as the synthetic lattice was drawn.
    const [g0, g1] = [peaks[0].g, peaks[1].g];
    expect(Math.abs(g0.x * g1.y - g0.y * g1.x) / (Math.hypot(g0.x, g0.y) * Math.hypot(g1.x, g1.y))).toBeGreaterThan(Math.SQRT1_2);
    const along = (g: { x: number; y: number }) => (Math.abs(g.x) > Math.abs(g.y) ? "x" : "y");
    const gx = along(g0) === "x" ? g0 : g1;
    const gy = along(g0) === "x" ? g1 : g0;
    expect(along(gx)).toBe("x");
    expect(along(gy)).toBe("y");
    expect(Math.abs(Math.abs(gx.x) - 1 / 6.37)).toBeLessThanOrEqual(1 / 256);
    expect(Math.abs(Math.abs(gy.y) - 1 / 7.9)).toBeLessThanOrEqual(1 / 256);
    expect(Math.abs(gx.y) + Math.abs(gy.x)).toBeLessThanOrEqual(1 / 256);
  });
  it("returns a reason for pure noise, NaN pixels and non-power-of-two sizes", () => {
    let s = 1;
    // Park and Miller's minimal standard generator (Commun. ACM 31 (1988) 1192)
    const noise = Float32Array.from({ length: 64 * 64 }, () => {
      s = (s * 16807) % 2147483647;
      return s / 2147483647;
    });
    expect(latticeSpacing(noise, 64, 64)).toMatchObject({ ok: false });
    const nan = new Float32Array(64 * 64).fill(Number.NaN);
    expect(latticeSpacing(nan, 64, 64)).toMatchObject({ ok: false, reason: expect.stringMatching(/non-finite/) });
    expect(latticeSpacing(new Float32Array(60 * 64), 60, 64)).toMatchObject({ ok: false });
  });
});

describe("the Bragg-peak search memo lasts one micrograph's analysis", () => {
  // ArrayBuffer bytes still reachable after a full collection (gc exposed at run time through V8's flag).
  function heldArrayBytes(): number {
    v8.setFlagsFromString("--expose-gc");
    const gc = runInNewContext("gc") as () => void;
    gc();
    gc();
    return process.memoryUsage().arrayBuffers;
  }

  it("a search outside withPeakSearchMemo keeps no copy of the image; inside, the same peaks, dropped at the end", () => {
    const w = 1024;
    const h = 512;
    // A two-spot lattice written out here (periods 8 and 4 pixels), no noise: its peaks are the same on every search.
    const before = heldArrayBytes();
    let pixels: Float64Array | null = Float64Array.from(
      { length: w * h },
      (_, i) => Math.cos((2 * Math.PI * (i % w)) / 8) + Math.cos((2 * Math.PI * Math.floor(i / w)) / 4),
    );
    const free = findBraggPeaks(pixels, w, h, { count: 4 });
    const scoped = withPeakSearchMemo(() => {
      const first = findBraggPeaks(pixels!, w, h, { count: 4 });
      expect(peakSearchMemoHeld()).toBe(true);
      // The second search of the same pixels (as the Z-contrast profile and GPA do) gives the same peaks.
      expect(findBraggPeaks(pixels!, w, h, { count: 4 })).toEqual(first);
      return first;
    });
    expect(scoped).toEqual(free);
    // The two strongest spots are the two lattice periods, 1/8 along x and 1/4 along y (cycles per pixel).
    expect(
      free
        .slice(0, 2)
        .map((p) => `${Math.abs(p.g.x)},${Math.abs(p.g.y)}`)
        .sort(),
    ).toEqual(["0,0.25", "0.125,0"]);
    expect(peakSearchMemoHeld()).toBe(false);
    pixels = null;
    // The image (4 MB) and any copy of it (a memo copies at 8 bytes a pixel: 4 MB) are gone: well under one image is left.
    expect(heldArrayBytes() - before).toBeLessThan(2 * 1024 * 1024);
  });
});
