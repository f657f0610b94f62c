/**
 * Envelope function of the lowest conduction subband along the growth axis,
 * for the valley-splitting prediction (valleySplitting.ts).
 *
 * Model: the 1-D effective-mass Schrödinger equation
 *   −ħ²/(2 m_l)·ψ'' + U(z)·ψ = E·ψ,  U(z) = b·x(z) − e·F·z,
 * z = −depth (growth axis toward the surface), m_l the longitudinal mass of Si,
 * b the conduction-band offset per unit Ge fraction, F the vertical field
 * (F > 0 pulls electrons toward the surface). Method: second-order finite
 * differences on a uniform grid (spacing ≤ `stepNm`, default 0.01 nm) with hard
 * walls (ψ = 0) exactly 10 nm above c_top and 10 nm below c_bot — walls further
 * out would let the ground state slide into the barrier against the far wall
 * once a field is applied. The symmetric tridiagonal ground state is found by
 * Sturm bisection and inverse iteration (numeric/tridiagonalGroundState.ts),
 * bracketed by a Rayleigh quotient and finished by one (groundStateOnGrid).
 * The envelope at the atomic layers is the linear interpolation of the grid
 * solution; the layer weights are w_l = |ψ(z_l)|²/Σ_l |ψ(z_l)|² (Σ w_l = 1).
 * Friesen et al., Phys. Rev. B 75, 115318 (2007) (effective-mass valley
 * coupling); Losert et al., Phys. Rev. B 108, 125405 (2023).
 *
 * Inputs: x(depth nm) → Ge fraction; b in J; F in V/m; depths in nm.
 * Returns the ground energy (J, relative to the potential's zero at depth 0)
 * and the layer weights. Throws RangeError for a non-positive step or walls
 * that do not enclose the layers (programming errors).
 */
import { ELEMENTARY_CHARGE, HBAR } from "../../physics/constants.ts";
import { SI_LONGITUDINAL_MASS } from "../../physics/siliconValley.ts";
import { tridiagonalGroundState } from "../numeric/tridiagonalGroundState.ts";

export interface EnvelopeInput {
  /** Ge fraction at a depth (nm). */
  ge: (depthNm: number) => number;
  /** Interface centres, nm. */
  topCentre: number;
  bottomCentre: number;
  /** Layer depths, nm (inside the walls). */
  layerDepth: readonly number[];
  /** Band offset per unit Ge fraction, J. */
  bandOffset: number;
  /** Vertical field, V/m. */
  field: number;
  /** Grid spacing, nm (at most this; default 0.01). */
  stepNm?: number;
  /** Effective mass along z, kg (default m_l of Si). */
  mass?: number;
}

export interface Envelope {
  /** Ground-state energy, J. */
  energy: number;
  /** Normalised layer weights w_l (Σ = 1). */
  weight: number[];
  /** Grid actually used: walls (nm) and spacing (nm). */
  walls: [number, number];
  stepNm: number;
}

/** Distance of the hard walls beyond the interface centres, nm. */
export const WALL_DISTANCE_NM = 10;

/** Bisection stops when the bracket of E₁ is this fraction of its starting width (see groundStateOnGrid). */
export const BISECTION_FRACTION = 1e-6;

