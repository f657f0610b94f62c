/**
 * Lattice fringe spacing from the Fourier transform of a lattice image.
 *
 * Method: the image (mean removed, Hann-windowed) is Fourier transformed; the
 * Bragg spots are local maxima of the power spectrum away from the origin.
 * Each spot is refined below one bin by maximising the windowed discrete-time
 * Fourier transform |Σ w·f·exp(−2πi g·r)|² at continuous g, with repeated
 * three-point parabolic steps on the log power along each axis (interpolation
 * of a windowed DFT peak; Jain, Collins & Davis, IEEE Trans. Instrum. Meas.
 * 28, 113 (1979) for the idea of sub-bin peak interpolation). The fringe
 * period is 1/|g|.
 *
 * Units: g in cycles per pixel, periods in pixels, and in metres when a pixel
 * size (m) is given. Returns { ok: false, reason } when no spot stands out.
 */
import { fft2dReal, hannWindow, isPowerOfTwo, powerSpectrum, signedBin } from "./fft2d.ts";
import type { Vec2 } from "./geometry.ts";
import { radToDeg } from "../numeric/angle.ts";
import { median } from "simple-statistics";

export interface BraggPeak {
  /** Spatial frequency, cycles/pixel (x right, y down). */
  g: Vec2;
  /** Power spectrum value at the peak bin (arbitrary units). */
  power: number;
  /** Peak power over the median power in the searched band. */
  contrast: number;
}

export interface PeakSearchOptions {
  /** Shortest fringe period considered, pixels (default 2.5). */
  minPeriod_px?: number;
  /** Longest fringe period considered, pixels (default a quarter of the shorter side). */
  maxPeriod_px?: number;
  /** Number of peaks returned (default 8). */
  count?: number;
}

/**
 * Local maxima of the power spectrum in the half-plane ky > 0 (or ky = 0, kx > 0),
 * strongest first, at bin precision. Sizes must be powers of two.
 */
export function findBraggPeaks(pixels: ArrayLike<number>, width: number, height: number, options: PeakSearchOptions = {}): BraggPeak[] {
  const fMax = 1 / (options.minPeriod_px ?? 2.5);
  const fMin = 1 / (options.maxPeriod_px ?? Math.min(width, height) / 4);
  const { candidates, bandMedian } = peakCandidates(pixels, width, height, fMin, fMax);
  return candidates.slice(0, options.count ?? 8).map((c) => ({
    g: { x: c.kx / width, y: c.ky / height },
    power: c.p,
    contrast: bandMedian > 0 ? c.p / bandMedian : Number.MAX_VALUE,
  }));
}

interface PeakCandidates {
  /** Local maxima in the half-plane, strongest first. */
  candidates: { kx: number; ky: number; p: number }[];
  /** Median power over the searched band. */
  bandMedian: number;
}

type PeakSearch = { pixels: Float64Array; width: number; height: number; fMin: number; fMax: number; result: PeakCandidates };

/**
 * The last image searched, with its band and candidates: the Z-contrast profile and GPA of one
 * micrograph both search the same power-of-two image (cropped or padded, the same pixels when the
 * sides are powers of two), so the second search reuses the first's windowed transform. The
 * pixels are compared value by value; any difference recomputes.
 *
 * Kept only inside {@link withPeakSearchMemo} (one micrograph's analysis: images/index.ts
 * analyseMicrograph): the copy is 8 bytes a pixel (134 MB for a 4096² micrograph), so it must
 * not outlive the micrograph. `undefined` outside such a scope: every search computes afresh and
 * nothing is kept; `null` inside one before its first search.
 */
let memo: PeakSearch | null | undefined;

/**
 * Runs `analyse` (synchronous) with a peak-search memo of its own: searches of the same image
 * inside it reuse one transform; the memo is dropped when `analyse` returns or throws.
 */
export function withPeakSearchMemo<T>(analyse: () => T): T {
  const outer = memo;
  memo = null;
  try {
    return analyse();
  } finally {
    memo = outer;
  }
}

