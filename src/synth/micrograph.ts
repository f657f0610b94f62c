/**
 * Synthetic cross-section lattice micrographs (HAADF-like) for the demo data,
 * tests and benchmark. Invented model, no measured data.
 *
 * Model: atom columns are 2-D Gaussians on a rectangular lattice (optionally
 * centred: every other plane shifted by half a period). In-plane spacing is
 * the same everywhere (a coherent stack) unless a well value is given; the out-of-plane spacing and the
 * column brightness follow the well fraction
 *   f(v) = σ((v − v_bottom)/τ) − σ((v − v_top)/τ),   σ(t) = 1/(1 + e^(−t)),
 * a logistic step at each interface (REFERENCES §10), so a barrier value p_b
 * becomes p_b + (p_w − p_b)·f(v). Plane k+1 sits one local spacing above plane
 * k. The lattice is placed in the image along the growth direction (tilted
 * by `tilt_deg`, see growthDirections), then a constant background and seeded
 * Gaussian noise are added. Lengths in metres, image in arbitrary units.
 *
 * The geometry and the 10–90 % width are written out here, independently of
 * the image analysis, so the image tests do not check the analysis against itself.
 */
import { seededGaussian } from "./random.ts";

/** Direction in the image toward the wafer surface (`up` = toward row 0). */
export type GrowthAxis = "up" | "down" | "left" | "right";

/**
 * Unit vectors of the growth normal n (toward the surface) and the in-plane
 * direction t = n rotated by +90°, in pixel coordinates (x right, y down). The
 * axis' base vector is rotated by the tilt with [[cos, −sin], [sin, cos]]
 * (a plane rotation, common practice); with y down, a positive tilt turns clockwise on screen.
 */
function growthDirections(axis: GrowthAxis, tiltDeg: number) {
  const tilt = (tiltDeg * Math.PI) / 180;
  const [bx, by] = { up: [0, -1], down: [0, 1], left: [-1, 0], right: [1, 0] }[axis];
  const c = Math.cos(tilt);
  const s = Math.sin(tilt);
  const n = { x: c * bx - s * by, y: s * bx + c * by };
  return { n, t: { x: -n.y, y: n.x } };
}

export interface SyntheticMicrographSpec {
  width: number;
  height: number;
  pixelSize_m: number;
  /** Column spacing parallel to the interfaces, m. */
  inPlaneSpacing_m: number;
  /** In-plane spacing inside the well, m (default inPlaneSpacing_m: coherent). A different value models a relaxed, incoherent well. */
  wellInPlaneSpacing_m?: number;
  /** Out-of-plane plane spacing in the barriers, m. */
  barrierSpacing_m: number;
  /** Out-of-plane plane spacing in the well, m. */
  wellSpacing_m: number;
  wellThickness_m: number;
  /** Growth coordinate of the well centre from the image centre, m (default 0). */
  wellCentre_m?: number;
  /** Logistic τ of both interfaces, m. */
  interfaceTau_m: number;
  /** Column peak brightness in barrier and well (defaults 1 and 0.7: the Si well is darker). */
  barrierBrightness?: number;
  wellBrightness?: number;
  /** Gaussian column standard deviation, m (default 0.2 × the in-plane spacing). */
  columnSigma_m?: number;
  background?: number;
  /** Standard deviation of the added Gaussian noise (default 0.02). */
  noise?: number;
  tilt_deg?: number;
  growthAxis?: GrowthAxis;
  centred?: boolean;
  seed?: number;
}

export interface MicrographTruth {
  pixelSize_m: number;
  growthAxis: GrowthAxis;
  tilt_deg: number;
  /** Growth coordinates (pixels from the image centre, + toward the surface) of the interfaces. */
  wellBottom_px: number;
  wellTop_px: number;
  tau_m: number;
  /** 10–90 % width of each interface, 2·ln 9·τ, m. */
  interfaceWidth10to90_m: number;
  inPlaneSpacing_m: number;
  barrierSpacing_m: number;
  wellSpacing_m: number;
  /** Well vs barrier out-of-plane strain, wellSpacing/barrierSpacing − 1 (fraction). */
  outOfPlaneStrain: number;
  /** Well vs barrier in-plane mismatch, fraction (0 when coherent). */
  inPlaneMismatch: number;
}

export interface SyntheticMicrograph {
  width: number;
  height: number;
  pixels: Float32Array;
  truth: MicrographTruth;
}

const logistic = (t: number) => 1 / (1 + Math.exp(-t));