/**
 * Ground state of H = −ħ²/(2m)·d²/dz² + U on the interior points of a uniform grid between hard walls:
 * diagonal ħ²/(m h²) + U_i, off-diagonal −ħ²/(2m h²). Returns the energy (J) and ψ on the interior points.
 *
 * The bisection of tridiagonalGroundState starts from [min U, the Rayleigh quotient of the parabola
 * j·(n + 1 − j), close to the box's lowest mode] (an upper bound of E₁ by the min-max theorem; the Gershgorin bound 4ħ²/(2m h²)
 * lies some 10⁴ times higher on a 0.01 nm grid) and stops at BISECTION_FRACTION of that width: the
 * shift of the inverse iteration is then within ~10⁻⁴ of the gap to E₂ (about 2.8 meV for a 20 nm well with 0.15 eV
 * barriers at zero field, more for thinner wells or in a field; the bracket is ~0.1–0.3 eV wide), so three iterations
 * bring the vector's error to about 10⁻¹² (not to double precision, but far below what the figures need). The energy returned is the Rayleigh quotient of that vector, exact
 * to second order in its error (Parlett, The Symmetric Eigenvalue Problem, SIAM 1998, §4.6), summed
 * without the cancelling 2t terms: vᵀHv = Σ U_i v_i² + t·[v_1² + Σ (v_{i+1} − v_i)² + v_n²], t = ħ²/(2m h²).
 */
export function groundStateOnGrid(potential: Float64Array, stepM: number, mass: number) {
  const n = potential.length;
  const t = (HBAR * HBAR) / (2 * mass * stepM * stepM);
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = 2 * t + potential[i];
  const e = new Float64Array(Math.max(0, n - 1)).fill(-t);
  const energy = (v: ArrayLike<number>) => {
    let pot = 0;
    let norm = 0;
    let kin = n ? v[0] * v[0] + v[n - 1] * v[n - 1] : 0;
    for (let i = 0; i < n; i++) {
      pot += potential[i] * v[i] * v[i];
      norm += v[i] * v[i];
      if (i + 1 < n) kin += (v[i + 1] - v[i]) ** 2;
    }
    return (pot + t * kin) / norm;
  };
  // Trial vector j·(n + 1 − j), j = 1 … n: the box's lowest mode to within a few per cent, without a sine per point.
  let uMin = Infinity;
  const trial = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    uMin = Math.min(uMin, potential[i]);
    trial[i] = (i + 1) * (n - i);
  }
  const upper = energy(trial);
  const g = tridiagonalGroundState(d, e, BISECTION_FRACTION * Math.max(0, upper - uMin), upper);
  return { value: energy(g.vector), vector: g.vector };
}

export function valleyEnvelope(input: EnvelopeInput): Envelope {
  const maxStep = input.stepNm ?? 0.01;
  if (!(maxStep > 0)) throw new RangeError(`valleyEnvelope: grid step must be positive, got ${maxStep}`);
  const lo = input.topCentre - WALL_DISTANCE_NM;
  const hi = input.bottomCentre + WALL_DISTANCE_NM;
  const intervals = Math.ceil((hi - lo) / maxStep - 1e-9);
  const h = (hi - lo) / intervals;
  const interior = intervals - 1;
  const potential = new Float64Array(interior);
  for (let i = 0; i < interior; i++) {
    const depth = lo + (i + 1) * h;
    // z = −depth: −e·F·z = +e·F·depth (nm → m).
    potential[i] = input.bandOffset * input.ge(depth) + ELEMENTARY_CHARGE * input.field * depth * 1e-9;
  }
  const g = groundStateOnGrid(potential, h * 1e-9, input.mass ?? SI_LONGITUDINAL_MASS);
  const psiAt = (depth: number) => {
    const u = (depth - lo) / h;
    if (!(u > 0 && u < intervals)) throw new RangeError(`valleyEnvelope: layer at ${depth} nm lies outside the walls [${lo}, ${hi}] nm`);
    const k = Math.floor(u);
    const f = u - k;
    // Grid node j (0 … intervals) holds ψ = 0 at the walls, vector[j − 1] inside.
    const node = (j: number) => (j <= 0 || j >= intervals ? 0 : g.vector[j - 1]);
    return (1 - f) * node(k) + f * node(k + 1);
  };
  const raw = input.layerDepth.map((d) => psiAt(d) ** 2);
  const sum = raw.reduce((a, b) => a + b, 0);
  return { energy: g.value, weight: raw.map((v) => v / sum), walls: [lo, hi], stepNm: h };
}