/** Whether a peak-search memo holds an image now (for tests: none outside withPeakSearchMemo). */
export function peakSearchMemoHeld(): boolean {
  return memo != null;
}

function sameImage(a: Float64Array, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i] && !(Number.isNaN(a[i]) && Number.isNaN(b[i]))) return false;
  return true;
}

function peakCandidates(pixels: ArrayLike<number>, width: number, height: number, fMin: number, fMax: number): PeakCandidates {
  const last = memo;
  if (last && last.width === width && last.height === height && last.fMin === fMin && last.fMax === fMax && sameImage(last.pixels, pixels)) {
    return last.result;
  }
  const result = searchPeaks(pixels, width, height, fMin, fMax);
  if (memo !== undefined) memo = { pixels: Float64Array.from(pixels), width, height, fMin, fMax, result };
  return result;
}

function searchPeaks(pixels: ArrayLike<number>, width: number, height: number, fMin: number, fMax: number): PeakCandidates {
  const spectrum = fft2dReal(pixels, width, height, { window: true });
  const power = powerSpectrum(spectrum);
  const candidates: { kx: number; ky: number; p: number }[] = [];
  const band = new Float64Array(width * height);
  let inBand = 0;
  for (let y = 0; y < height; y++) {
    const ky = signedBin(y, height);
    for (let x = 0; x < width; x++) {
      const kx = signedBin(x, width);
      const f = Math.hypot(kx / width, ky / height);
      if (f < fMin || f > fMax) continue;
      const p = power[y * width + x];
      band[inBand++] = p;
      if (!(ky > 0 || (ky === 0 && kx > 0))) continue;
      let isMax = true;
      for (let dy = -1; dy <= 1 && isMax; dy++) {
        for (let dx = -1; dx <= 1; dx++) {
          if (dx === 0 && dy === 0) continue;
          const q = power[((y + dy + height) % height) * width + ((x + dx + width) % width)];
          if (q > p) {
            isMax = false;
            break;
          }
        }
      }
      if (isMax) candidates.push({ kx, ky, p });
    }
  }
  // simple-statistics reads the array by index only; a typed array selects faster than a number[].
  const bandMedian = inBand ? median(band.subarray(0, inBand) as unknown as number[]) : 0;
  candidates.sort((a, b) => b.p - a.p);
  return { candidates, bandMedian };
}

/** Per row y, Σ_x data·exp(−2πi·fx·x) (real and imaginary parts): the first stage of dtftPower. */
function rowTransforms(data: Float64Array, width: number, height: number, fx: number): { rr: Float64Array; ri: Float64Array } {
  const cx = new Float64Array(width);
  const sx = new Float64Array(width);
  for (let x = 0; x < width; x++) {
    cx[x] = Math.cos(2 * Math.PI * fx * x);
    sx[x] = -Math.sin(2 * Math.PI * fx * x);
  }
  const rr = new Float64Array(height);
  const ri = new Float64Array(height);
  for (let y = 0; y < height; y++) {
    let sr = 0;
    let si = 0;
    const row = y * width;
    for (let x = 0; x < width; x++) {
      sr += data[row + x] * cx[x];
      si += data[row + x] * sx[x];
    }
    rr[y] = sr;
    ri[y] = si;
  }
  return { rr, ri };
}

/** Windowed DTFT power at frequency fy from the row transforms at fx (rowTransforms). */
function columnPower(rows: { rr: Float64Array; ri: Float64Array }, height: number, fy: number): number {
  let re = 0;
  let im = 0;
  for (let y = 0; y < height; y++) {
    const rr = rows.rr[y];
    const ri = rows.ri[y];
    const c = Math.cos(2 * Math.PI * fy * y);
    const s = -Math.sin(2 * Math.PI * fy * y);
    re += rr * c - ri * s;
    im += rr * s + ri * c;
  }
  return re * re + im * im;
}

/** Windowed DTFT power at continuous frequency (fx, fy) cycles/pixel. */
function dtftPower(data: Float64Array, width: number, height: number, fx: number, fy: number): number {
  return columnPower(rowTransforms(data, width, height, fx), height, fy);
}