/** Out-of-plane plane positions (pixels along the growth normal) and their brightness. */
function latticePlanes(spec: SyntheticMicrographSpec, halfSpan: number) {
  const px = spec.pixelSize_m;
  const cb = spec.barrierSpacing_m / px;
  const cw = spec.wellSpacing_m / px;
  const tau = spec.interfaceTau_m / px;
  const centre = (spec.wellCentre_m ?? 0) / px;
  const vb = centre - spec.wellThickness_m / px / 2;
  const vt = centre + spec.wellThickness_m / px / 2;
  const ab = spec.barrierBrightness ?? 1;
  const aw = spec.wellBrightness ?? 0.7;
  const frac = (v: number) => logistic((v - vb) / tau) - logistic((v - vt) / tau);
  const pb = spec.inPlaneSpacing_m / px;
  const pw = (spec.wellInPlaneSpacing_m ?? spec.inPlaneSpacing_m) / px;
  const planes: { v: number; a: number; pitch: number }[] = [];
  let v = -halfSpan;
  while (v <= halfSpan) {
    planes.push({ v, a: ab + (aw - ab) * frac(v), pitch: pb + (pw - pb) * frac(v) });
    const mid = v + cb / 2;
    v += cb + (cw - cb) * frac(mid);
  }
  return { planes, vb, vt };
}

/** Renders a synthetic micrograph and its ground truth (see the module comment). Throws RangeError on bad sizes. */
export function syntheticMicrograph(spec: SyntheticMicrographSpec): SyntheticMicrograph {
  const { width, height } = spec;
  if (!(width >= 8 && height >= 8)) throw new RangeError("syntheticMicrograph: image must be at least 8×8");
  const px = spec.pixelSize_m;
  const axis = spec.growthAxis ?? "up";
  const { n, t } = growthDirections(axis, spec.tilt_deg ?? 0);
  const sigma = (spec.columnSigma_m ?? 0.2 * spec.inPlaneSpacing_m) / px;
  const reach = Math.ceil(3.5 * sigma);
  const halfSpan = Math.hypot(width, height) / 2 + 2 * reach;
  const { planes, vb, vt } = latticePlanes(spec, halfSpan);
  const pixels = new Float32Array(width * height).fill(spec.background ?? 0.05);
  const cx = (width - 1) / 2;
  const cy = (height - 1) / 2;
  const inv2s2 = 1 / (2 * sigma * sigma);
  planes.forEach((plane, k) => {
    const a = plane.pitch;
    const shift = spec.centred && k % 2 === 1 ? a / 2 : 0;
    for (let u = -Math.ceil(halfSpan / a) * a + shift; u <= halfSpan; u += a) {
      const x0 = cx + u * t.x + plane.v * n.x;
      const y0 = cy + u * t.y + plane.v * n.y;
      if (x0 < -reach || y0 < -reach || x0 > width + reach || y0 > height + reach) continue;
      const xs = Math.max(0, Math.floor(x0 - reach));
      const xe = Math.min(width - 1, Math.ceil(x0 + reach));
      const ys = Math.max(0, Math.floor(y0 - reach));
      const ye = Math.min(height - 1, Math.ceil(y0 + reach));
      for (let y = ys; y <= ye; y++) {
        const dy2 = (y - y0) ** 2;
        for (let x = xs; x <= xe; x++) pixels[y * width + x] += plane.a * Math.exp(-((x - x0) ** 2 + dy2) * inv2s2);
      }
    }
  });
  const noise = spec.noise ?? 0.02;
  if (noise > 0) {
    const gauss = seededGaussian(spec.seed ?? 1);
    for (let i = 0; i < pixels.length; i++) pixels[i] += noise * gauss();
  }
  return {
    width,
    height,
    pixels,
    truth: {
      pixelSize_m: px,
      growthAxis: axis,
      tilt_deg: spec.tilt_deg ?? 0,
      wellBottom_px: vb,
      wellTop_px: vt,
      tau_m: spec.interfaceTau_m,
      // Logistic σ(t) reaches 10 % and 90 % at t = ∓ln 9, so the 10–90 % width is 2·ln 9·τ (REFERENCES §10).
      interfaceWidth10to90_m: 2 * Math.log(9) * spec.interfaceTau_m,
      inPlaneSpacing_m: spec.inPlaneSpacing_m,
      barrierSpacing_m: spec.barrierSpacing_m,
      wellSpacing_m: spec.wellSpacing_m,
      outOfPlaneStrain: spec.wellSpacing_m / spec.barrierSpacing_m - 1,
      inPlaneMismatch: (spec.wellInPlaneSpacing_m ?? spec.inPlaneSpacing_m) / spec.inPlaneSpacing_m - 1,
    },
  };
}