/**
 * Sub-bin refinement of a Bragg spot: maximises the Hann-windowed DTFT power
 * near `start` (cycles/pixel). Any image size is accepted.
 */
export function refinePeakFrequency(pixels: ArrayLike<number>, width: number, height: number, start: Vec2): Vec2 {
  const n = width * height;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += pixels[i];
  mean /= n;
  const wx = hannWindow(width);
  const wy = hannWindow(height);
  const data = new Float64Array(n);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) data[y * width + x] = (pixels[y * width + x] - mean) * wx[x] * wy[y];
  }
  let g = { ...start };
  for (const stepBins of [0.3, 0.1, 0.03, 0.01, 0.01]) {
    for (const axis of ["x", "y"] as const) {
      const h = stepBins / (axis === "x" ? width : height);
      // Along y the three points share fx, so the row transforms are computed once for them.
      const rows = axis === "y" ? rowTransforms(data, width, height, g.x) : null;
      const power = (d: number) => (rows ? columnPower(rows, height, g.y + d) : dtftPower(data, width, height, g.x + d, g.y));
      const at = (d: number) => Math.log(power(d) + 1e-300);
      const l = at(-h);
      const c = at(0);
      const r = at(h);
      const denom = l - 2 * c + r;
      let shift = denom < 0 ? (0.5 * h * (l - r)) / denom : r > l ? h : -h;
      shift = Math.max(-2 * h, Math.min(2 * h, shift));
      g = axis === "x" ? { x: g.x + shift, y: g.y } : { x: g.x, y: g.y + shift };
    }
  }
  return g;
}

export interface LatticeSpacingOptions extends PeakSearchOptions {
  /** Pixel size, m; when given the period is also reported in metres. */
  pixelSize_m?: number;
  /** Prefer the strong spot whose g is closest in direction to this vector (either sign). */
  direction?: Vec2;
  /** Minimum peak contrast over the band median (default 20). */
  minContrast?: number;
}

export type LatticeSpacingResult =
  | {
      ok: true;
      g: Vec2;
      period_px: number;
      period_m: number | null;
      /** Direction of g from the +x axis, degrees (y down). */
      angle_deg: number;
      contrast: number;
    }
  | { ok: false; reason: string };

/**
 * Fringe period of the strongest Bragg spot (or of the strong spot nearest
 * `direction`). The image must have power-of-two sides (crop first with
 * cropToPowerOfTwo).
 */
export function latticeSpacing(pixels: ArrayLike<number>, width: number, height: number, options: LatticeSpacingOptions = {}): LatticeSpacingResult {
  if (!isPowerOfTwo(width) || !isPowerOfTwo(height)) {
    return { ok: false, reason: `image ${width}×${height} is not a power of two on both sides; crop it first` };
  }
  for (let i = 0; i < pixels.length; i++) {
    if (!Number.isFinite(pixels[i])) return { ok: false, reason: "image contains non-finite pixel values" };
  }
  const minContrast = options.minContrast ?? 20;
  const peaks = findBraggPeaks(pixels, width, height, options).filter((p) => p.contrast >= minContrast);
  if (peaks.length === 0) return { ok: false, reason: "no lattice fringes stand out in the Fourier transform" };
  let chosen = peaks[0];
  const d = options.direction;
  if (d) {
    const strong = peaks.filter((p) => p.power >= 0.1 * peaks[0].power);
    const cosAngle = (p: BraggPeak) => Math.abs(p.g.x * d.x + p.g.y * d.y) / Math.hypot(p.g.x, p.g.y) / Math.hypot(d.x, d.y);
    chosen = strong.reduce((best, p) => (cosAngle(p) > cosAngle(best) ? p : best), strong[0]);
  }
  const g = refinePeakFrequency(pixels, width, height, chosen.g);
  const period = 1 / Math.hypot(g.x, g.y);
  return {
    ok: true,
    g,
    period_px: period,
    period_m: options.pixelSize_m ? period * options.pixelSize_m : null,
    angle_deg: radToDeg(Math.atan2(g.y, g.x)),
    contrast: chosen.contrast,
  };
}
